/**
 * Anomalies in one item's chain of custody: things an auditor should look at even though the
 * ledger accepted every event. Pure: the caller loads the events, the order's conditioning rule,
 * the lab's dwell limits and other items' placements, and passes them in.
 */
import { z } from 'zod';
import type { StationKind } from '../schemas/stations';
import { halfCode } from './codes';
import type { JsonValue } from './ledger/canonical';
import type { ChainVerification, LedgerEvent } from './ledger/event-hash';
import { EVENT_TYPES, isEventType, TRANSITIONS, type EventType, type ItemKind } from './ledger/state-machine';

/** How much an anomaly matters: `critical` may invalidate a result or the custody record. */
export type AnomalySeverity = 'info' | 'warning' | 'critical';

/** Severities from least to most serious. */
export const ANOMALY_SEVERITIES: readonly AnomalySeverity[] = ['info', 'warning', 'critical'];

/** Every kind of anomaly detectAnomalies reports. */
export const ANOMALY_CODES = [
  'out_of_sequence',
  'clock_ahead',
  'missing_step',
  'long_dwell',
  'short_conditioning',
  'conditioning_rule_weaker',
  'chamber_out_of_band',
  'two_places',
  'half_claimed_twice',
  'broken_chain',
] as const;

/** A kind of anomaly. */
export type AnomalyCode = (typeof ANOMALY_CODES)[number];

/** One finding: plain words for people, `details` (plain JSON) for screens and exports. */
export type Anomaly = {
  code: AnomalyCode;
  severity: AnomalySeverity;
  message: string;
  /** The event the finding points at, when there is one. */
  eventSeq?: number;
  details: Record<string, JsonValue>;
};

/** The members of a custody event the detector reads. A full LedgerEvent fits. */
export type AnomalyEvent = Pick<
  LedgerEvent,
  'seq' | 'type' | 'occurredAt' | 'recordedAt' | 'station' | 'container' | 'payload' | 'hash' | 'corrects'
>;

const Finite = z.union([z.number(), z.string().trim().regex(/^-?\d+(\.\d+)?$/)]).transform(Number);

/** An order's conditioning rule: a target atmosphere with its tolerances, and the least time in it. */
export const ConditioningRuleSchema = z.strictObject({
  temperatureC: z.number().min(-80).max(200),
  temperatureTolC: z.number().min(0).max(50),
  humidityPct: z.number().min(0).max(100),
  humidityTolPct: z.number().min(0).max(100),
  minHours: z.number().min(0).max(10_000),
});

/** An order's conditioning rule. */
export type ConditioningRule = z.infer<typeof ConditioningRuleSchema>;

/**
 * One chamber reading as a conditioning event may carry it in `payload.chamber` (one object, or
 * a list of them, e.g. from a chamber log). Numbers may be sent as decimal strings.
 */
export const ChamberReadingSchema = z.looseObject({
  at: z.string().optional(),
  temperatureC: Finite.optional(),
  humidityPct: Finite.optional(),
});

/** One chamber reading. */
export type ChamberReading = z.infer<typeof ChamberReadingSchema>;

/** ASTM D618 Procedure A's atmosphere and times (ASTM D618, Procedure A). */
export const ASTM_D618_PROCEDURE_A = {
  temperatureC: 23,
  temperatureTolC: 2,
  humidityPct: 50,
  humidityTolPct: 10,
  /** Least hours for specimens up to and including this thickness. */
  thinMaxThicknessMm: 7,
  thinMinHours: 40,
  thickMinHours: 88,
} as const;

/** ISO 291 standard atmospheres (temperature °C / relative humidity %). */
export const ISO_291_ATMOSPHERES = {
  '23/50': { temperatureC: 23, humidityPct: 50 },
  '27/65': { temperatureC: 27, humidityPct: 65 },
} as const;

/** ISO 291 tolerance classes. */
export const ISO_291_CLASSES = {
  1: { temperatureTolC: 1, humidityTolPct: 5 },
  2: { temperatureTolC: 2, humidityTolPct: 10 },
} as const;

/**
 * An ISO 291 atmosphere and tolerance class as a conditioning rule. ISO 291 leaves the time to
 * the material's standard, so the caller gives it.
 */
