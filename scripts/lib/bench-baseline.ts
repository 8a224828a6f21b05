/**
 * The bench's baseline: the same database transaction the server runs for a scan (BEGIN with the
 * lock of the item rows, hash the event, then the append and projection update with COMMIT: the
 * very same two messages and the same hashing and state-machine code), done directly with pg,
 * without HTTP, sign-in or validation.
 */
import { randomUUID } from 'node:crypto';
import pg from 'pg';
import { computeEventHash, EVENT_FORMAT_VERSION, type HashedEvent } from '../../shared/domain/ledger/event-hash';
import { applyEvent, type Projection } from '../../shared/domain/ledger/state-machine';
import { closingMessage, openingMessage } from '../../server/ledger/sql';
import { summarise, type PhaseResult } from './bench-load';

async function transaction(client: pg.PoolClient, codes: string[], userId: number): Promise<void> {
  try {
    const opened = (await client.query(openingMessage([codes, [], []], null))) as unknown as pg.QueryResult<{ id: string; code: string; projection: Projection }>[];
    const rows = opened[1]?.rows ?? [];
    const now = new Date().toISOString();
    const events: Record<string, unknown>[] = [];
    const items: Record<string, unknown>[] = [];
    for (const row of rows) {
      const body: HashedEvent = {
        v: EVENT_FORMAT_VERSION,
        item: row.code,
        seq: row.projection.lastSeq + 1,
        type: 'label_printed',
        actor: { kind: 'user', id: userId },
        station: null,
        container: null,
        occurredAt: now,
        recordedAt: now,
        payload: {},
        idempotencyKey: randomUUID(),
        corrects: null,
        signature: null,
        prevHash: row.projection.headHash,
      };
      const hash = computeEventHash(body);
      const result = applyEvent(row.projection, { ...body, hash });
      if (!result.ok) throw new Error(result.message);
      const p = result.projection;
      events.push({
        item_id: Number(row.id), item_code: row.code, seq: body.seq, type: body.type, actor_user_id: userId, actor_token_id: null,
        station_code: null, container_code: null, occurred_at: now, recorded_at: now, payload: {}, idempotency_key: body.idempotencyKey,
        corrects_hash: null, signature: null, prev_hash: body.prevHash, hash,
      });
      items.push({ id: Number(row.id), state: p.state, projection: p, last_seq: p.lastSeq, head_hash: p.headHash, last_event_at: now, container_code: p.container, station_code: p.station });
    }
    await client.query(closingMessage([JSON.stringify(events), JSON.stringify(items), events.length]));
  } catch (error) {
    await client.query('ROLLBACK');
    throw error;
  }
}

/**
 * Runs `clients` loops for `seconds`, each doing the scan transaction for `perTransaction` items
 * taken from `nextCodes`.
 */
export async function runBaselinePhase(opts: {
  name: string;
  url: string;
  poolSize: number;
  clients: number;
  seconds: number;
  perTransaction: number;
  nextCodes: (n: number) => string[];
  userId: number;
}): Promise<PhaseResult> {
  const pool = new pg.Pool({ connectionString: opts.url, max: opts.poolSize });
  const latencies: number[] = [];
  let errors = 0;
  const deadline = performance.now() + opts.seconds * 1000;
  const started = performance.now();
  await Promise.all(
    Array.from({ length: opts.clients }, async () => {
      while (performance.now() < deadline) {
        const codes = opts.nextCodes(opts.perTransaction);
        const t0 = performance.now();
        const client = await pool.connect();
        try {
          await transaction(client, codes, opts.userId);
        } catch {
          errors++;
        } finally {
          client.release();
        }
        latencies.push(performance.now() - t0);
      }
    }),
  );
  const seconds = (performance.now() - started) / 1000;
  await pool.end();
  return summarise(opts.name, opts.clients, latencies, (latencies.length - errors) * opts.perTransaction, errors, seconds);
}
