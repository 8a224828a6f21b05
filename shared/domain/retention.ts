/**
 * When a retained item may be disposed of: the retention rule that applies (order, then customer,
 * then the lab's default), the dispose-not-before instant in the lab's time zone, and whether
 * legal holds or the item's state stand in the way. Pure: the caller passes the rules, dates and
 * holds it loaded.
 */
import { add, addDays } from 'date-fns';
import { z } from 'zod';
import { describeState, TRANSITIONS, type ItemState, type ProjectionState } from './ledger/state-machine';

/** What a retention period counts from: the report's issue or the test. */
export const RETENTION_BASES = ['report', 'test'] as const;

/** What a retention period counts from. */
export type RetentionBasis = (typeof RETENTION_BASES)[number];

/** A retention rule: a period of whole days, months and years after the basis date. */
export const RetentionRuleSchema = z
  .strictObject({
    days: z.number().int().min(0).max(36_500).optional(),
    months: z.number().int().min(0).max(1_200).optional(),
    years: z.number().int().min(0).max(100).optional(),
    basis: z.enum(RETENTION_BASES),
  })
  .refine((rule) => rule.days !== undefined || rule.months !== undefined || rule.years !== undefined, {
    message: 'A retention rule gives days, months or years.',
  });

/** A retention rule. */
export type RetentionRule = z.infer<typeof RetentionRuleSchema>;

/** Where the rule that applies came from. */
export type RetentionSource = 'order' | 'customer' | 'lab';

/**
 * How a period that lands on a day the month does not have is settled. `clamp` (the default,
 * date-fns' behaviour): the last day of the month, so 2024-01-31 + 1 month = 2024-02-29 and
 * 2024-02-29 + 1 year = 2025-02-28. `overflow`: the spare days run into the next month, so
 * 2024-01-31 + 1 month = 2024-03-02 (a lab that never wants to shorten a period may choose it).
 */
export type EndOfMonthPolicy = 'clamp' | 'overflow';

/** The end-of-month policy used unless the caller names another. */
export const DEFAULT_END_OF_MONTH_POLICY: EndOfMonthPolicy = 'clamp';

/** A calendar date, YYYY-MM-DD. */
export type LocalDate = string;

/** When an item may go, and how that was worked out. */
export type DisposeDate = {
  /** The first instant it may be disposed of (UTC, ISO-8601 with milliseconds). */
  notBefore: string;
  /** The local day that instant begins. */
  firstDay: LocalDate;
  /** The local day the retention period ends (it runs to the end of this day). */
  periodEnds: LocalDate;
  /** The local day of the basis date. */
  basisDay: LocalDate;
  timeZone: string;
  endOfMonth: EndOfMonthPolicy;
};

const DATE_RE = /^(\d{4})-(\d{2})-(\d{2})$/;
const formatters = new Map<string, Intl.DateTimeFormat>();

function formatter(timeZone: string): Intl.DateTimeFormat {
  let format = formatters.get(timeZone);
  if (format === undefined) {
    try {
      format = new Intl.DateTimeFormat('en-US', {
        timeZone,
        calendar: 'gregory',
        numberingSystem: 'latn',
        hourCycle: 'h23',
        year: 'numeric',
        month: '2-digit',
        day: '2-digit',
        hour: '2-digit',
        minute: '2-digit',
        second: '2-digit',
      });
    } catch {
      throw new RangeError(`not a time zone this system knows: ${timeZone} (use an IANA name such as Europe/London)`);
    }
    formatters.set(timeZone, format);
  }
  return format;
}

function wallClock(time: number, timeZone: string): { year: number; month: number; day: number; hour: number; minute: number; second: number } {
  const parts: Record<string, number> = {};
  for (const part of formatter(timeZone).formatToParts(new Date(time))) {
    if (part.type !== 'literal') parts[part.type] = Number(part.value);
  }
  return { year: parts.year, month: parts.month, day: parts.day, hour: parts.hour, minute: parts.minute, second: parts.second };
}

function pad(value: number, width = 2): string {
  return String(value).padStart(width, '0');
}

function instant(value: Date | string): number {
  const time = value instanceof Date ? value.getTime() : Date.parse(value);
  if (!Number.isFinite(time)) throw new RangeError(`not an instant: ${String(value)}`);
  return time;
}

function parseDay(date: LocalDate): [number, number, number] {
  const match = DATE_RE.exec(date);
  if (match === null) throw new RangeError(`not a date in the form YYYY-MM-DD: ${date}`);
  const [year, month, day] = [Number(match[1]), Number(match[2]), Number(match[3])];
  const check = new Date(Date.UTC(year, month - 1, day));
  if (check.getUTCMonth() !== month - 1 || check.getUTCDate() !== day) throw new RangeError(`no such date: ${date}`);
  return [year, month, day];
}