export function iso291Rule(atmosphere: keyof typeof ISO_291_ATMOSPHERES, tolClass: 1 | 2, minHours: number): ConditioningRule {
  return { ...ISO_291_ATMOSPHERES[atmosphere], ...ISO_291_CLASSES[tolClass], minHours };
}

/**
 * ASTM D618 Procedure A as a conditioning rule for a specimen of this thickness. An unknown
 * thickness takes the longer time, so a rule is never judged against too lenient a minimum.
 */
export function astmD618ProcedureA(thicknessMm: number | null): ConditioningRule {
  const p = ASTM_D618_PROCEDURE_A;
  const thin = thicknessMm !== null && thicknessMm <= p.thinMaxThicknessMm;
  return {
    temperatureC: p.temperatureC,
    temperatureTolC: p.temperatureTolC,
    humidityPct: p.humidityPct,
    humidityTolPct: p.humidityTolPct,
    minHours: thin ? p.thinMinHours : p.thickMinHours,
  };
}

/** Result of comparing a rule with a reference: `shortfalls` says in plain words where it is weaker. */
export type RuleComparison = { atLeastAsStrict: boolean; reference: ConditioningRule; shortfalls: string[] };

// Band edges are sums of decimals in binary floating point; a millionth of a unit is no difference.
const EPS = 1e-6;

/**
 * Whether a conditioning rule is at least as strict as another: its temperature and humidity
 * bands lie inside the reference's, and its time is at least as long.
 */
export function compareConditioningRules(rule: ConditioningRule, reference: ConditioningRule): RuleComparison {
  const shortfalls: string[] = [];
  const band = (target: number, tol: number): [number, number] => [target - tol, target + tol];
  const [tLo, tHi] = band(rule.temperatureC, rule.temperatureTolC);
  const [rtLo, rtHi] = band(reference.temperatureC, reference.temperatureTolC);
  if (tLo < rtLo - EPS || tHi > rtHi + EPS) {
    shortfalls.push(`temperature ${fmt(tLo)}–${fmt(tHi)} °C is not within ${fmt(rtLo)}–${fmt(rtHi)} °C`);
  }
  const [hLo, hHi] = band(rule.humidityPct, rule.humidityTolPct);
  const [rhLo, rhHi] = band(reference.humidityPct, reference.humidityTolPct);
  if (hLo < rhLo - EPS || hHi > rhHi + EPS) {
    shortfalls.push(`humidity ${fmt(hLo)}–${fmt(hHi)} % RH is not within ${fmt(rhLo)}–${fmt(rhHi)} % RH`);
  }
  if (rule.minHours < reference.minHours - EPS) {
    shortfalls.push(`${fmt(rule.minHours)} h is shorter than ${fmt(reference.minHours)} h`);
  }
  return { atLeastAsStrict: shortfalls.length === 0, reference, shortfalls };
}

/** Whether a rule is at least as strict as ASTM D618 Procedure A for a specimen of this thickness. */
export function checkAgainstAstmD618(rule: ConditioningRule, thicknessMm: number | null): RuleComparison {
  return compareConditioningRules(rule, astmD618ProcedureA(thicknessMm));
}

/** Hours an item may stay at a station of each kind before it is a long dwell; null: no limit. */
export type DwellLimits = Partial<Record<StationKind, number | null>>;

/** Limit for station kinds not listed, and for stations whose kind is unknown. */
export const DEFAULT_DWELL_HOURS = 72;

/**
 * Default limits. Conditioning runs 40–88 h under ASTM D618 Procedure A, so a chamber gets a
 * week; a store is where retained items are meant to wait, so it has no limit.
 */
export const DEFAULT_DWELL_LIMITS: DwellLimits = { conditioning: 168, store: null };

/** Where one item (or a piece it claims to be) was, from one event until the next that moved it. */
export type Placement = {
  /** The code of the item whose chain records this placement. */
  item: string;
  /** The physical piece: the item's own code, or for a half the half code its split_from names. */
  piece: string;
  seq: number;
  station: string | null;
  container: string | null;
  /** Device time of the event that put it there. */
  from: string;
  /** Device time of the event that moved it on or ended its custody; null while it is still there. */
  until: string | null;
};

