import { describe, expect, it } from 'vitest';
import {
  anomalyClock,
  ANOMALY_CODES,
  ASTM_D618_PROCEDURE_A,
  astmD618ProcedureA,
  checkAgainstAstmD618,
  compareConditioningRules,
  ConditioningRuleSchema,
  DEFAULT_DWELL_HOURS,
  detectAnomalies,
  dwellLimit,
  iso291Rule,
  mainPath,
  placementsOf,
  type Anomaly,
  type AnomalyEvent,
  type AnomalyInput,
  type ConditioningRule,
} from './anomalies';
import { halfCode, specimenCode } from './codes';
import { computeEventHash, GENESIS_HASH, verifyChain, type HashedEvent, type LedgerEvent } from './ledger/event-hash';

// Invented demo codes and stations.
const SPECIMEN = specimenCode(2026, 157);
const HALF_A = halfCode(SPECIMEN, 'A');
const OTHER_SPECIMEN = specimenCode(2026, 158);
const STATIONS = {
  'SAW-1': 'saw',
  'CHAMBER-1': 'conditioning',
  'GAUGE-1': 'gauge',
  'FRAME-2': 'frame',
  'BINS-1': 'bins',
  'STORE-1': 'store',
  'DISPATCH-1': 'dispatch',
} as const;
const BIN_A = 'C-00007-D';
const BAG = 'C-00042-R';

const T0 = Date.UTC(2026, 11, 1, 8, 0, 0);
const iso = (hours: number): string => new Date(T0 + hours * 3_600_000).toISOString();

type Step = {
  type: string;
  h: number;
  station?: string | null;
  container?: string | null;
  payload?: HashedEvent['payload'];
  /** Hours after the device time at which the server recorded it (default 0). */
  late?: number;
  corrects?: number;
};

const fakeHash = (seq: number): string => seq.toString(16).padStart(64, '0');

/** Events numbered from seq 1, with a distinct stand-in hash each (the chain check has its own tests). */
function chain(steps: Step[]): AnomalyEvent[] {
  return steps.map((step, index) => ({
    seq: index + 1,
    type: step.type,
    occurredAt: iso(step.h),
    recordedAt: iso(step.h + (step.late ?? 0)),
    station: step.station === undefined ? null : step.station,
    container: step.container ?? null,
    payload: step.payload ?? {},
    hash: fakeHash(index + 1),
    corrects: step.corrects === undefined ? null : fakeHash(step.corrects),
  }));
}

/** A specimen that went the whole main path without conditioning, a few hours a step. */
const HAPPY: Step[] = [
  { type: 'registered', h: 0, station: 'SAW-1' },
  { type: 'cut', h: 2, station: 'SAW-1' },
  { type: 'measured', h: 20, station: 'GAUGE-1', payload: { widthMm: [12.5, 12.49, 12.51] } },
  { type: 'tested', h: 21, station: 'FRAME-2', payload: { fractured: false } },
  { type: 'binned', h: 21.1, station: 'BINS-1', container: BIN_A },
  { type: 'retained', h: 40, station: 'STORE-1', container: BAG },
];

function run(events: AnomalyEvent[], extra: Partial<AnomalyInput> = {}) {
  return detectAnomalies({ item: SPECIMEN, kind: 'specimen', events, now: iso(50), stationKinds: STATIONS, ...extra });
}

const codes = (list: { code: string }[]) => list.map((a) => a.code);

