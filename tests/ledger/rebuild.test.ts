import { randomBytes, randomUUID } from 'node:crypto';
import fc from 'fast-check';
import { QueryTypes, type QueryOptions, type Sequelize } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { specimenCode } from '../../shared/domain/codes';
import { allowedNext, type EventType, type ItemKind, type Projection } from '../../shared/domain/ledger/state-machine';
import { rebuildProjections, REBUILD_SCRATCH_TABLE } from '../../server/commands/rebuild-projections';
import { recordEvent, recordEvents } from '../../server/commands/record-event';
import { verifyLedger } from '../../server/commands/verify-ledger';
import { isRecorded, type LedgerActor } from '../../server/ledger/types';
import { createTestContext, type TestContext } from '../support';
import { TEST_ROLES } from '../test-env';
import { createContainer, createSample, createSpecimen, FLAT_READINGS, managerActor } from './ledger-fixtures';

let t: TestContext;
let actor: LedgerActor;

beforeAll(async () => {
  t = await createTestContext();
  actor = await managerActor(t);
});
afterAll(async () => t?.close());

/** Every stored item row and the ledger's length, to show a rebuild changed nothing. */
async function fingerprint(db: Sequelize): Promise<{ items: string; events: number }> {
  const [row] = await db.query<{ items: string; events: number }>(
    `SELECT (SELECT md5(string_agg(i::text, '|' ORDER BY i.id)) FROM items i) AS items,
            (SELECT count(*)::integer FROM custody_events) AS events`,
    { type: QueryTypes.SELECT },
  );
  return row!;
}

/** Temporary tables of the rebuild's name left in the database's catalogue, by any session. */
async function scratchTablesLeft(db: Sequelize): Promise<number> {
  const [row] = await db.query<{ n: number }>(
    `SELECT count(*)::integer AS n FROM pg_class WHERE relname = $1 AND relpersistence = 't'`,
    { bind: [REBUILD_SCRATCH_TABLE], type: QueryTypes.SELECT },
  );
  return row!.n;
}

interface Tracked {
  code: string;
  kind: ItemKind;
  state: string;
}