/** What detectAnomalies looks at. Only `item`, `kind`, `events` and `now` are required. */
export type AnomalyInput = {
  item: string;
  kind: ItemKind;
  /** The item's events, any order (they are read in seq order), voids included. */
  events: readonly AnomalyEvent[];
  /** Dwell runs up to this instant for an item still at its station. */
  now: Date | string;
  /** The verifier's result over this item's chain (or a wider run that may name it). */
  chain?: ChainVerification | null;
  /** Station code → kind, for dwell limits. */
  stationKinds?: Readonly<Record<string, StationKind>>;
  /** The lab's limits; kinds left out fall back to DEFAULT_DWELL_LIMITS, then DEFAULT_DWELL_HOURS. */
  dwellLimitsHours?: DwellLimits;
  /** The order's conditioning rule, when it has one; `thicknessMm` picks the D618 time. */
  conditioning?: { rule: ConditioningRule; thicknessMm?: number | null; compareWithD618?: boolean } | null;
  /** Other items' placements (from placementsOf), for the lab-wide two-places check. */
  otherPlacements?: readonly Placement[];
  /** Clock disagreement between devices that is not worth reporting; default 120 s. */
  clockToleranceSeconds?: number;
  /** A step back in device time at least this long is critical; default 24 h. */
  farBackHours?: number;
};

const HOUR = 3_600_000;
const SEVERITY_RANK: Record<AnomalySeverity, number> = { info: 0, warning: 1, critical: 2 };

function fmt(value: number): string {
  return String(Math.round(value * 1000) / 1000);
}

function hours(ms: number): number {
  return Math.round((ms / HOUR) * 10) / 10;
}

function describeSpan(ms: number): string {
  const abs = Math.abs(ms);
  if (abs < HOUR) return `${Math.round(abs / 60_000)} min`;
  return `${hours(abs)} h`;
}

function at(text: string): number {
  const time = Date.parse(text);
  if (!Number.isFinite(time)) throw new RangeError(`not an instant: ${text}`);
  return time;
}

function label(event: AnomalyEvent): string {
  return `seq ${event.seq} (${event.type.replace(/_/g, ' ')})`;
}

/** Events in force, oldest first: a void removes the event it corrects, and is not itself in force. */
function eventsInForce(sorted: readonly AnomalyEvent[]): AnomalyEvent[] {
  const inForce: AnomalyEvent[] = [];
  for (const event of sorted) {
    if (event.type === 'voided') {
      const index = inForce.findIndex((e) => e.hash === event.corrects);
      if (index >= 0) inForce.splice(index, 1);
    } else {
      inForce.push(event);
    }
  }
  return inForce;
}

/**
 * The main path of a kind: the event types it accepts, in EVENT_TYPES order, up to `retained`
 * (the state machine lists the main path first). Specimen: registered, cut, conditioning_started,
 * conditioned, measured, tested, binned, retained. Half: split_from, binned, retained.
 */
export function mainPath(kind: ItemKind): EventType[] {
  const end = EVENT_TYPES.indexOf('retained');
  return EVENT_TYPES.slice(0, end + 1).filter((type) => TRANSITIONS[kind][type] !== undefined);
}

const CONDITIONING_STEPS: ReadonlySet<EventType> = new Set(['conditioning_started', 'conditioned']);
// A specimen rejected before test goes to storage without these steps.
const EXCUSED_BY_REJECTION: ReadonlySet<EventType> = new Set([
  'conditioning_started',
  'conditioned',
  'measured',
  'tested',
  'binned',
]);
// The reported result depends on what came before the test.
const BEFORE_RESULT: ReadonlySet<EventType> = new Set(['cut', 'conditioning_started', 'conditioned', 'measured']);