describe('ASTM D618 Procedure A and ISO 291', () => {
  it('takes 40 h up to 7 mm and 88 h above', () => {
    // ASTM D618 Procedure A: 23 ± 2 °C, 50 ± 10 % RH, ≥ 40 h for thickness ≤ 7 mm, ≥ 88 h above [copy].
    expect(astmD618ProcedureA(3.2)).toEqual({ temperatureC: 23, temperatureTolC: 2, humidityPct: 50, humidityTolPct: 10, minHours: 40 });
    expect(astmD618ProcedureA(7).minHours).toBe(40);
    expect(astmD618ProcedureA(7.1).minHours).toBe(88);
    // Unknown thickness: the longer time, so no rule passes on a lenient reading.
    expect(astmD618ProcedureA(null).minHours).toBe(88);
    expect(ASTM_D618_PROCEDURE_A.thinMaxThicknessMm).toBe(7);
  });

  it('accepts a rule equal to Procedure A, and ISO 291 23/50 class 1 and 2 with enough time', () => {
    expect(checkAgainstAstmD618(astmD618ProcedureA(4), 4)).toEqual({ atLeastAsStrict: true, reference: astmD618ProcedureA(4), shortfalls: [] });
    // ISO 291: 23/50, class 1 ±1 °C ±5 % RH; class 2 ±2 °C ±10 % RH [copy]. Class 1 lies inside D618's band,
    // class 2 is the same band.
    expect(iso291Rule('23/50', 1, 88)).toEqual({ temperatureC: 23, temperatureTolC: 1, humidityPct: 50, humidityTolPct: 5, minHours: 88 });
    expect(checkAgainstAstmD618(iso291Rule('23/50', 1, 88), 10).atLeastAsStrict).toBe(true);
    expect(checkAgainstAstmD618(iso291Rule('23/50', 2, 40), 3).atLeastAsStrict).toBe(true);
  });

  it('says where a rule is weaker: ISO 291 27/65, a wider band, too short a time', () => {
    // ISO 291 27/65 [copy] is a standard atmosphere, but not Procedure A's 21–25 °C, 40–60 % RH [copy].
    const tropical = checkAgainstAstmD618(iso291Rule('27/65', 2, 88), 10);
    expect(tropical.atLeastAsStrict).toBe(false);
    expect(tropical.shortfalls).toEqual([
      'temperature 25–29 °C is not within 21–25 °C',
      'humidity 55–75 % RH is not within 40–60 % RH',
    ]);
    const wide: ConditioningRule = { temperatureC: 23, temperatureTolC: 3, humidityPct: 50, humidityTolPct: 10, minHours: 40 };
    expect(checkAgainstAstmD618(wide, 2).shortfalls).toEqual(['temperature 20–26 °C is not within 21–25 °C']);
    // 40 h is enough at 7 mm but not at 10 mm (88 h above 7 mm) [copy].
    const short = { ...astmD618ProcedureA(2) };
    expect(checkAgainstAstmD618(short, 7).atLeastAsStrict).toBe(true);
    expect(checkAgainstAstmD618(short, 10).shortfalls).toEqual(['40 h is shorter than 88 h']);
  });

  it('accepts a band that touches Procedure A’s edge and refuses one a tenth past it', () => {
    // 24 ± 1 °C is 23–25 °C, inside 21–25 °C; 24 ± 1.1 °C reaches 25.1 °C [copy for the D618 band].
    const base = { humidityPct: 45, humidityTolPct: 5, minHours: 40 };
    expect(checkAgainstAstmD618({ temperatureC: 24, temperatureTolC: 1, ...base }, 3).atLeastAsStrict).toBe(true);
    expect(checkAgainstAstmD618({ temperatureC: 24, temperatureTolC: 1.1, ...base }, 3).shortfalls).toEqual([
      'temperature 22.9–25.1 °C is not within 21–25 °C',
    ]);
    expect(checkAgainstAstmD618({ temperatureC: 23, temperatureTolC: 2, humidityPct: 44.9, humidityTolPct: 5, minHours: 40 }, 3).shortfalls).toEqual([
      'humidity 39.9–49.9 % RH is not within 40–60 % RH',
    ]);
  });

  it('compares two rules directly: ISO 291 class 2 is not as strict as class 1', () => {
    // ISO 291 23/50: class 1 ±1 °C ±5 % RH, class 2 ±2 °C ±10 % RH [copy].
    expect(compareConditioningRules(iso291Rule('23/50', 2, 88), iso291Rule('23/50', 1, 88)).shortfalls).toEqual([
      'temperature 21–25 °C is not within 22–24 °C',
      'humidity 40–60 % RH is not within 45–55 % RH',
    ]);
    expect(compareConditioningRules(iso291Rule('23/50', 1, 88), iso291Rule('23/50', 2, 88)).atLeastAsStrict).toBe(true);
  });

  it('validates a rule as an order stores it', () => {
    expect(ConditioningRuleSchema.safeParse(astmD618ProcedureA(3)).success).toBe(true);
    expect(ConditioningRuleSchema.safeParse({ ...astmD618ProcedureA(3), humidityPct: 120 }).success).toBe(false);
    expect(ConditioningRuleSchema.safeParse({ ...astmD618ProcedureA(3), note: 'x' }).success).toBe(false);
  });
});

describe('mainPath', () => {
  it('follows the state machine for each kind', () => {
    expect(mainPath('specimen')).toEqual([
      'registered',
      'cut',
      'conditioning_started',
      'conditioned',
      'measured',
      'tested',
      'binned',
      'retained',
    ]);
    expect(mainPath('half')).toEqual(['split_from', 'binned', 'retained']);
    expect(mainPath('container')).toEqual(['registered']);
  });
});