/** The local calendar date of an instant in a time zone (IANA name). */
export function localDateOf(value: Date | string, timeZone: string): LocalDate {
  const { year, month, day } = wallClock(instant(value), timeZone);
  return `${pad(year, 4)}-${pad(month)}-${pad(day)}`;
}

/** The local date and time of an instant in a time zone (IANA name), as "YYYY-MM-DD HH:mm:ss". */
export function localDateTimeOf(value: Date | string, timeZone: string): string {
  const { year, month, day, hour, minute, second } = wallClock(instant(value), timeZone);
  return `${pad(year, 4)}-${pad(month)}-${pad(day)} ${pad(hour)}:${pad(minute)}:${pad(second)}`;
}

/** How far a zone's wall clock is ahead of UTC at an instant, in milliseconds. */
export function zoneOffsetMs(value: Date | string, timeZone: string): number {
  const time = instant(value);
  const wall = wallClock(time, timeZone);
  const asUtc = Date.UTC(wall.year, wall.month - 1, wall.day, wall.hour, wall.minute, wall.second);
  return asUtc - (time - (((time % 1000) + 1000) % 1000));
}

/**
 * The first instant of a local calendar day in a time zone. Where clocks skip midnight, the day
 * starts when they resume; where a whole day is skipped (Pacific/Apia, 2011-12-30), the next day's
 * start is returned.
 */
export function startOfLocalDay(date: LocalDate, timeZone: string): Date {
  const [year, month, day] = parseDay(date);
  const midnightAsUtc = Date.UTC(year, month - 1, day);
  // The offset may differ either side of midnight; try the offsets in force around it.
  const candidates = [-1, 0, 1].map((d) => midnightAsUtc - zoneOffsetMs(new Date(midnightAsUtc + d * 86_400_000), timeZone));
  const onTheDay = candidates.filter((time) => localDateOf(new Date(time), timeZone) === date).sort((a, b) => a - b);
  if (onTheDay.length > 0) return new Date(onTheDay[0]);
  const later = candidates.filter((time) => localDateOf(new Date(time), timeZone) > date).sort((a, b) => a - b);
  if (later.length > 0) return startOfLocalDay(localDateOf(new Date(later[0]), timeZone), timeZone);
  throw new RangeError(`cannot find the start of ${date} in ${timeZone}`);
}

/**
 * Adds a rule's period to a calendar date: years and months together (so one end-of-month
 * adjustment, not two), then days. Works on the calendar only, so daylight-saving changes cannot
 * move the result.
 */
export function addRetentionPeriod(
  date: LocalDate,
  period: Pick<RetentionRule, 'days' | 'months' | 'years'>,
  endOfMonth: EndOfMonthPolicy = DEFAULT_END_OF_MONTH_POLICY,
): LocalDate {
  const [year, month, day] = parseDay(date);
  const months = (period.years ?? 0) * 12 + (period.months ?? 0);
  // Local noon of the process's zone: date-fns works in local time, and no zone moves its clocks
  // by twelve hours, so the calendar fields read back are the ones meant.
  const start = new Date(year, month - 1, day, 12);
  const moved =
    endOfMonth === 'clamp'
      ? add(start, { months, days: period.days ?? 0 })
      : addDays(new Date(year, month - 1 + months, day, 12), period.days ?? 0);
  return `${pad(moved.getFullYear(), 4)}-${pad(moved.getMonth() + 1)}-${pad(moved.getDate())}`;
}

/**
 * The dispose-not-before instant for a rule and its basis date, in the lab's time zone: the basis
 * day (whatever the hour) plus the period gives the day the period ends; the item may go from the
 * start of the next local day.
 */
export function disposeNotBefore(
  rule: Pick<RetentionRule, 'days' | 'months' | 'years'>,
  basisAt: Date | string,
  timeZone: string,
  endOfMonth: EndOfMonthPolicy = DEFAULT_END_OF_MONTH_POLICY,
): DisposeDate {
  const basisDay = localDateOf(basisAt, timeZone);
  const periodEnds = addRetentionPeriod(basisDay, rule, endOfMonth);
  const firstDay = addRetentionPeriod(periodEnds, { days: 1 }, endOfMonth);
  const start = startOfLocalDay(firstDay, timeZone);
  return {
    notBefore: start.toISOString(),
    firstDay: localDateOf(start, timeZone),
    periodEnds,
    basisDay,
    timeZone,
    endOfMonth,
  };
}

/** The rules an item could fall under; the lab's default is always there. */
export type RetentionRules = {
  order?: RetentionRule | null;
  customer?: RetentionRule | null;
  lab: RetentionRule;
};

/** The rule that applies: the order's when set, otherwise the customer's, otherwise the lab's default. */
export function resolveRetentionRule(rules: RetentionRules): { rule: RetentionRule; source: RetentionSource } {
  if (rules.order != null) return { rule: rules.order, source: 'order' };
  if (rules.customer != null) return { rule: rules.customer, source: 'customer' };
  return { rule: rules.lab, source: 'lab' };
}

