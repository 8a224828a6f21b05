import { afterEach, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { addMonths, addYears } from 'date-fns';
import {
  localDateTimeOf,
  addRetentionPeriod,
  disposableStates,
  disposalCheck,
  disposeNotBefore,
  localDateOf,
  resolveRetentionRule,
  RetentionRuleSchema,
  startOfLocalDay,
  zoneOffsetMs,
  type DisposalItem,
  type LegalHold,
  type RetentionRule,
} from './retention';

// Zone rules below are from the tz database as Node's Intl ships it; the rule descriptions in the
// comments are from memory, and each instant was reproduced with Intl.DateTimeFormat [run].
const HOUR = 3_600_000;

describe('RetentionRuleSchema', () => {
  it('takes whole days, months or years and a basis', () => {
    expect(RetentionRuleSchema.safeParse({ days: 90, basis: 'report' }).success).toBe(true);
    expect(RetentionRuleSchema.safeParse({ years: 2, months: 6, basis: 'test' }).success).toBe(true);
    expect(RetentionRuleSchema.safeParse({ days: 0, basis: 'report' }).success).toBe(true);
  });

  it('refuses a rule with no period, a fraction, a negative or an unknown basis', () => {
    expect(RetentionRuleSchema.safeParse({ basis: 'report' }).success).toBe(false);
    expect(RetentionRuleSchema.safeParse({ days: 1.5, basis: 'report' }).success).toBe(false);
    expect(RetentionRuleSchema.safeParse({ months: -1, basis: 'report' }).success).toBe(false);
    expect(RetentionRuleSchema.safeParse({ days: 30, basis: 'delivery' }).success).toBe(false);
  });
});

describe('resolveRetentionRule', () => {
  const lab: RetentionRule = { years: 1, basis: 'report' };
  const customer: RetentionRule = { days: 180, basis: 'report' };
  const order: RetentionRule = { days: 0, basis: 'test' };

  it('takes the order’s rule when set, even a zero-day one', () => {
    expect(resolveRetentionRule({ order, customer, lab })).toEqual({ rule: order, source: 'order' });
  });

  it('falls back to the customer’s rule, then the lab’s default', () => {
    expect(resolveRetentionRule({ order: null, customer, lab })).toEqual({ rule: customer, source: 'customer' });
    expect(resolveRetentionRule({ customer: null, lab })).toEqual({ rule: lab, source: 'lab' });
  });
});

describe('addRetentionPeriod: month ends and leap days', () => {
  it('clamps to the month’s last day, as date-fns does', () => {
    // date-fns addMonths(2024-01-31, 1) = 2024-02-29 and addYears(2024-02-29, 1) = 2025-02-28 [run].
    expect(addRetentionPeriod('2024-01-31', { months: 1 })).toBe('2024-02-29');
    expect(addRetentionPeriod('2024-02-29', { years: 1 })).toBe('2025-02-28');
    expect(addRetentionPeriod('2023-01-31', { months: 1 })).toBe('2023-02-28');
    expect(addRetentionPeriod('2024-03-31', { months: 1 })).toBe('2024-04-30');
    expect(addRetentionPeriod('2024-02-29', { years: 4 })).toBe('2028-02-29');
    // 1900 is not a leap year, 2000 is (Gregorian rule, from memory; date-fns agrees [run]).
    expect(addRetentionPeriod('2096-02-29', { years: 4 })).toBe('2100-02-28');
    expect(addRetentionPeriod('1996-02-29', { years: 4 })).toBe('2000-02-29');
  });

  it('adds years and months in one step, so a period is clamped once', () => {
    // 2024-02-29 + 13 months = 2025-03-29; adding the year first would clamp to 02-28 and give 03-28.
    expect(addRetentionPeriod('2024-02-29', { years: 1, months: 1 })).toBe('2025-03-29');
    expect(addRetentionPeriod('2024-02-29', { years: 1, months: 1 })).toBe(
      localDay(addMonths(new Date(2024, 1, 29, 12), 13)),
    );
    expect(addRetentionPeriod('2024-01-31', { months: 1, days: 1 })).toBe('2024-03-01');
  });

  it('lets the spare days run on under the overflow policy', () => {
    expect(addRetentionPeriod('2024-01-31', { months: 1 }, 'overflow')).toBe('2024-03-02');
    expect(addRetentionPeriod('2023-01-31', { months: 1 }, 'overflow')).toBe('2023-03-03');
    expect(addRetentionPeriod('2024-02-29', { years: 1 }, 'overflow')).toBe('2025-03-01');
    expect(addRetentionPeriod('2024-03-15', { months: 1 }, 'overflow')).toBe('2024-04-15');
  });

  it('counts days across month ends, leap days and year ends', () => {
    expect(addRetentionPeriod('2024-02-28', { days: 1 })).toBe('2024-02-29');
    expect(addRetentionPeriod('2023-02-28', { days: 1 })).toBe('2023-03-01');
    expect(addRetentionPeriod('2024-12-31', { days: 1 })).toBe('2025-01-01');
    // 2024 has 366 days.
    expect(addRetentionPeriod('2024-01-01', { days: 365 })).toBe('2024-12-31');
    expect(addRetentionPeriod('2025-01-01', { days: 365 })).toBe('2026-01-01');
  });

  it('agrees with UTC day arithmetic for any date and day count', () => {
    fc.assert(
      fc.property(fc.date({ min: new Date(Date.UTC(1990, 0, 1)), max: new Date(Date.UTC(2090, 0, 1)), noInvalidDate: true }), fc.integer({ min: 0, max: 36_500 }), (date, days) => {
        const start = date.toISOString().slice(0, 10);
        const expected = new Date(Date.UTC(date.getUTCFullYear(), date.getUTCMonth(), date.getUTCDate() + days)).toISOString().slice(0, 10);
        expect(addRetentionPeriod(start, { days })).toBe(expected);
      }),
    );
  });

  it('agrees with date-fns addMonths and addYears for any date and month count', () => {
    fc.assert(
      fc.property(
        fc.date({ min: new Date(Date.UTC(1990, 0, 1)), max: new Date(Date.UTC(2090, 0, 1)), noInvalidDate: true }),
        fc.integer({ min: 0, max: 1_200 }),
        fc.integer({ min: 0, max: 100 }),
        (date, months, years) => {
          const start = date.toISOString().slice(0, 10);
          const local = new Date(date.getUTCFullYear(), date.getUTCMonth(), date.getUTCDate(), 12);
          expect(addRetentionPeriod(start, { months })).toBe(localDay(addMonths(local, months)));
          expect(addRetentionPeriod(start, { years })).toBe(localDay(addYears(local, years)));
        },
      ),
    );
  });

  it('refuses a date that does not exist', () => {
    expect(() => addRetentionPeriod('2023-02-29', { days: 1 })).toThrow(RangeError);
    expect(() => addRetentionPeriod('2023-2-1', { days: 1 })).toThrow(RangeError);
  });
});

function localDay(date: Date): string {
  return `${date.getFullYear()}-${String(date.getMonth() + 1).padStart(2, '0')}-${String(date.getDate()).padStart(2, '0')}`;
}

describe('time zones', () => {
  it('reads the local date and offset of an instant', () => {
    // UK: GMT in winter, BST (UTC+1) in summer; US Central: UTC−6, UTC−5 in summer; India UTC+5:30
    // all year (from memory) [run].
    expect(zoneOffsetMs('2024-01-15T12:00:00Z', 'Europe/London')).toBe(0);
    expect(zoneOffsetMs('2024-07-15T12:00:00Z', 'Europe/London')).toBe(HOUR);
    expect(zoneOffsetMs('2024-01-15T12:00:00Z', 'America/Chicago')).toBe(-6 * HOUR);
    expect(zoneOffsetMs('2024-07-15T12:00:00Z', 'America/Chicago')).toBe(-5 * HOUR);
    expect(zoneOffsetMs('2024-07-15T12:00:00.999Z', 'Asia/Kolkata')).toBe(5.5 * HOUR);
    expect(localDateOf('2024-06-30T23:30:00Z', 'Europe/London')).toBe('2024-07-01');
    expect(localDateOf('2024-06-30T23:30:00Z', 'America/Chicago')).toBe('2024-06-30');
    expect(localDateOf('2024-06-30T18:29:59Z', 'Asia/Kolkata')).toBe('2024-06-30');
    expect(localDateOf('2024-06-30T18:30:00Z', 'Asia/Kolkata')).toBe('2024-07-01');
  });

  it('finds the start of a local day on both sides of a clock change', () => {
    // UK clocks go forward at 01:00 UTC on the last Sunday of March (2024-03-31) and back at 01:00 UTC
    // on the last Sunday of October (2024-10-27) (from memory) [run].
    expect(startOfLocalDay('2024-03-31', 'Europe/London').toISOString()).toBe('2024-03-31T00:00:00.000Z');
    expect(startOfLocalDay('2024-04-01', 'Europe/London').toISOString()).toBe('2024-03-31T23:00:00.000Z');
    expect(startOfLocalDay('2024-10-27', 'Europe/London').toISOString()).toBe('2024-10-26T23:00:00.000Z');
    expect(startOfLocalDay('2024-10-28', 'Europe/London').toISOString()).toBe('2024-10-28T00:00:00.000Z');
    // US clocks change at 02:00 local on the second Sunday of March and the first Sunday of November.
    expect(startOfLocalDay('2024-03-10', 'America/Chicago').toISOString()).toBe('2024-03-10T06:00:00.000Z');
    expect(startOfLocalDay('2024-03-11', 'America/Chicago').toISOString()).toBe('2024-03-11T05:00:00.000Z');
    expect(startOfLocalDay('2024-11-03', 'America/Chicago').toISOString()).toBe('2024-11-03T05:00:00.000Z');
    expect(startOfLocalDay('2024-11-04', 'America/Chicago').toISOString()).toBe('2024-11-04T06:00:00.000Z');
    expect(startOfLocalDay('2024-06-01', 'Asia/Kolkata').toISOString()).toBe('2024-05-31T18:30:00.000Z');
  });

  it('starts a day when the clocks resume if they skip midnight', () => {
    // Chile moves its clocks forward at midnight: on 2024-09-08 local time runs 23:59:59 → 01:00 [run].
    expect(startOfLocalDay('2024-09-08', 'America/Santiago').toISOString()).toBe('2024-09-08T04:00:00.000Z');
    expect(localDateOf('2024-09-08T03:59:59Z', 'America/Santiago')).toBe('2024-09-07');
    // Samoa skipped 2011-12-30 altogether when it crossed the date line [run].
    expect(startOfLocalDay('2011-12-30', 'Pacific/Apia').toISOString()).toBe('2011-12-30T10:00:00.000Z');
    expect(localDateOf('2011-12-30T10:00:00Z', 'Pacific/Apia')).toBe('2011-12-31');
  });

  it('refuses an unknown zone with a clear message', () => {
    expect(() => localDateOf('2024-01-01T00:00:00Z', 'Mars/Olympus')).toThrow(/not a time zone this system knows: Mars\/Olympus/);
  });
});

describe('disposeNotBefore', () => {
  it('rounds up to the start of the local day after the period ends', () => {
    const due = disposeNotBefore({ months: 1 }, '2024-01-31T15:20:00Z', 'Europe/London');
    expect(due).toEqual({
      notBefore: '2024-03-01T00:00:00.000Z',
      firstDay: '2024-03-01',
      periodEnds: '2024-02-29',
      basisDay: '2024-01-31',
      timeZone: 'Europe/London',
      endOfMonth: 'clamp',
    });
    expect(disposeNotBefore({ months: 1 }, '2024-01-31T15:20:00Z', 'Europe/London', 'overflow').notBefore).toBe('2024-03-03T00:00:00.000Z');
  });

  it('counts from the basis day in the lab’s zone, not UTC', () => {
    // 2024-06-30 23:30 UTC is 1 July 00:30 in London and 30 June 18:30 in Chicago.
    const london = disposeNotBefore({ days: 30 }, '2024-06-30T23:30:00Z', 'Europe/London');
    expect([london.basisDay, london.periodEnds, london.notBefore]).toEqual(['2024-07-01', '2024-07-31', '2024-07-31T23:00:00.000Z']);
    const chicago = disposeNotBefore({ days: 30 }, '2024-06-30T23:30:00Z', 'America/Chicago');
    expect([chicago.basisDay, chicago.periodEnds, chicago.notBefore]).toEqual(['2024-06-30', '2024-07-30', '2024-07-31T05:00:00.000Z']);
  });

  it('keeps whole local days across a clock change', () => {
    // Chicago: period from 1 March (CST) ends 11 March (CDT); the item may go from 00:00 CDT on 12 March.
    expect(disposeNotBefore({ days: 10 }, '2024-03-01T18:00:00Z', 'America/Chicago').notBefore).toBe('2024-03-12T05:00:00.000Z');
    // London: a period ending on the day the clocks go forward, and one ending the day they go back.
    expect(disposeNotBefore({ days: 11 }, '2024-03-20T10:00:00Z', 'Europe/London').notBefore).toBe('2024-03-31T23:00:00.000Z');
    expect(disposeNotBefore({ days: 7 }, '2024-10-20T10:00:00Z', 'Europe/London').notBefore).toBe('2024-10-28T00:00:00.000Z');
  });

  it('settles a leap-day basis and a year end', () => {
    expect(disposeNotBefore({ years: 1 }, '2024-02-29T12:00:00Z', 'Europe/London').notBefore).toBe('2025-03-01T00:00:00.000Z');
    expect(disposeNotBefore({ years: 1 }, '2024-02-29T12:00:00Z', 'Europe/London', 'overflow').notBefore).toBe('2025-03-02T00:00:00.000Z');
    expect(disposeNotBefore({ days: 0 }, '2024-12-31T22:00:00Z', 'America/Chicago').notBefore).toBe('2025-01-01T06:00:00.000Z');
  });

  it('counts the basis day as day zero even at local midnight', () => {
    // 2024-05-01 23:00 UTC is 2 May 00:00 BST.
    const due = disposeNotBefore({ days: 0 }, '2024-05-01T23:00:00Z', 'Europe/London');
    expect([due.basisDay, due.notBefore]).toEqual(['2024-05-02', '2024-05-02T23:00:00.000Z']);
  });

  describe('whatever the server process’s own zone', () => {
    const original = process.env.TZ;
    afterEach(() => {
      if (original === undefined) delete process.env.TZ;
      else process.env.TZ = original;
    });

    // Offsets on 1 January 2024 (minutes behind UTC, as getTimezoneOffset counts them) [run].
    it.each([
      ['UTC', 0],
      ['Pacific/Kiritimati', -840],
      ['America/St_Johns', 210],
      ['Australia/Lord_Howe', -660],
    ] as const)('gives the same dates with TZ=%s', (zone, offset) => {
      process.env.TZ = zone;
      expect(new Date(2024, 0, 1, 12).getTimezoneOffset()).toBe(offset);
      expect(addRetentionPeriod('2024-01-31', { months: 1 })).toBe('2024-02-29');
      expect(addRetentionPeriod('2024-03-09', { days: 2 })).toBe('2024-03-11');
      expect(disposeNotBefore({ days: 10 }, '2024-03-01T18:00:00Z', 'America/Chicago').notBefore).toBe('2024-03-12T05:00:00.000Z');
      expect(disposeNotBefore({ years: 1 }, '2024-02-29T12:00:00Z', 'Europe/London').notBefore).toBe('2025-03-01T00:00:00.000Z');
    });
  });
});

describe('disposalCheck', () => {
  const hold = (over: Partial<LegalHold>): LegalHold => ({
    scope: 'order',
    ref: 'ORD-2026-014',
    reason: 'customer dispute over elongation',
    placedAt: '2026-01-10T09:00:00.000Z',
    ...over,
  });
  // Invented order, heat and codes.
  const base: DisposalItem = {
    code: 'S26-00157A-6',
    kind: 'half',
    state: 'retained',
    order: 'ORD-2026-014',
    heat: 'H-41877',
    specimen: 'S26-00157-W',
    rules: { order: { days: 90, basis: 'report' }, customer: { days: 30, basis: 'report' }, lab: { years: 1, basis: 'report' } },
    reportIssuedAt: '2026-01-05T14:00:00.000Z',
    testedAt: '2025-12-20T10:00:00.000Z',
    holds: [],
    timeZone: 'Europe/London',
  };
  // 2026-01-05 + 90 days = 2026-04-05; may go from 6 April 00:00 BST = 5 April 23:00 UTC.
  const DUE = '2026-04-05T23:00:00.000Z';

  it('says not due, with the date, before it, and may go from it', () => {
    const early = disposalCheck(base, '2026-04-05T22:59:59.999Z');
    expect(early).toMatchObject({ status: 'not_due', source: 'order', due: { notBefore: DUE, firstDay: '2026-04-06', periodEnds: '2026-04-05' } });
    expect(early.message).toBe('S26-00157A-6 may not be disposed of before 2026-04-06 (Europe/London).');
    const due = disposalCheck(base, DUE);
    expect(due).toMatchObject({ status: 'may_go', source: 'order', due: { notBefore: DUE } });
    expect(due.message).toBe('S26-00157A-6 may be disposed of: retention ended 2026-04-05.');
  });

  it('uses the customer’s rule, then the lab’s, when the order has none', () => {
    const customer = disposalCheck({ ...base, rules: { ...base.rules, order: null } }, '2026-02-05T00:00:00.000Z');
    // 2026-01-05 + 30 days = 2026-02-04, may go from 5 February 00:00 GMT.
    expect(customer).toMatchObject({ status: 'may_go', source: 'customer', due: { notBefore: '2026-02-05T00:00:00.000Z' } });
    const lab = disposalCheck({ ...base, rules: { lab: base.rules.lab } }, '2026-02-05T00:00:00.000Z');
    expect(lab).toMatchObject({ status: 'not_due', source: 'lab', due: { firstDay: '2027-01-06' } });
  });

  it('counts from the test when the rule says so, and waits for a report not yet issued', () => {
    const fromTest = disposalCheck({ ...base, rules: { lab: { days: 10, basis: 'test' } } }, '2026-01-01T00:00:00.000Z');
    expect(fromTest).toMatchObject({ status: 'may_go', due: { basisDay: '2025-12-20', notBefore: '2025-12-31T00:00:00.000Z' } });
    const noReport = disposalCheck({ ...base, reportIssuedAt: null }, '2030-01-01T00:00:00.000Z');
    expect(noReport).toEqual({
      status: 'not_due',
      due: null,
      rule: base.rules.order,
      source: 'order',
      message: 'S26-00157A-6 is kept until a date counted from the report, and the report has not been issued.',
    });
  });

  it('holds an item whose order, heat, specimen or self is under a legal hold', () => {
    const late = '2027-01-01T00:00:00.000Z';
    for (const h of [hold({}), hold({ scope: 'heat', ref: 'H-41877' }), hold({ scope: 'item', ref: 'S26-00157-W' }), hold({ scope: 'item', ref: 'S26-00157A-6' })]) {
      const check = disposalCheck({ ...base, holds: [h] }, late);
      expect(check).toMatchObject({ status: 'held', holds: [h], ledgerHold: false });
    }
    const both = disposalCheck({ ...base, holds: [hold({}), hold({ scope: 'heat', ref: 'H-41877', reason: 'mill recall' })] }, late);
    expect(both.message).toBe(
      'S26-00157A-6 is held by order ORD-2026-014 (customer dispute over elongation); heat H-41877 (mill recall).',
    );
  });

  it('ignores holds that are released, not yet placed, or on something else', () => {
    const late = '2027-01-01T00:00:00.000Z';
    const holds = [
      hold({ releasedAt: '2026-06-01T00:00:00.000Z' }),
      hold({ placedAt: '2027-02-01T00:00:00.000Z' }),
      hold({ ref: 'ORD-2026-015' }),
      hold({ scope: 'heat', ref: 'H-41878' }),
      hold({ scope: 'item', ref: 'S26-00157B-9' }),
    ];
    expect(disposalCheck({ ...base, holds }, late).status).toBe('may_go');
    // A hold released later than now still holds.
    expect(disposalCheck({ ...base, holds: [hold({ releasedAt: '2027-06-01T00:00:00.000Z' })] }, late).status).toBe('held');
  });

  it('holds an item on hold in the ledger, judged by the state it was held from', () => {
    expect(disposalCheck({ ...base, state: 'held', heldFrom: 'retained' }, '2027-01-01T00:00:00.000Z')).toMatchObject({
      status: 'held',
      holds: [],
      ledgerHold: true,
      message: 'S26-00157A-6 is held by a hold in the ledger.',
    });
    const specimen = { ...base, kind: 'specimen' as const, code: 'S26-00157-W', specimen: null };
    expect(disposalCheck({ ...specimen, state: 'held', heldFrom: 'measured' }, '2027-01-01T00:00:00.000Z')).toMatchObject({
      status: 'not_retained',
      message: 'S26-00157-W is held (held from measured); only retained or rejected items may be disposed of.',
    });
  });

  it('says not retained for items the state machine will not let go', () => {
    const late = '2027-01-01T00:00:00.000Z';
    expect(disposableStates('specimen')).toEqual(['retained', 'rejected']);
    expect(disposableStates('half')).toEqual(['retained']);
    for (const state of ['binned', 'disposed', 'returned', 'in_transit'] as const) {
      expect(disposalCheck({ ...base, state, holds: [hold({})] }, late)).toMatchObject({ status: 'not_retained', state });
    }
    expect(disposalCheck({ ...base, state: 'binned' }, late).message).toBe(
      'S26-00157A-6 is binned; only retained items may be disposed of.',
    );
    const rejected = { ...base, kind: 'specimen' as const, code: 'S26-00160-D', state: 'rejected' as const, specimen: null };
    expect(disposalCheck(rejected, late).status).toBe('may_go');
  });
});

describe('localDateTimeOf', () => {
  it('reads the wall clock of an instant in the lab zone', () => {
    // Source: the zone rules as Node's Intl applies them [run]: London is on GMT+1 in July, Chicago on CST (UTC−6) in January.
    expect(localDateTimeOf('2026-07-01T09:30:00.000Z', 'Europe/London')).toBe('2026-07-01 10:30:00');
    expect(localDateTimeOf('2026-01-15T03:05:09.000Z', 'America/Chicago')).toBe('2026-01-14 21:05:09');
    expect(localDateTimeOf('2026-01-15T03:05:09.000Z', 'UTC')).toBe('2026-01-15 03:05:09');
  });
});