describe('detectAnomalies: a clean chain', () => {
  it('finds nothing in a specimen that went the main path in time', () => {
    expect(run(chain(HAPPY))).toEqual([]);
  });

  it('lists only known codes', () => {
    expect(ANOMALY_CODES).toContain('broken_chain');
    expect(new Set(ANOMALY_CODES).size).toBe(ANOMALY_CODES.length);
  });
});

describe('detectAnomalies: out of sequence', () => {
  it('ignores a step back within the clock tolerance (two devices, 30 s apart)', () => {
    const steps = HAPPY.map((s) => (s.type === 'tested' ? { ...s, h: 20 - 30 / 3600 } : s));
    expect(codes(run(chain(steps)))).toEqual([]);
  });

  it('warns when a device time goes backwards along the chain', () => {
    // Tested 10 min before the measurement that precedes it in the chain.
    const steps = HAPPY.map((s) => (s.type === 'tested' ? { ...s, h: 20 - 10 / 60 } : s));
    const found = run(chain(steps)).filter((a) => a.code === 'out_of_sequence');
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'warning', eventSeq: 4, details: { previousSeq: 3, backHours: 0.2 } });
    expect(found[0].message).toBe('seq 4 (tested) is dated 10 min before seq 3 (measured), which comes before it in the chain.');
  });

  it('is critical when an event is dated far before the one before it', () => {
    const steps = HAPPY.map((s) => (s.type === 'retained' ? { ...s, h: -10, late: 50 } : s));
    const found = run(chain(steps)).find((a) => a.code === 'out_of_sequence');
    expect(found).toMatchObject({ severity: 'critical', eventSeq: 6, details: { backHours: 31.1 } });
  });

  it('notes a device clock ahead of the server', () => {
    const events = chain(HAPPY);
    events[2] = { ...events[2], recordedAt: iso(20 - 0.5) };
    const found = run(events).filter((a) => a.code === 'clock_ahead');
    expect(found).toMatchObject([{ severity: 'info', eventSeq: 3, details: { aheadHours: 0.5 } }]);
  });
});

describe('detectAnomalies: missing step', () => {
  it('flags tested without measured as critical', () => {
    const steps = HAPPY.filter((s) => s.type !== 'measured');
    const found = run(chain(steps)).filter((a) => a.code === 'missing_step');
    expect(found).toEqual([
      {
        code: 'missing_step',
        severity: 'critical',
        eventSeq: 3,
        message: 'seq 3 (tested) has no measured event before it.',
        details: { missing: 'measured', before: 'tested', conditioningRequired: false },
      },
    ]);
  });

  it('flags measured without cut', () => {
    const steps = HAPPY.filter((s) => s.type !== 'cut');
    const found = run(chain(steps)).filter((a) => a.code === 'missing_step');
    expect(found).toMatchObject([{ severity: 'warning', eventSeq: 2, details: { missing: 'cut', before: 'measured' } }]);
  });

  it('flags a half retained without binned', () => {
    const events = chain([
      { type: 'split_from', h: 21, station: 'FRAME-2', payload: { from: SPECIMEN, half: 'A', fromEvent: fakeHash(9) } },
      { type: 'retained', h: 30, station: 'STORE-1', container: BAG },
    ]);
    const found = detectAnomalies({ item: HALF_A, kind: 'half', events, now: iso(31), stationKinds: STATIONS });
    expect(found).toMatchObject([{ code: 'missing_step', severity: 'warning', eventSeq: 2, details: { missing: 'binned' } }]);
  });

  it('does not ask a rejected specimen for the steps it skipped', () => {
    const events = chain([
      { type: 'registered', h: 0, station: 'SAW-1' },
      { type: 'cut', h: 1, station: 'SAW-1' },
      { type: 'rejected', h: 2, station: 'SAW-1', payload: { reason: 'tool mark in the gauge length' } },
      { type: 'retained', h: 3, station: 'STORE-1', container: BAG },
    ]);
    expect(run(events)).toEqual([]);
  });

  it('reads only events in force: a voided measurement leaves the test without one', () => {
    const events = chain([
      ...HAPPY.slice(0, 3),
      { type: 'voided', h: 20.5, station: 'GAUGE-1', payload: { reason: 'wrong specimen' }, corrects: 3 },
      { type: 'tested', h: 21, station: 'FRAME-2', payload: { fractured: false } },
    ]);
    expect(run(events, { now: iso(22) })).toMatchObject([
      { code: 'missing_step', severity: 'critical', eventSeq: 5, details: { missing: 'measured' } },
    ]);
  });

  it('asks for conditioning when the order has a rule, as one gap', () => {
    const rule = astmD618ProcedureA(3);
    const found = run(chain(HAPPY), { conditioning: { rule, thicknessMm: 3 } }).filter((a) => a.code === 'missing_step');
    expect(found).toMatchObject([{ severity: 'warning', eventSeq: 3, details: { missing: 'conditioning_started', conditioningRequired: true } }]);
  });

  it('asks a started conditioning to finish before measuring, even with no rule', () => {
    const steps: Step[] = [
      ...HAPPY.slice(0, 2),
      { type: 'conditioning_started', h: 3, station: 'CHAMBER-1' },
      ...HAPPY.slice(2),
    ];
    expect(run(chain(steps))).toMatchObject([{ code: 'missing_step', eventSeq: 4, details: { missing: 'conditioned' } }]);
  });
});