/** A legal hold on an order, a heat or an item; it blocks disposal until released. */
export type LegalHold = {
  scope: 'order' | 'heat' | 'item';
  /** The order number, heat number or item code it names. */
  ref: string;
  reason: string;
  placedAt: string;
  releasedAt?: string | null;
};

/** What disposalCheck needs to know about one item. */
export type DisposalItem = {
  code: string;
  kind: 'specimen' | 'half';
  state: ProjectionState;
  /** While the item is on hold in the ledger: the state it was held from. */
  heldFrom?: ItemState | null;
  /** The order number and heat number the item belongs to. */
  order: string;
  heat: string;
  /** For a half: the specimen it came from (a hold on the specimen covers its halves). */
  specimen?: string | null;
  rules: RetentionRules;
  /** When the order's report was issued; null while it has not been. */
  reportIssuedAt: string | null;
  /** When the item was tested (for a half, its specimen's test); a specimen rejected before test passes its rejection time. */
  testedAt: string | null;
  holds: readonly LegalHold[];
  /** The lab's time zone, an IANA name such as Europe/London. */
  timeZone: string;
  endOfMonth?: EndOfMonthPolicy;
};

/** The verdict for one item, with a sentence a clerk can read. */
export type DisposalCheck =
  | { status: 'may_go'; due: DisposeDate; rule: RetentionRule; source: RetentionSource; message: string }
  | { status: 'not_due'; due: DisposeDate | null; rule: RetentionRule; source: RetentionSource; message: string }
  | { status: 'held'; holds: LegalHold[]; ledgerHold: boolean; message: string }
  | { status: 'not_retained'; state: ProjectionState; message: string };

/** The states from which the state machine lets an item of this kind be disposed of. */
export function disposableStates(kind: 'specimen' | 'half'): readonly ProjectionState[] {
  return TRANSITIONS[kind].disposed?.from ?? [];
}

function holdApplies(hold: LegalHold, item: DisposalItem, now: number): boolean {
  if (instant(hold.placedAt) > now) return false;
  if (hold.releasedAt != null && instant(hold.releasedAt) <= now) return false;
  switch (hold.scope) {
    case 'order':
      return hold.ref === item.order;
    case 'heat':
      return hold.ref === item.heat;
    case 'item':
      return hold.ref === item.code || (item.specimen != null && hold.ref === item.specimen);
  }
}

function describeHold(hold: LegalHold): string {
  return `${hold.scope} ${hold.ref} (${hold.reason})`;
}

/**
 * Whether an item may be disposed of now. In this order: `not_retained` when its state does not
 * allow disposal (an item on hold in the ledger is judged by the state it was held from);
 * `held` when a legal hold on its order, heat or itself (or its specimen) is in force at `now`, or
 * it is on hold in the ledger; `not_due` before its dispose-not-before date, or with no date yet
 * (report not issued, no test date); otherwise `may_go`.
 */
export function disposalCheck(item: DisposalItem, now: Date | string): DisposalCheck {
  const time = instant(now);
  const disposable = disposableStates(item.kind);
  const ledgerHold = item.state === 'held';
  const effectiveState = ledgerHold ? (item.heldFrom ?? item.state) : item.state;
  if (!disposable.includes(effectiveState)) {
    const was = ledgerHold && item.heldFrom != null ? ` (held from ${describeState(item.heldFrom)})` : '';
    return {
      status: 'not_retained',
      state: item.state,
      message: `${item.code} is ${describeState(item.state)}${was}; only ${disposable.map(describeState).join(' or ')} items may be disposed of.`,
    };
  }

  const holds = item.holds.filter((hold) => holdApplies(hold, item, time));
  if (holds.length > 0 || ledgerHold) {
    const reasons = [...(ledgerHold ? ['a hold in the ledger'] : []), ...holds.map(describeHold)];
    return { status: 'held', holds, ledgerHold, message: `${item.code} is held by ${reasons.join('; ')}.` };
  }

  const { rule, source } = resolveRetentionRule(item.rules);
  const basisAt = rule.basis === 'report' ? item.reportIssuedAt : item.testedAt;
  if (basisAt === null) {
    const missing = rule.basis === 'report' ? 'the report has not been issued' : 'it has no test date';
    return {
      status: 'not_due',
      due: null,
      rule,
      source,
      message: `${item.code} is kept until a date counted from the ${rule.basis}, and ${missing}.`,
    };
  }
  const due = disposeNotBefore(rule, basisAt, item.timeZone, item.endOfMonth ?? DEFAULT_END_OF_MONTH_POLICY);
  if (time < instant(due.notBefore)) {
    return { status: 'not_due', due, rule, source, message: `${item.code} may not be disposed of before ${due.firstDay} (${item.timeZone}).` };
  }
  return { status: 'may_go', due, rule, source, message: `${item.code} may be disposed of: retention ended ${due.periodEnds}.` };
}