function missingSteps(kind: ItemKind, inForce: readonly AnomalyEvent[], conditioningRequired: boolean): Anomaly[] {
  const path = mainPath(kind);
  const position = new Map(path.map((type, index) => [type, index] as const));
  const found: Anomaly[] = [];
  for (let s = 0; s < path.length; s++) {
    const step = path[s];
    if (CONDITIONING_STEPS.has(step) && !conditioningRequired) {
      // Conditioning is optional, but once started it must be finished before the next step.
      if (step !== 'conditioned' || !inForce.some((e) => e.type === 'conditioning_started')) continue;
    }
    const later = inForce.findIndex((event, index) => {
      const p = isEventType(event.type) ? position.get(event.type) : undefined;
      if (p === undefined || p <= s) return false;
      const rejectedBefore = inForce.slice(0, index).some((e) => e.type === 'rejected');
      return !(rejectedBefore && EXCUSED_BY_REJECTION.has(step));
    });
    if (later < 0) continue;
    if (inForce.slice(0, later).some((e) => e.type === step)) continue;
    const next = inForce[later];
    // Never started and never finished is one gap, not two.
    if (step === 'conditioned' && found.some((a) => a.details.missing === 'conditioning_started' && a.eventSeq === next.seq)) {
      continue;
    }
    const testStep = position.get('tested');
    const nextStep = position.get(next.type as EventType) ?? -1;
    const critical = BEFORE_RESULT.has(step) && testStep !== undefined && nextStep >= testStep;
    found.push({
      code: 'missing_step',
      severity: critical ? 'critical' : 'warning',
      eventSeq: next.seq,
      message: `${label(next)} has no ${step.replace(/_/g, ' ')} event before it.`,
      details: { missing: step, before: next.type, conditioningRequired },
    });
  }
  return found;
}

function sequenceAnomalies(sorted: readonly AnomalyEvent[], toleranceMs: number, farBackMs: number): Anomaly[] {
  const found: Anomaly[] = [];
  for (let i = 0; i < sorted.length; i++) {
    const event = sorted[i];
    const occurred = at(event.occurredAt);
    const recorded = at(event.recordedAt);
    if (occurred - recorded > toleranceMs) {
      found.push({
        code: 'clock_ahead',
        severity: 'info',
        eventSeq: event.seq,
        message: `${label(event)} is dated ${describeSpan(occurred - recorded)} after the server recorded it: the device clock is ahead.`,
        details: { occurredAt: event.occurredAt, recordedAt: event.recordedAt, aheadHours: hours(occurred - recorded) },
      });
    }
    if (i === 0) continue;
    const previous = sorted[i - 1];
    const back = at(previous.occurredAt) - occurred;
    if (back <= toleranceMs) continue;
    found.push({
      code: 'out_of_sequence',
      severity: back >= farBackMs ? 'critical' : 'warning',
      eventSeq: event.seq,
      message: `${label(event)} is dated ${describeSpan(back)} before ${label(previous)}, which comes before it in the chain.`,
      details: {
        previousSeq: previous.seq,
        occurredAt: event.occurredAt,
        previousOccurredAt: previous.occurredAt,
        backHours: hours(back),
      },
    });
  }
  return found;
}

// How the state machine moves an item's container; mirrored here because a chain with anomalies
// may not replay through applyEvent.
const CONTAINER_SETTING: ReadonlySet<string> = new Set(['registered', 'split_from', 'binned', 'retained', 'moved', 'sent', 'received']);
// After these the item is not at any station of the lab.
const CUSTODY_ENDING: ReadonlySet<string> = new Set(['returned', 'disposed', 'sent']);

function claimedPiece(kind: ItemKind, item: string, inForce: readonly AnomalyEvent[]): string {
  if (kind !== 'half') return item;
  const split = inForce.find((e) => e.type === 'split_from');
  const from = split?.payload.from;
  const half = split?.payload.half;
  if (typeof from !== 'string' || (half !== 'A' && half !== 'B')) return item;
  try {
    return halfCode(from, half);
  } catch {
    // Not one of our specimen codes (an imported chain, say): name the claim as written.
    return `${from}/${half}`;
  }
}

/**
 * Where an item was, from its events in force: one placement per stay at one place (a container,
 * or a station when no container is named). Custody ends at returned, disposed and sent, and for a
 * specimen at a test that broke it (its halves carry on). A half's `piece` is the half its
 * split_from names, so two items that claim the same half show up.
 */