describe('detectAnomalies: long dwell', () => {
  it('uses 72 h by default for a gauge, and counts up to now for an item still there', () => {
    expect(DEFAULT_DWELL_HOURS).toBe(72);
    const events = chain(HAPPY.slice(0, 3));
    expect(run(events, { now: iso(20 + 71) })).toEqual([]);
    const found = run(events, { now: iso(20 + 73) });
    expect(found).toEqual([
      {
        code: 'long_dwell',
        severity: 'warning',
        eventSeq: 3,
        message: 'Has been at GAUGE-1 for 73 h so far; the limit for gauge is 72 h.',
        details: { station: 'GAUGE-1', stationKind: 'gauge', since: iso(20), hours: 73, limitHours: 72, ongoing: true },
      },
    ]);
  });

  it('flags a finished stay that was too long, with the lab’s own limit', () => {
    // Cut at 2 h, measured at 20 h: 18 h at the saw (registered at 0 h, same station).
    const found = run(chain(HAPPY), { dwellLimitsHours: { saw: 12 } });
    expect(found).toMatchObject([{ code: 'long_dwell', eventSeq: 1, details: { station: 'SAW-1', hours: 20, limitHours: 12, ongoing: false } }]);
  });

  it('gives a chamber a week and a store no limit; unknown stations take the default', () => {
    expect(dwellLimit('conditioning')).toBe(168);
    expect(dwellLimit('store')).toBeNull();
    expect(dwellLimit('frame')).toBe(72);
    expect(dwellLimit(undefined)).toBe(72);
    expect(dwellLimit('store', { store: 24 * 365 })).toBe(8760);
    // Two years in the store after retention: no finding.
    expect(run(chain(HAPPY), { now: iso(2 * 8760) })).toEqual([]);
    const elsewhere = chain([{ type: 'registered', h: 0, station: 'BENCH-9' }]);
    expect(run(elsewhere, { now: iso(73) })).toMatchObject([{ code: 'long_dwell', details: { stationKind: null, limitHours: 72 } }]);
  });

  it('stops counting when custody ends, and never for containers', () => {
    const returned = chain([...HAPPY, { type: 'returned', h: 45, station: 'DISPATCH-1' }]);
    expect(run(returned, { now: iso(1000) })).toEqual([]);
    const bin = chain([{ type: 'registered', h: 0, station: 'BINS-1', container: null }]);
    expect(detectAnomalies({ item: BIN_A, kind: 'container', events: bin, now: iso(5000), stationKinds: STATIONS })).toEqual([]);
  });
});

