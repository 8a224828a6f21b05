import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { inlineParams } from '../../server/ledger/sql';
import { verifyLedger } from '../../server/commands/verify-ledger';
import { countRows, createSpecimen, scan, startLedgerRig, type LedgerRig } from './ledger-fixtures';

let rig: LedgerRig;
beforeAll(async () => {
  rig = await startLedgerRig();
});
afterAll(async () => rig?.t.close());

// Text that would break out of a quoted literal, or look like a parameter or a second statement.
const AWKWARD = `O'Brien's "bag" \\ back\\slash $1 $3 '); COMMIT; DROP TABLE items; -- Ω ✓ 🧪`;

describe('inlineParams', () => {
  it('writes text, whole numbers, lists and null as literals PostgreSQL reads back unchanged', async () => {
    const sql = inlineParams('SELECT $1::text AS a, $2::integer AS b, $3::text[] AS c, $4::text[] AS d, $5::text AS e, $10::text AS f', [
      AWKWARD,
      42,
      [AWKWARD, 'plain'],
      [],
      null,
      // $10 must not be read as $1 followed by a 0.
      ...Array.from({ length: 4 }, () => 'unused'),
      'tenth',
    ]);
    const [rows] = await rig.t.sequelize.query(sql);
    expect(rows).toEqual([{ a: AWKWARD, b: 42, c: [AWKWARD, 'plain'], d: [], e: null, f: 'tenth' }]);
  });

  it('refuses a fraction or a missing value instead of writing something else', () => {
    expect(() => inlineParams('SELECT $1', [1.5])).toThrow(/whole number/);
    expect(() => inlineParams('SELECT $2', ['x'])).toThrow(/no value for \$2/);
  });
});

describe('a scan in its own transaction (BEGIN with the lock, COMMIT with the write)', () => {
  it('keeps an awkward payload exactly, and the chain verifies', async () => {
    const code = await createSpecimen(rig.t, rig.actor, rig.sampleId);
    const res = await rig.tech.post('/api/events', scan('label_printed', code, { payload: { note: AWKWARD } })).expect(201);
    const [rows] = await rig.t.sequelize.query('SELECT payload FROM custody_events WHERE id = $1', { bind: [res.body.event.id] });
    expect((rows as { payload: { note: string } }[])[0]?.payload.note).toBe(AWKWARD);
    expect((await verifyLedger(rig.t.sequelize)).ok).toBe(true);
  });

  it('writes nothing of a batch whose key was taken meanwhile, and answers the retry from the ledger', async () => {
    const codes = [await createSpecimen(rig.t, rig.actor, rig.sampleId), await createSpecimen(rig.t, rig.actor, rig.sampleId)];
    const first = scan('label_printed', codes[0]!);
    await rig.tech.post('/api/events', first).expect(201);
    const before = await countRows(rig.t, 'custody_events');
    // The same key again inside a batch, beside a new event: judged with the keys looked up, the
    // repeat is a replay and only the new event is written.
    const res = await rig.tech.post('/api/events/batch', { events: [first, scan('label_printed', codes[1]!)] }).expect(200);
    expect(res.body).toMatchObject({ recorded: 1, replayed: 1, refused: 0 });
    expect(await countRows(rig.t, 'custody_events')).toBe(before + 1);
  });

  it('leaves no transaction open on a pooled connection after a refusal or a failure', async () => {
    const code = await createSpecimen(rig.t, rig.actor, rig.sampleId);
    await rig.tech.post('/api/events', scan('binned', code)).expect(409);
    await rig.tech.post('/api/events', scan('label_printed', 'S26-99999-Z')).expect((r) => expect([404, 422]).toContain(r.status));
    const [rows] = await rig.t.sequelize.query(
      `SELECT count(*)::integer AS n FROM pg_stat_activity WHERE datname = current_database() AND state LIKE 'idle in transaction%'`,
    );
    expect((rows as { n: number }[])[0]?.n).toBe(0);
    await rig.tech.post('/api/events', scan('label_printed', code)).expect(201);
  });
});
