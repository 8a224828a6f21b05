import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { verifyChain } from '../../shared/domain/ledger/event-hash';
import { sealDay, sealDueDays } from '../../server/commands/seal-day';
import { verifyLedger } from '../../server/commands/verify-ledger';
import type { LedgerActor } from '../../server/ledger/types';
import type { TestContext } from '../support';
import { signedInAs, type SignedInAgent } from '../factories';
import { countRows, createSpecimen, scan, startLedgerRig } from './ledger-fixtures';

let t: TestContext;
let tech: SignedInAgent;
let actor: LedgerActor;
let sampleId: number;

beforeAll(async () => {
  ({ t, tech, actor, sampleId } = await startLedgerRig());
});
afterAll(async () => t?.close());

const today = () => new Date().toISOString().slice(0, 10);
const tomorrowMorning = () => new Date(Date.parse(`${today()}T00:00:00.000Z`) + 86_400_000 + 3_600_000);

/** Runs statements as the owner with the append-only triggers off, as a forger with the owner's password could. */
async function asForger(sql: string[], bind: unknown[] = []): Promise<void> {
  await t.owner.transaction(async (transaction) => {
    await t.owner.query('ALTER TABLE custody_events DISABLE TRIGGER custody_events_append_only_row', { transaction });
    for (const statement of sql) await t.owner.query(statement, { bind, transaction });
    await t.owner.query('ALTER TABLE custody_events ENABLE TRIGGER custody_events_append_only_row', { transaction });
  });
}

describe('the custody ledger is append-only', () => {
  it('refuses UPDATE, DELETE and TRUNCATE through the application connection', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    const attempts = [
      `UPDATE custody_events SET payload = '{"forged":true}' WHERE item_code = '${code}'`,
      `DELETE FROM custody_events WHERE item_code = '${code}'`,
      'TRUNCATE custody_events CASCADE',
      `UPDATE ledger_seals SET hash = hash`,
      `DELETE FROM scan_refusals`,
    ];
    for (const sql of attempts) {
      await expect(t.sequelize.query(sql)).rejects.toThrow(/permission denied|append-only/);
    }
    expect(await countRows(t, 'custody_events', 'item_code = $1', [code])).toBe(1);
  });

  it('gives the application role no UPDATE, DELETE or TRUNCATE privilege on the ledger tables', async () => {
    const rows = await t.sequelize.query<{ table: string; update: boolean; delete: boolean; truncate: boolean; insert: boolean; select: boolean }>(
      `SELECT t AS table, has_table_privilege(current_user, t, 'UPDATE') AS update, has_table_privilege(current_user, t, 'DELETE') AS delete,
              has_table_privilege(current_user, t, 'TRUNCATE') AS truncate, has_table_privilege(current_user, t, 'INSERT') AS insert,
              has_table_privilege(current_user, t, 'SELECT') AS select
         FROM unnest(ARRAY['custody_events','ledger_seals','scan_refusals']) AS t`,
      { type: QueryTypes.SELECT },
    );
    expect(rows).toHaveLength(3);
    for (const row of rows) expect(row).toMatchObject({ update: false, delete: false, truncate: false, insert: true, select: true });
  });

  it('refuses even the owner while the triggers are on', async () => {
    await expect(t.owner.query('DELETE FROM custody_events WHERE false OR true')).rejects.toThrow(/append-only/);
    await expect(t.owner.query('TRUNCATE custody_events CASCADE')).rejects.toThrow(/append-only/);
  });
});

describe('concurrent scans of one item', () => {
  it('never fork its chain: every event gets its own seq, each chained to the one before', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    const agents = [tech, await signedInAs(t, 'machinist'), await signedInAs(t, 'clerk'), await signedInAs(t, 'manager')];
    const results = await Promise.all(
      Array.from({ length: 40 }, (_, i) => agents[i % agents.length]!.post('/api/events', scan('label_printed', code))),
    );
    expect(results.map((r) => r.status)).toEqual(Array(40).fill(201));
    const seqs = results.map((r) => r.body.event.seq as number).sort((a, b) => a - b);
    expect(seqs).toEqual(Array.from({ length: 40 }, (_, i) => i + 2));
    const events = await tech.get(`/api/items/${code}/events`).expect(200);
    expect(events.body.events).toHaveLength(41);
    expect(verifyChain(events.body.events).ok).toBe(true);
  });

  it('records a key sent by many clients at once exactly once', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    const body = scan('label_printed', code);
    const results = await Promise.all(Array.from({ length: 16 }, () => tech.post('/api/events', body)));
    const statuses = results.map((r) => r.status).sort();
    expect(statuses.filter((s) => s === 201)).toHaveLength(1);
    expect(statuses.filter((s) => s === 200)).toHaveLength(15);
    expect(new Set(results.map((r) => r.body.event.hash)).size).toBe(1);
    expect(await countRows(t, 'custody_events', 'idempotency_key = $1', [body.idempotencyKey])).toBe(1);
  });
});