describe('detectAnomalies: conditioning', () => {
  const rule = astmD618ProcedureA(3); // 23 ± 2 °C, 50 ± 10 % RH, 40 h [copy]
  const conditioned = (hours: number, chamber?: HashedEvent['payload']): Step[] => [
    ...HAPPY.slice(0, 2),
    { type: 'conditioning_started', h: 3, station: 'CHAMBER-1', payload: chamber ?? {} },
    { type: 'conditioned', h: 3 + hours, station: 'CHAMBER-1', payload: chamber ?? {} },
    { type: 'measured', h: 3 + hours + 1, station: 'GAUGE-1' },
  ];

  it('accepts 40 h or more for a 3 mm specimen under Procedure A', () => {
    expect(run(chain(conditioned(40)), { conditioning: { rule, thicknessMm: 3 }, now: iso(45) })).toEqual([]);
  });

  it('flags 39 h against a 40 h rule, critical once the specimen was tested', () => {
    const found = run(chain(conditioned(39)), { conditioning: { rule, thicknessMm: 3 }, now: iso(44) });
    expect(found).toEqual([
      {
        code: 'short_conditioning',
        severity: 'warning',
        eventSeq: 4,
        message: "Conditioned for 39 h; the order's rule asks for at least 40 h.",
        details: { hours: 39, minHours: 40, startedSeq: 3, tested: false },
      },
    ]);
    const tested = chain([...conditioned(39), { type: 'tested', h: 44, station: 'FRAME-2', payload: { fractured: false } }]);
    expect(run(tested, { conditioning: { rule, thicknessMm: 3 }, now: iso(45) })[0]).toMatchObject({
      code: 'short_conditioning',
      severity: 'critical',
    });
  });

  it('notes an order rule weaker than Procedure A, unless told not to compare', () => {
    const tropical = iso291Rule('27/65', 2, 88);
    const found = run(chain(conditioned(90)), { conditioning: { rule: tropical, thicknessMm: 3 }, now: iso(95) });
    expect(found).toMatchObject([{ code: 'conditioning_rule_weaker', severity: 'info' }]);
    expect(found[0].message).toContain('temperature 25–29 °C is not within 21–25 °C');
    expect(run(chain(conditioned(90)), { conditioning: { rule: tropical, compareWithD618: false }, now: iso(95) })).toEqual([]);
  });

  it('flags chamber readings outside the rule’s band, worst first named', () => {
    const log: HashedEvent['payload'] = {
      chamber: [{ temperatureC: 23.4, humidityPct: 48 }, { temperatureC: 25.6, humidityPct: '61.5' }, { temperatureC: 20.8 }],
    };
    const found = run(chain(conditioned(41, log)), { conditioning: { rule, thicknessMm: 3 }, now: iso(46) });
    const band = found.filter((a) => a.code === 'chamber_out_of_band');
    // Band 21–25 °C and 40–60 % RH (ASTM D618 Procedure A [copy]); both conditioning events carry the log.
    expect(band).toHaveLength(4);
    expect(band[0]).toMatchObject({
      eventSeq: 3,
      severity: 'warning',
      details: { quantity: 'temperature', outside: 2, readings: 3, worst: 25.6, low: 21, high: 25 },
    });
    expect(band[0].message).toBe(
      '2 of 3 chamber temperature readings on seq 3 (conditioning started) fall outside 21–25 °C; the worst is 25.6 °C.',
    );
    expect(band[1]).toMatchObject({ eventSeq: 3, details: { quantity: 'humidity', outside: 1, readings: 2, worst: 61.5 } });
  });

  it('accepts a single in-band reading and ignores unreadable ones', () => {
    const found = run(chain(conditioned(41, { chamber: { temperatureC: 23.1, humidityPct: 51 } })), {
      conditioning: { rule, thicknessMm: 3 },
      now: iso(46),
    });
    expect(found).toEqual([]);
    const junk = run(chain(conditioned(41, { chamber: [{ temperatureC: 'warm' }, 7] })), {
      conditioning: { rule, thicknessMm: 3 },
      now: iso(46),
    });
    expect(junk).toEqual([]);
  });

  it('leaves conditioning to specimens', () => {
    const events = chain([
      { type: 'split_from', h: 0, station: 'FRAME-2', payload: { from: SPECIMEN, half: 'A', fromEvent: fakeHash(9) } },
      { type: 'binned', h: 0.1, station: 'BINS-1', container: BIN_A },
    ]);
    expect(detectAnomalies({ item: HALF_A, kind: 'half', events, now: iso(1), conditioning: { rule } })).toEqual([]);
  });
});

describe('placementsOf', () => {
  it('follows an item from station to container, and ends a specimen at its fracture', () => {
    const events = chain([
      { type: 'registered', h: 0, station: 'SAW-1' },
      { type: 'cut', h: 1, station: 'SAW-1' },
      { type: 'measured', h: 2, station: 'GAUGE-1' },
      { type: 'label_printed', h: 2.5 },
      { type: 'tested', h: 3, station: 'FRAME-2', payload: { fractured: true } },
    ]);
    expect(placementsOf('specimen', SPECIMEN, events)).toEqual([
      { item: SPECIMEN, piece: SPECIMEN, seq: 1, station: 'SAW-1', container: null, from: iso(0), until: iso(2) },
      { item: SPECIMEN, piece: SPECIMEN, seq: 3, station: 'GAUGE-1', container: null, from: iso(2), until: iso(3) },
    ]);
  });

  it('names the half a split_from claims as the piece', () => {
    const events = chain([
      { type: 'split_from', h: 3, station: 'FRAME-2', payload: { from: SPECIMEN, half: 'A', fromEvent: fakeHash(9) } },
      { type: 'binned', h: 3.1, station: 'BINS-1', container: BIN_A },
      { type: 'retained', h: 20, station: 'STORE-1', container: BAG },
      { type: 'moved', h: 30, station: 'STORE-1', container: BAG },
    ]);
    const placements = placementsOf('half', 'S26-00999A-X', events);
    expect(placements.map((p) => [p.piece, p.container ?? p.station, p.from, p.until])).toEqual([
      [HALF_A, 'FRAME-2', iso(3), iso(3.1)],
      [HALF_A, BIN_A, iso(3.1), iso(20)],
      [HALF_A, BAG, iso(20), null],
    ]);
  });
});