export function placementsOf(kind: ItemKind, item: string, events: readonly AnomalyEvent[]): Placement[] {
  const sorted = [...events].sort((a, b) => a.seq - b.seq);
  const inForce = eventsInForce(sorted);
  const piece = claimedPiece(kind, item, inForce);
  const placements: Placement[] = [];
  let station: string | null = null;
  let container: string | null = null;
  let open: Placement | undefined;
  for (const event of inForce) {
    const ends =
      CUSTODY_ENDING.has(event.type) || (kind === 'specimen' && event.type === 'tested' && event.payload.fractured === true);
    station = event.station ?? station;
    if (CONTAINER_SETTING.has(event.type)) container = event.container;
    const place = ends ? null : (container ?? station);
    if (open !== undefined && !ends && placeOf(open) === place) continue;
    if (open !== undefined) open.until = event.occurredAt;
    open = undefined;
    if (ends) container = null;
    if (place === null) continue;
    open = { item, piece, seq: event.seq, station, container, from: event.occurredAt, until: null };
    placements.push(open);
  }
  return placements;
}

function span(p: Placement, now: number): [number, number] {
  const from = at(p.from);
  const until = p.until === null ? now : at(p.until);
  // When the next event is dated before this one, the stay has no length we can trust; the
  // next placement's overlap with the one before is where the clash shows.
  return [from, Math.max(from, until)];
}

function placeOf(p: Placement): string | null {
  return p.container ?? p.station;
}

function twoPlaces(
  item: string,
  own: readonly Placement[],
  others: readonly Placement[],
  now: number,
  toleranceMs: number,
): Anomaly[] {
  const found: Anomaly[] = [];
  const piece = own[0]?.piece ?? item;
  const claimants = new Map<string, Placement>();
  for (const other of others) {
    if (other.piece === piece && other.item !== item && !claimants.has(other.item)) claimants.set(other.item, other);
  }
  for (const [otherItem, other] of claimants) {
    found.push({
      code: 'half_claimed_twice',
      severity: 'critical',
      message: `${otherItem} also claims to be ${piece}: one piece cannot carry two codes.`,
      details: { piece, otherItem, otherSeq: other.seq, otherPlace: placeOf(other) },
    });
  }
  const candidates = [...own, ...others.filter((o) => o.item === item && o.piece === piece)];
  for (let j = 0; j < candidates.length; j++) {
    const later = candidates[j];
    const [laterFrom, laterUntil] = span(later, now);
    for (let i = 0; i < j; i++) {
      const earlier = candidates[i];
      // Candidates list this chain's placements first, so `earlier` is this chain's when either is.
      const mine = j < own.length ? later : i < own.length ? earlier : null;
      if (mine === null || placeOf(earlier) === placeOf(later)) continue;
      const [earlierFrom, earlierUntil] = span(earlier, now);
      const overlap = Math.min(earlierUntil, laterUntil) - Math.max(earlierFrom, laterFrom);
      if (overlap <= toleranceMs) continue;
      found.push({
        code: 'two_places',
        severity: 'critical',
        eventSeq: mine.seq,
        message: `${item} is recorded at ${placeOf(later)} (seq ${later.seq}${j < own.length ? '' : ', another record'}) from ${later.from} while the ledger still has it at ${placeOf(earlier)} (seq ${earlier.seq}), for ${describeSpan(overlap)}.`,
        details: {
          place: placeOf(later),
          otherPlace: placeOf(earlier),
          otherSeq: mine === later ? earlier.seq : later.seq,
          fromOtherRecord: j >= own.length,
          overlapHours: hours(overlap),
        },
      });
      break;
    }
  }
  return found;
}

/**
 * The dwell limit in hours for a station kind: the lab's own, else DEFAULT_DWELL_LIMITS, else
 * DEFAULT_DWELL_HOURS (also for a station of unknown kind); null means no limit.
 */