describe('GET /api/ledger/verify', () => {
  it('answers ok with the counts on an untouched ledger, and 403 for a role without ledger.verify', async () => {
    const auditor = await signedInAs(t, 'auditor');
    const res = await auditor.get('/api/ledger/verify').expect(200);
    expect(res.body).toMatchObject({ ok: true, firstBreak: null });
    expect(res.body.eventsChecked).toBe(await countRows(t, 'custody_events'));
  });

  it('names the event, item and what differs when a row was altered with the trigger disabled', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    const cut = await tech.post('/api/events', scan('cut', code, { payload: { saw: 'band' } })).expect(201);
    await asForger([`UPDATE custody_events SET payload = '{"saw":"abrasive"}' WHERE id = $1`], [cut.body.event.id]);
    const res = await (await signedInAs(t, 'auditor')).get('/api/ledger/verify').expect(200);
    expect(res.body.ok).toBe(false);
    expect(res.body.firstBreak).toMatchObject({ check: 'chain', reason: 'hash-mismatch', item: code, seq: 2, eventId: cut.body.event.id, actual: cut.body.event.hash });
    expect(res.body.firstBreak.expected).not.toBe(cut.body.event.hash);
    // Put it back so the later tests start from a sound ledger.
    await asForger([`UPDATE custody_events SET payload = '{"saw":"band"}' WHERE id = $1`], [cut.body.event.id]);
    expect((await verifyLedger(t.sequelize)).ok).toBe(true);
  });

  it('catches a rewritten event whose hash was recomputed: the next link breaks', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    await tech.post('/api/events', scan('cut', code)).expect(201);
    const [first] = await t.sequelize.query<{ id: string; hash: string }>('SELECT id, hash FROM custody_events WHERE item_code = $1 AND seq = 1', {
      bind: [code],
      type: QueryTypes.SELECT,
    });
    const forged = 'f'.repeat(64);
    await asForger([`UPDATE custody_events SET hash = $1 WHERE id = $2`], [forged, first!.id]);
    const result = await verifyLedger(t.sequelize);
    expect(result.firstBreak).toMatchObject({ reason: 'hash-mismatch', item: code, seq: 1, actual: forged });
    await asForger([`UPDATE custody_events SET hash = $1 WHERE id = $2`], [first!.hash, first!.id]);
  });
});

describe('daily seals', () => {
  it('seals a finished day once, and the seal catches a whole chain deleted afterwards', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    await tech.post('/api/events', scan('cut', code)).expect(201);
    const sealed = await sealDay(t.sequelize, today(), tomorrowMorning());
    expect(sealed.sealed).toBe(true);
    const again = await sealDay(t.sequelize, today(), tomorrowMorning());
    expect(again).toMatchObject({ sealed: false, reason: 'already-sealed' });
    expect(await sealDueDays(t.sequelize, tomorrowMorning())).toEqual([]);
    await expect(t.owner.query(`INSERT INTO ledger_seals (day, heads_count, body, prev_hash, hash) VALUES ('${today()}', 0, '{}', $1, $1)`, { bind: ['0'.repeat(64)] })).rejects.toMatchObject({
      name: 'SequelizeUniqueConstraintError',
    });
    expect((await verifyLedger(t.sequelize)).ok).toBe(true);

    // A forger removes the specimen completely: its events, its specimens row and its item row.
    await asForger(
      [
        'DELETE FROM specimens WHERE item_id = (SELECT id FROM items WHERE code = $1)',
        'DELETE FROM custody_events WHERE item_code = $1',
        'DELETE FROM items WHERE code = $1',
      ],
      [code],
    );
    const result = await verifyLedger(t.sequelize);
    expect(result.ok).toBe(false);
    expect(result.firstBreak).toMatchObject({ check: 'seal', reason: 'heads-differ', day: today(), item: code });
    expect(result.firstBreak?.items).toEqual([expect.objectContaining({ item: code, change: 'missing' })]);
  });

  it('does not seal a day that is not over yet', async () => {
    const result = await sealDay(t.sequelize, today());
    expect(result).toMatchObject({ sealed: false, reason: 'not-finished' });
  });
});