describe('detectAnomalies: two places at once', () => {
  const half = (steps: Step[]) => chain([
    { type: 'split_from', h: 10, station: 'FRAME-2', payload: { from: SPECIMEN, half: 'A', fromEvent: fakeHash(9) } },
    ...steps,
  ]);

  it('flags a half put in a bag while the ledger still had it at the frame', () => {
    // The cell bins it at 10:30; a clerk's phone, offline, says it went into the bag at 10:12.
    const events = half([
      { type: 'binned', h: 10.5, station: 'BINS-1', container: BIN_A },
      { type: 'retained', h: 10.2, station: 'STORE-1', container: BAG, late: 2 },
    ]);
    const found = detectAnomalies({ item: HALF_A, kind: 'half', events, now: iso(12), stationKinds: STATIONS });
    expect(codes(found)).toEqual(['two_places', 'out_of_sequence']);
    expect(found[0]).toMatchObject({
      eventSeq: 3,
      details: { place: BAG, otherPlace: 'FRAME-2', otherSeq: 1, fromOtherRecord: false, overlapHours: 0.3 },
    });
    expect(found[0].message).toBe(
      `${HALF_A} is recorded at ${BAG} (seq 3) from ${iso(10.2)} while the ledger still has it at FRAME-2 (seq 1), for 18 min.`,
    );
  });

  it('flags two items that claim the same half code', () => {
    const mine = half([{ type: 'binned', h: 10.1, station: 'BINS-1', container: BIN_A }]);
    const impostor = chain([
      { type: 'split_from', h: 11, station: 'FRAME-2', payload: { from: SPECIMEN, half: 'A', fromEvent: fakeHash(8) } },
    ]);
    const honest = chain([
      { type: 'split_from', h: 11, station: 'FRAME-2', payload: { from: OTHER_SPECIMEN, half: 'A', fromEvent: fakeHash(7) } },
    ]);
    const others = [...placementsOf('half', 'S26-00999A-X', impostor), ...placementsOf('half', halfCode(OTHER_SPECIMEN, 'A'), honest)];
    const found = detectAnomalies({ item: HALF_A, kind: 'half', events: mine, now: iso(12), otherPlacements: others });
    expect(found).toEqual([
      {
        code: 'half_claimed_twice',
        severity: 'critical',
        message: `S26-00999A-X also claims to be ${HALF_A}: one piece cannot carry two codes.`,
        details: { piece: HALF_A, otherItem: 'S26-00999A-X', otherSeq: 1, otherPlace: 'FRAME-2' },
      },
    ]);
  });

  it('flags the same item placed elsewhere by another record at an overlapping time', () => {
    const mine = half([{ type: 'binned', h: 10.1, station: 'BINS-1', container: BIN_A }]);
    const elsewhere = [{ item: HALF_A, piece: HALF_A, seq: 7, station: 'STORE-1', container: BAG, from: iso(11), until: null }];
    const found = detectAnomalies({ item: HALF_A, kind: 'half', events: mine, now: iso(12), otherPlacements: elsewhere });
    // eventSeq points into this item's chain (the binning, seq 2); the other record's seq is in details.
    expect(found).toMatchObject([
      { code: 'two_places', eventSeq: 2, details: { place: BAG, otherPlace: BIN_A, otherSeq: 7, fromOtherRecord: true, overlapHours: 1 } },
    ]);
    expect(found[0].message).toBe(
      `${HALF_A} is recorded at ${BAG} (seq 7, another record) from ${iso(11)} while the ledger still has it at ${BIN_A} (seq 2), for 1 h.`,
    );
  });

  it('finds nothing when places follow each other', () => {
    const events = half([
      { type: 'binned', h: 10.1, station: 'BINS-1', container: BIN_A },
      { type: 'retained', h: 12, station: 'STORE-1', container: BAG },
    ]);
    expect(detectAnomalies({ item: HALF_A, kind: 'half', events, now: iso(13), stationKinds: STATIONS })).toEqual([]);
  });
});