export function dwellLimit(stationKind: StationKind | undefined, limits: DwellLimits = {}): number | null {
  if (stationKind === undefined) return DEFAULT_DWELL_HOURS;
  const own = limits[stationKind];
  if (own !== undefined) return own;
  const standard = DEFAULT_DWELL_LIMITS[stationKind];
  return standard !== undefined ? standard : DEFAULT_DWELL_HOURS;
}

type Stay = { station: string; seq: number; from: string; until: number; ongoing: boolean };

/** Stays at one station, from the event that brought the item there to the one that took it away. */
function stays(kind: ItemKind, inForce: readonly AnomalyEvent[], now: number): Stay[] {
  const found: Stay[] = [];
  let current: { station: string; seq: number; from: string } | null = null;
  for (const event of inForce) {
    const time = at(event.occurredAt);
    if (event.station !== null && (current === null || current.station !== event.station)) {
      if (current !== null) found.push({ ...current, until: time, ongoing: false });
      current = { station: event.station, seq: event.seq, from: event.occurredAt };
    }
    const ends =
      CUSTODY_ENDING.has(event.type) || (kind === 'specimen' && event.type === 'tested' && event.payload.fractured === true);
    if (ends && current !== null) {
      found.push({ ...current, until: time, ongoing: false });
      current = null;
    }
  }
  if (current !== null) found.push({ ...current, until: now, ongoing: true });
  return found;
}

function dwellAnomalies(
  kind: ItemKind,
  inForce: readonly AnomalyEvent[],
  now: number,
  stationKinds: Readonly<Record<string, StationKind>>,
  limits: DwellLimits,
): Anomaly[] {
  const found: Anomaly[] = [];
  for (const stay of stays(kind, inForce, now)) {
    const stationKind = stationKinds[stay.station];
    const limit = dwellLimit(stationKind, limits);
    const length = stay.until - at(stay.from);
    if (limit === null || length <= limit * HOUR) continue;
    const { ongoing } = stay;
    found.push({
      code: 'long_dwell',
      severity: 'warning',
      eventSeq: stay.seq,
      message: `${ongoing ? 'Has been' : 'Was'} at ${stay.station} for ${describeSpan(length)}${ongoing ? ' so far' : ''}; the limit for ${stationKind ?? 'a station of unknown kind'} is ${fmt(limit)} h.`,
      details: {
        station: stay.station,
        stationKind: stationKind ?? null,
        since: stay.from,
        hours: hours(length),
        limitHours: limit,
        ongoing,
      },
    });
  }
  return found;
}

function chamberReadings(payload: Record<string, unknown>): ChamberReading[] {
  const raw = payload.chamber;
  const list = Array.isArray(raw) ? raw : raw === undefined ? [] : [raw];
  const readings: ChamberReading[] = [];
  for (const entry of list) {
    const parsed = ChamberReadingSchema.safeParse(entry);
    if (parsed.success) readings.push(parsed.data);
  }
  return readings;
}