describe('npm run ledger:rebuild (rebuildProjections)', () => {
  it('rebuilds projections equal to the stored ones after a random run of a few thousand valid events', { timeout: 240_000 }, async () => {
    // A seeded generator from fast-check, so a failure can be replayed with the same seed.
    const seed = 20261201;
    const [choices] = fc.sample(fc.infiniteStream(fc.integer({ min: 0, max: 1_000_000 })), { seed, numRuns: 1 });
    const random = choices![Symbol.iterator]();
    const pick = <T,>(list: readonly T[]): T => list[(random.next().value as number) % list.length]!;

    const { sampleId } = await createSample(t);
    const items: Tracked[] = [];
    for (let i = 0; i < 60; i++) items.push({ code: await createSpecimen(t, actor, sampleId), kind: 'specimen', state: 'registered' });
    const bins = [await createContainer(t, actor, 'bin'), await createContainer(t, actor, 'bin')];
    const storage = [await createContainer(t, actor, 'bag'), await createContainer(t, actor, 'box'), await createContainer(t, actor, 'bag')];
    const shelves = [await createContainer(t, actor, 'shelf'), await createContainer(t, actor, 'shelf')];
    for (const code of storage) items.push({ code, kind: 'container', state: 'active' });

    const payloadFor = (type: EventType): Record<string, unknown> => {
      switch (type) {
        case 'measured':
          return FLAT_READINGS;
        case 'tested':
          return { fractured: pick([true, true, false]) };
        case 'held':
        case 'relabelled':
        case 'rejected':
        case 'voided':
          return { reason: 'random run' };
        case 'attached':
          return { sha256: 'a'.repeat(64) };
        default:
          return {};
      }
    };
    const containerFor = (type: EventType, item: Tracked): string | null => {
      if (type === 'binned') return pick(bins);
      if (type === 'retained') return pick(storage);
      if (type === 'moved') return item.kind === 'container' ? pick(shelves) : pick(storage);
      return null;
    };
    const skip = new Set<EventType>(['registered', 'split_from', 'disposed']);

    let accepted = 0;
    let rounds = 0;
    while (accepted < 2_500 && rounds < 400) {
      rounds++;
      // One event per item per batch, so each is built from the item's known state.
      const chosen = [...new Set(Array.from({ length: 40 }, () => pick(items)))];
      const batch: { item: Tracked; input: Record<string, unknown> }[] = [];
      const voids: { item: Tracked; input: Record<string, unknown> }[] = [];
      for (const item of chosen) {
        const allowed = allowedNext(item.kind, item.state as never).filter((type) => !skip.has(type));
        if (allowed.length === 0) continue;
        const type = pick(allowed);
        const input = {
          idempotencyKey: randomUUID(),
          type,
          itemCode: item.code,
          containerCode: containerFor(type, item),
          occurredAt: new Date().toISOString(),
          payload: payloadFor(type),
        };
        (type === 'voided' ? voids : batch).push({ item, input });
      }
      const outcomes = await recordEvents(t.ctx, batch.map((b) => b.input), { actor });
      for (const [index, outcome] of outcomes.entries()) {
        if (!isRecorded(outcome)) continue;
        accepted++;
        batch[index]!.item.state = outcome.item.state;
        for (const half of outcome.halves) {
          // A half voided back to nothing splits again when its specimen fractures again.
          const known = items.find((i) => i.code === half);
          if (known) known.state = 'tested';
          else items.push({ code: half, kind: 'half', state: 'tested' });
        }
      }
      for (const { item, input } of voids) {
        const signature = { signer: actor.id, meaning: 'void', signedAt: new Date().toISOString() };
        try {
          const outcome = await recordEvent(t.ctx, input, { actor, signature });
          accepted++;
          item.state = outcome.item.state;
        } catch {
          // A void of a fractured test while its halves live is refused; the run goes on.
        }
      }
    }
    expect(accepted).toBeGreaterThanOrEqual(2_500);

    const report = await rebuildProjections(t.sequelize);
    expect(report.differences).toEqual([]);
    expect(report.eventsReplayed).toBeGreaterThan(2_500);
    expect((await verifyLedger(t.sequelize)).ok).toBe(true);
  });

  it('reports a projection that no longer matches its ledger', async () => {
    const { sampleId } = await createSample(t);
    const code = await createSpecimen(t, actor, sampleId);
    await t.owner.query(`UPDATE items SET state = 'tested' WHERE code = $1`, { bind: [code] });
    const report = await rebuildProjections(t.sequelize);
    expect(report.differences).toContainEqual({ item: code, field: 'state', stored: 'tested', rebuilt: 'registered' });
    await t.owner.query(`UPDATE items SET state = 'registered' WHERE code = $1`, { bind: [code] });
  });

  it('compares in a scratch table: an owner-altered projection is reported with its stored and rebuilt values, nothing stored changes, no temporary table stays', async () => {
    const { sampleId } = await createSample(t);
    const code = await createSpecimen(t, actor, sampleId);
    const bag = await createContainer(t, actor, 'bag');
    const [original] = await t.owner.query<{ id: string; last_seq: number; projection: Projection }>(
      'SELECT id, last_seq, projection FROM items WHERE code = $1',
      { bind: [code], type: QueryTypes.SELECT },
    );
    // items carries no append-only trigger, so its owner can change a projection behind the ledger.
    await t.owner.query(
      `UPDATE items SET container_id = (SELECT id FROM items WHERE code = $2), last_seq = last_seq + 4,
              projection = jsonb_set(projection, '{state}', '"held"') WHERE code = $1`,
      { bind: [code, bag] },
    );
    const before = await fingerprint(t.owner);

    // Watch the rebuild's own statements; after each insert into the scratch table, read the
    // altered item's rebuilt row back on the rebuild's connection, inside its transaction.
    const statements: string[] = [];
    let scratch: Record<string, unknown> | undefined;
    const query = t.sequelize.query.bind(t.sequelize);
    const spy = vi.spyOn(t.sequelize, 'query').mockImplementation((async (sql: string, options?: QueryOptions) => {
      const result = await query(sql, options ?? {});
      statements.push(sql);
      if (options?.transaction && sql.includes(`INSERT INTO pg_temp.${REBUILD_SCRATCH_TABLE}`)) {
        const [row] = await query<Record<string, unknown>>(
          `SELECT r.state, r.container_id, r.container_code, r.last_seq, r.projection,
                  current_setting('transaction_read_only') AS read_only, current_setting('transaction_isolation') AS isolation
             FROM pg_temp.${REBUILD_SCRATCH_TABLE} r WHERE r.item_id = $1`,
          { bind: [original!.id], type: QueryTypes.SELECT, transaction: options.transaction },
        );
        if (row) scratch = row;
      }
      return result;
    }) as typeof t.sequelize.query);
    const report = await rebuildProjections(t.sequelize).finally(() => spy.mockRestore());

    expect(report.differences.filter((d) => d.item === code)).toEqual([
      { item: code, field: 'container', stored: bag, rebuilt: null },
      { item: code, field: 'last_seq', stored: original!.last_seq + 4, rebuilt: original!.last_seq },
      { item: code, field: 'projection', stored: { ...original!.projection, state: 'held' }, rebuilt: original!.projection },
    ]);
    // The rebuilt values came from the scratch table, written once for the one chunk of items,
    // by a transaction that could write nothing else.
    expect(scratch).toEqual({
      state: 'registered',
      container_id: null,
      container_code: null,
      last_seq: original!.last_seq,
      projection: original!.projection,
      read_only: 'on',
      isolation: 'repeatable read',
    });
    expect(statements.filter((sql) => sql.includes(`INSERT INTO pg_temp.${REBUILD_SCRATCH_TABLE}`))).toHaveLength(
      Math.ceil(report.itemsChecked / 2_000),
    );
    expect(statements.some((sql) => /CREATE TEMPORARY TABLE .* ON COMMIT DROP/s.test(sql))).toBe(true);
    expect(await fingerprint(t.owner)).toEqual(before);
    expect(await scratchTablesLeft(t.owner)).toBe(0);

    await t.owner.query('UPDATE items SET container_id = NULL, last_seq = $2, projection = $3::jsonb WHERE code = $1', {
      bind: [code, original!.last_seq, JSON.stringify(original!.projection)],
    });
    expect((await rebuildProjections(t.sequelize)).differences).toEqual([]);
  });

  it('runs as the owner as it does as the application role, which may create temporary tables', async () => {
    // PostgreSQL grants TEMPORARY on a database to PUBLIC unless revoked (PostgreSQL manual,
    // "Privileges": default privileges; from memory), and Halfmark's provisioning revokes nothing there.
    const [grant] = await t.sequelize.query<{ role: string; temp: boolean }>(
      `SELECT current_user AS role, has_database_privilege(current_database(), 'TEMPORARY') AS temp`,
      { type: QueryTypes.SELECT },
    );
    expect(grant).toEqual({ role: TEST_ROLES.app.name, temp: true });
    const asApp = await rebuildProjections(t.sequelize);
    const asOwner = await rebuildProjections(t.owner);
    expect(asApp.differences).toEqual([]);
    expect(asOwner).toEqual(asApp);
    expect(await scratchTablesLeft(t.sequelize)).toBe(0);
  });

  // Last: the refused chain stays in this file's database for good (custody_events is append-only).
  it('reports a ledger the state machine refuses as a replay difference, and nothing else of that item', async () => {
    const [serial] = await t.owner.query<{ n: string }>(`SELECT nextval('specimen_serial_seq') AS n`, { type: QueryTypes.SELECT });
    const code = specimenCode(26, Number(serial!.n));
    const [item] = await t.owner.query<{ id: string }>(
      `INSERT INTO items (code, kind, state) VALUES ($1, 'specimen', 'registered') RETURNING id`,
      { bind: [code], type: QueryTypes.SELECT },
    );
    await t.owner.query(
      `INSERT INTO custody_events (item_id, item_code, seq, type, actor_user_id, occurred_at, recorded_at, idempotency_key, prev_hash, hash)
       VALUES ($1, $2, 1, 'registered', $3, now(), now(), $4, $5, $6)`,
      { bind: [item!.id, code, actor.id, randomUUID(), 'f'.repeat(64), randomBytes(32).toString('hex')] },
    );
    const report = await rebuildProjections(t.sequelize);
    expect(report.differences).toEqual([
      { item: code, field: 'replay', stored: null, rebuilt: `event 1 refused: ${code} seq 1: prevHash is not the item's head hash` },
    ]);
    // limit caps the differences kept, not the items checked.
    const capped = await rebuildProjections(t.sequelize, 0);
    expect(capped).toEqual({ ...report, differences: [] });
  });
});