describe('detectAnomalies: broken chain', () => {
  function realChain(): LedgerEvent[] {
    const events: LedgerEvent[] = [];
    let prevHash = GENESIS_HASH;
    HAPPY.forEach((step, index) => {
      const body: HashedEvent = {
        v: 1,
        item: SPECIMEN,
        seq: index + 1,
        type: step.type,
        actor: { kind: 'user', id: 3 },
        station: step.station ?? null,
        container: step.container ?? null,
        occurredAt: iso(step.h),
        recordedAt: iso(step.h),
        payload: step.payload ?? {},
        idempotencyKey: `k-${index}`,
        corrects: null,
        signature: null,
        prevHash,
      };
      const hash = computeEventHash(body);
      events.push({ ...body, hash });
      prevHash = hash;
    });
    return events;
  }

  it('passes a verified chain', () => {
    const events = realChain();
    expect(run(events, { chain: verifyChain(events) })).toEqual([]);
  });

  it('reports the verifier’s first break', () => {
    const events = realChain();
    events[2] = { ...events[2], payload: { widthMm: [12.5, 12.49, 12.61] } };
    const found = run(events, { chain: verifyChain(events) });
    expect(found).toMatchObject([{ code: 'broken_chain', severity: 'critical', eventSeq: 3, details: { reason: 'hash-mismatch' } }]);
    expect(found[0].message).toBe(
      `The hash chain is broken: ${SPECIMEN} seq 3: the stored hash is not the hash of the event's contents.`,
    );
  });

  it('ignores a break that belongs to another item', () => {
    const events = realChain();
    const other = realChain().map((e) => ({ ...e, item: OTHER_SPECIMEN }));
    expect(verifyChain(other).ok).toBe(false);
    expect(run(events, { chain: verifyChain(other) })).toEqual([]);
  });
});

describe('detectAnomalies: order', () => {
  it('puts critical findings first, then by event', () => {
    const steps = HAPPY.filter((s) => s.type !== 'measured').map((s) => (s.type === 'cut' ? { ...s, h: 30 } : s));
    const found = run(chain(steps), { now: iso(60) });
    expect(found.map((a) => [a.severity, a.code, a.eventSeq])).toEqual([
      ['critical', 'missing_step', 3],
      ['warning', 'out_of_sequence', 3],
    ]);
  });
});