function conditioningAnomalies(
  inForce: readonly AnomalyEvent[],
  conditioning: NonNullable<AnomalyInput['conditioning']>,
): Anomaly[] {
  const found: Anomaly[] = [];
  const { rule } = conditioning;
  const thickness = conditioning.thicknessMm ?? null;
  if (conditioning.compareWithD618 !== false) {
    const comparison = checkAgainstAstmD618(rule, thickness);
    if (!comparison.atLeastAsStrict) {
      found.push({
        code: 'conditioning_rule_weaker',
        severity: 'info',
        message: `The order's conditioning rule is less strict than ASTM D618 Procedure A: ${comparison.shortfalls.join('; ')}.`,
        details: { shortfalls: comparison.shortfalls, referenceMinHours: comparison.reference.minHours, thicknessMm: thickness },
      });
    }
  }

  const startIndex = inForce.findLastIndex((e) => e.type === 'conditioning_started');
  if (startIndex >= 0) {
    const start = inForce[startIndex];
    const end = inForce.slice(startIndex + 1).find((e) => e.type === 'conditioned');
    if (end !== undefined) {
      const length = at(end.occurredAt) - at(start.occurredAt);
      if (length < rule.minHours * HOUR - EPS) {
        const tested = inForce.slice(startIndex).some((e) => e.type === 'tested');
        found.push({
          code: 'short_conditioning',
          severity: tested ? 'critical' : 'warning',
          eventSeq: end.seq,
          message: `Conditioned for ${describeSpan(length)}; the order's rule asks for at least ${fmt(rule.minHours)} h.`,
          details: { hours: hours(length), minHours: rule.minHours, startedSeq: start.seq, tested },
        });
      }
    }
  }

  const tLo = rule.temperatureC - rule.temperatureTolC;
  const tHi = rule.temperatureC + rule.temperatureTolC;
  const hLo = rule.humidityPct - rule.humidityTolPct;
  const hHi = rule.humidityPct + rule.humidityTolPct;
  for (const event of inForce) {
    if (!CONDITIONING_STEPS.has(event.type as EventType)) continue;
    const readings = chamberReadings(event.payload);
    const outside = (values: number[], lo: number, hi: number): number[] =>
      values.filter((v) => v < lo - EPS || v > hi + EPS);
    const temperatures = readings.flatMap((r) => (r.temperatureC === undefined ? [] : [r.temperatureC]));
    const humidities = readings.flatMap((r) => (r.humidityPct === undefined ? [] : [r.humidityPct]));
    const checks = [
      { quantity: 'temperature', unit: '°C', bad: outside(temperatures, tLo, tHi), lo: tLo, hi: tHi, count: temperatures.length },
      { quantity: 'humidity', unit: '% RH', bad: outside(humidities, hLo, hHi), lo: hLo, hi: hHi, count: humidities.length },
    ];
    for (const check of checks) {
      if (check.bad.length === 0) continue;
      const worst = check.bad.reduce((a, b) => (distance(b, check.lo, check.hi) > distance(a, check.lo, check.hi) ? b : a));
      found.push({
        code: 'chamber_out_of_band',
        severity: 'warning',
        eventSeq: event.seq,
        message: `${check.bad.length} of ${check.count} chamber ${check.quantity} readings on ${label(event)} fall outside ${fmt(check.lo)}–${fmt(check.hi)} ${check.unit}; the worst is ${fmt(worst)} ${check.unit}.`,
        details: { quantity: check.quantity, outside: check.bad.length, readings: check.count, worst, low: check.lo, high: check.hi },
      });
    }
  }
  return found;
}

function distance(value: number, lo: number, hi: number): number {
  return value < lo ? lo - value : value - hi;
}

function chainAnomaly(item: string, chain: ChainVerification): Anomaly[] {
  if (chain.ok || chain.firstBreak.item !== item) return [];
  const { firstBreak } = chain;
  return [
    {
      code: 'broken_chain',
      severity: 'critical',
      ...(firstBreak.seq !== null ? { eventSeq: firstBreak.seq } : {}),
      message: `The hash chain is broken: ${firstBreak.message}.`,
      details: { reason: firstBreak.reason, expected: firstBreak.expected, actual: firstBreak.actual },
    },
  ];
}

/**
 * Finds anomalies in one item's chain: device times going backwards (and clocks ahead of the
 * server), a missing step on the state machine's main path, a long dwell at one station (up to
 * `now`), conditioning shorter than the order's rule or a rule weaker than ASTM D618 Procedure A,
 * chamber readings outside the rule's band, one piece in two places at once (or claimed by two
 * items), and a broken hash chain. Sorted most serious first, then by event.
 */