describe('anomalyClock', () => {
  const at = (input: AnomalyInput) => anomalyClock(input);
  const gauge = chain(HAPPY.slice(0, 3));
  const input = (events: AnomalyEvent[], now: string): AnomalyInput => ({ item: SPECIMEN, kind: 'specimen', events, now, stationKinds: STATIONS });
  const shape = (list: { code: string; severity: string; eventSeq?: number }[]) => list.map((a) => [a.code, a.severity, a.eventSeq]);

  it('names the first millisecond a stay still going on passes its dwell limit', () => {
    // At the gauge since 20 h; 72 h is the default limit (DEFAULT_DWELL_HOURS).
    const clock = at(input(gauge, iso(20 + 71)));
    expect(clock).toEqual({ changesAt: new Date(T0 + (20 + 72) * 3_600_000 + 1).toISOString(), running: false });
    const changesAt = Date.parse(clock.changesAt!);
    expect(detectAnomalies(input(gauge, new Date(changesAt - 1).toISOString()))).toEqual([]);
    expect(codes(detectAnomalies(input(gauge, clock.changesAt!)))).toEqual(['long_dwell']);
  });

  it('says a long dwell going on keeps counting, with the same findings', () => {
    expect(at(input(gauge, iso(20 + 73)))).toEqual({ changesAt: null, running: true });
    const now = detectAnomalies(input(gauge, iso(20 + 73)));
    const later = detectAnomalies(input(gauge, iso(20 + 500)));
    expect(shape(later)).toEqual(shape(now));
    expect(later[0]?.details.hours).toBe(500);
  });

  it('finds nothing to wait for in a store, after custody ends, or in a container', () => {
    expect(at(input(chain(HAPPY), iso(50)))).toEqual({ changesAt: null, running: false });
    const returned = chain([...HAPPY, { type: 'returned', h: 45, station: 'DISPATCH-1' }]);
    expect(at(input(returned, iso(50)))).toEqual({ changesAt: null, running: false });
    const bin = chain([{ type: 'registered', h: 0, station: 'BINS-1' }]);
    expect(at({ item: BIN_A, kind: 'container', events: bin, now: iso(1), stationKinds: STATIONS })).toEqual({ changesAt: null, running: false });
  });

  it('names the millisecond an open placement grows into an overlap with a stay dated ahead of now', () => {
    // Saw from 0 h, gauge from 10 h, then the frame dated 5 h (a device clock behind): the frame
    // placement is open, and overlaps the saw's stay (until 10 h) more as now runs from 5 h to 10 h.
    const back = chain([
      { type: 'registered', h: 0, station: 'SAW-1' },
      { type: 'measured', h: 10, station: 'GAUGE-1' },
      { type: 'tested', h: 5, station: 'FRAME-2', payload: { fractured: false } },
    ]);
    const early = iso(5 + 1 / 60);
    const clock = at(input(back, early));
    // 120 s is the detector's default clock tolerance.
    expect(clock).toEqual({ changesAt: new Date(T0 + 5 * 3_600_000 + 120_000 + 1).toISOString(), running: false });
    const changesAt = Date.parse(clock.changesAt!);
    expect(codes(detectAnomalies(input(back, new Date(changesAt - 1).toISOString())))).not.toContain('two_places');
    expect(codes(detectAnomalies(input(back, clock.changesAt!)))).toContain('two_places');
    // Past the tolerance the overlap keeps growing until 10 h, and the frame's 72 h limit comes at 77 h.
    expect(at(input(back, iso(7)))).toEqual({ changesAt: new Date(T0 + 77 * 3_600_000 + 1).toISOString(), running: true });
    const overlap = (h: number) => detectAnomalies(input(back, iso(h))).find((a) => a.code === 'two_places')?.details.overlapHours;
    expect([overlap(7), overlap(9), overlap(12)]).toEqual([2, 4, 5]);
  });

  it('is never late: before changesAt the findings stay the same ones, and the same words unless running', () => {
    // Seeded walks over stations, containers, voids and steps back in time (mulberry32).
    let a = 99;
    const random = () => {
      a = (a + 0x6d2b79f5) >>> 0;
      let x = Math.imul(a ^ (a >>> 15), 1 | a);
      x = (x + Math.imul(x ^ (x >>> 7), 61 | x)) ^ x;
      return ((x ^ (x >>> 14)) >>> 0) / 4_294_967_296;
    };
    const pick = <T>(list: readonly T[]): T => list[Math.floor(random() * list.length)]!;
    const types = ['cut', 'conditioning_started', 'conditioned', 'measured', 'tested', 'binned', 'retained', 'moved', 'returned', 'voided'];
    let checked = 0;
    let changedThen = 0;
    let overlapsGrew = 0;
    for (let walk = 0; walk < 400; walk++) {
      let h = 0;
      let latest = 0;
      const steps: Step[] = [{ type: 'registered', h: 0, station: pick(Object.keys(STATIONS)) }];
      for (let i = 0; i < 1 + Math.floor(random() * 7); i++) {
        h += random() < 0.25 ? -random() * 30 : random() * 90;
        latest = Math.max(latest, h);
        const type = pick(types);
        steps.push({
          type,
          h,
          station: random() < 0.8 ? pick([...Object.keys(STATIONS), 'BENCH-9']) : null,
          container: random() < 0.4 ? pick([BIN_A, BAG]) : null,
          payload: type === 'tested' ? { fractured: random() < 0.5 } : {},
          ...(type === 'voided' ? { corrects: 1 + Math.floor(random() * (steps.length - 1)) + 1 } : {}),
        });
      }
      const events = chain(steps);
      // A third of the time before the latest device time, where open placements still grow into overlaps.
      const now = T0 + (random() < 1 / 3 ? h + random() * (latest - h + 0.1) : h + random() * 200) * 3_600_000;
      const base = input(events, new Date(now).toISOString());
      const clock = anomalyClock(base);
      const before = detectAnomalies(base);
      const until = clock.changesAt === null ? now + 2_000 * 3_600_000 : Date.parse(clock.changesAt) - 1;
      for (const later of [now + 1, now + (until - now) / 8, (now + until) / 2, until].map(Math.floor)) {
        if (later < now) continue;
        const found = detectAnomalies({ ...base, now: new Date(later).toISOString() });
        if (clock.running) expect(shape(found)).toEqual(shape(before));
        else expect(found).toEqual(before);
        const overlap = (list: Anomaly[]) => list.filter((f) => f.code === 'two_places').map((f) => f.details.overlapHours);
        if (clock.running && JSON.stringify(overlap(found)) !== JSON.stringify(overlap(before))) overlapsGrew++;
        checked++;
      }
      if (clock.changesAt !== null && JSON.stringify(detectAnomalies({ ...base, now: clock.changesAt })) !== JSON.stringify(before)) changedThen++;
    }
    // The walks reach both ways time acts: findings that appear at changesAt, and overlaps that grow.
    expect(changedThen).toBeGreaterThan(50);
    expect(overlapsGrew).toBeGreaterThan(5);
    expect(checked).toBeGreaterThan(1_000);
  });
});