export function detectAnomalies(input: AnomalyInput): Anomaly[] {
  const now = input.now instanceof Date ? input.now.getTime() : at(input.now);
  const toleranceMs = (input.clockToleranceSeconds ?? 120) * 1000;
  const farBackMs = (input.farBackHours ?? 24) * HOUR;
  const sorted = [...input.events].sort((a, b) => a.seq - b.seq);
  const inForce = eventsInForce(sorted);
  const conditioningRequired = input.kind === 'specimen' && input.conditioning != null;

  const found: Anomaly[] = [
    ...sequenceAnomalies(sorted, toleranceMs, farBackMs),
    ...missingSteps(input.kind, inForce, conditioningRequired),
    // Containers are fixtures (a bin lives at its station), so only pieces can dwell too long.
    ...(input.kind === 'container'
      ? []
      : dwellAnomalies(input.kind, inForce, now, input.stationKinds ?? {}, input.dwellLimitsHours ?? {})),
    ...(input.conditioning != null && input.kind === 'specimen' ? conditioningAnomalies(inForce, input.conditioning) : []),
    ...twoPlaces(input.item, placementsOf(input.kind, input.item, sorted), input.otherPlacements ?? [], now, toleranceMs),
    ...(input.chain != null ? chainAnomaly(input.item, input.chain) : []),
  ];
  return found.sort(
    (a, b) =>
      SEVERITY_RANK[b.severity] - SEVERITY_RANK[a.severity] ||
      (a.eventSeq ?? Number.MAX_SAFE_INTEGER) - (b.eventSeq ?? Number.MAX_SAFE_INTEGER) ||
      ANOMALY_CODES.indexOf(a.code) - ANOMALY_CODES.indexOf(b.code),
  );
}

/** How detectAnomalies' answer for one input goes on changing as `now` moves on. */
export type AnomalyClock = {
  /**
   * The earliest instant after `now` at which a finding may appear or go, or change its code,
   * severity, event or the other record it names: a stay still going on reaching its dwell
   * limit, or a placement still open growing into an overlap with a stay dated after `now`. Null
   * when no later `now` changes which findings there are. May be early, never late.
   */
  changesAt: string | null;
  /**
   * Whether a finding's message and details keep changing with `now` while the findings stay the
   * same ones: a long dwell still going on, or an overlap still growing, counts its hours up to `now`.
   */
  running: boolean;
};

/**
 * When detectAnomalies(input) could next answer differently only because `now` moved on, so a
 * stored answer can be trusted until then. Reads the same stays, placements and limits the
 * detector does.
 */
export function anomalyClock(input: AnomalyInput): AnomalyClock {
  const now = input.now instanceof Date ? input.now.getTime() : at(input.now);
  const toleranceMs = (input.clockToleranceSeconds ?? 120) * 1000;
  const sorted = [...input.events].sort((a, b) => a.seq - b.seq);
  let changesAt = Number.POSITIVE_INFINITY;
  let running = false;
  if (input.kind !== 'container') {
    const ongoing = stays(input.kind, eventsInForce(sorted), now).find((s) => s.ongoing);
    const limit = ongoing === undefined ? null : dwellLimit(input.stationKinds?.[ongoing.station], input.dwellLimitsHours ?? {});
    if (ongoing !== undefined && limit !== null) {
      const from = at(ongoing.from);
      // The detector reports a stay longer than the limit, so the first whole millisecond past it.
      if (now - from > limit * HOUR) running = true;
      else changesAt = Math.min(changesAt, Math.floor(from + limit * HOUR) + 1);
    }
  }
  // The same pairs twoPlaces compares. An open placement runs up to `now`, so its overlap with
  // another grows while `now` is before the other's end (for ever when both are open).
  const own = placementsOf(input.kind, input.item, sorted);
  const piece = own[0]?.piece ?? input.item;
  const candidates = [...own, ...(input.otherPlacements ?? []).filter((o) => o.item === input.item && o.piece === piece)];
  for (let j = 0; j < candidates.length; j++) {
    for (let i = 0; i < j; i++) {
      const [a, b] = [candidates[i], candidates[j]];
      if ((i >= own.length && j >= own.length) || placeOf(a) === placeOf(b)) continue;
      if (a.until !== null && b.until !== null) continue;
      const closedEnd = a.until === null ? (b.until === null ? Number.POSITIVE_INFINITY : span(b, now)[1]) : span(a, now)[1];
      if (now >= closedEnd) continue;
      const [aFrom, aUntil] = span(a, now);
      const [bFrom, bUntil] = span(b, now);
      const start = Math.max(aFrom, bFrom);
      if (Math.min(aUntil, bUntil) - start > toleranceMs) running = true;
      else if (closedEnd - start > toleranceMs) changesAt = Math.min(changesAt, Math.floor(start + toleranceMs) + 1);
    }
  }
  return { changesAt: Number.isFinite(changesAt) ? new Date(changesAt).toISOString() : null, running };
}
