/**
 * Daily seals: once a UTC day is over, a digest over every chain head as it stood at the end of
 * that day (docs/ledger-format.md §3). Several servers may run the scheduler; a PostgreSQL
 * advisory lock lets one of them seal at a time, and the seal table's primary key (the day)
 * refuses a second seal of the same day.
 */
import { QueryTypes, type Sequelize } from 'sequelize';
import { GENESIS_HASH } from '../../shared/domain/ledger/event-hash';
import { computeSeal, dayEnd, nextDay, type Seal, type SealableEvent } from '../../shared/domain/ledger/seal';
import { logger } from '../logger';
import { sweepAnomalies } from './anomaly-findings';

/** Key of the advisory lock sealing takes (any constant shared by every server of one ledger). */
export const SEAL_LOCK_KEY = 7_261_584_210;

/** How long after midnight UTC a day is sealed, so events still in flight at midnight are in. */
export const SEAL_GRACE_MS = 10 * 60_000;

/** What sealDay did. */
export type SealDayResult =
  | { sealed: true; seal: Seal }
  | { sealed: false; reason: 'already-sealed'; seal: Seal }
  | { sealed: false; reason: 'busy' | 'not-finished' | 'previous-day-unsealed'; seal: null };

interface SealRow {
  day: string;
  body: Omit<Seal, 'hash'>;
  hash: string;
}

function sealOf(row: SealRow): Seal {
  return { ...row.body, hash: row.hash };
}

/** Stored seals, oldest first. */
export async function loadSeals(sequelize: Sequelize): Promise<{ seal: Seal; day: string; prevHash: string }[]> {
  const rows = await sequelize.query<SealRow & { prev_hash: string }>(
    `SELECT to_char(day, 'YYYY-MM-DD') AS day, body, hash, prev_hash FROM ledger_seals ORDER BY day`,
    { type: QueryTypes.SELECT },
  );
  return rows.map((row) => ({ seal: sealOf(row), day: row.day, prevHash: row.prev_hash }));
}

/**
 * Seals one finished UTC day (YYYY-MM-DD). Days are sealed in order: once a seal exists, the
 * day before must be sealed first. Returns the existing seal when the day is already sealed,
 * and does nothing while another server holds the sealing lock. `now` is for tests.
 */
export async function sealDay(sequelize: Sequelize, day: string, now: Date = new Date()): Promise<SealDayResult> {
  const end = dayEnd(day);
  if (now.getTime() < Date.parse(end) + SEAL_GRACE_MS) return { sealed: false, reason: 'not-finished', seal: null };
  return sequelize.transaction(async (transaction) => {
    const q = <T extends object>(sql: string, bind: unknown[] = []) => sequelize.query<T>(sql, { bind, transaction, type: QueryTypes.SELECT });
    const [lock] = await q<{ ok: boolean }>('SELECT pg_try_advisory_xact_lock($1) AS ok', [SEAL_LOCK_KEY]);
    if (!lock?.ok) return { sealed: false, reason: 'busy', seal: null };
    const [existing] = await q<SealRow>(`SELECT to_char(day, 'YYYY-MM-DD') AS day, body, hash FROM ledger_seals WHERE day = $1`, [day]);
    if (existing) return { sealed: false, reason: 'already-sealed', seal: sealOf(existing) };
    const [last] = await q<{ day: string; hash: string }>(
      `SELECT to_char(day, 'YYYY-MM-DD') AS day, hash FROM ledger_seals WHERE day < $1 ORDER BY day DESC LIMIT 1`,
      [day],
    );
    if (last && nextDay(last.day) !== day) return { sealed: false, reason: 'previous-day-unsealed', seal: null };
    const heads = await q<SealableEvent>(
      `SELECT DISTINCT ON (item_id) item_code AS item, seq, hash,
              to_char(recorded_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') AS "recordedAt"
         FROM custody_events WHERE recorded_at < $1 ORDER BY item_id, seq DESC`,
      [end],
    );
    const seal = computeSeal(day, heads, last?.hash ?? GENESIS_HASH);
    const body = { v: seal.v, day: seal.day, heads: seal.heads, prevSeal: seal.prevSeal };
    await sequelize.query('INSERT INTO ledger_seals (day, heads_count, body, prev_hash, hash) VALUES ($1, $2, $3::jsonb, $4, $5)', {
      bind: [day, seal.heads.length, JSON.stringify(body), seal.prevSeal, seal.hash],
      transaction,
    });
    return { sealed: true, seal };
  });
}

/**
 * Seals every finished day not sealed yet, oldest first: from the day after the last seal, or
 * from the day of the first event when there is no seal yet. Returns the days it sealed.
 */
export async function sealDueDays(sequelize: Sequelize, now: Date = new Date()): Promise<string[]> {
  const [row] = await sequelize.query<{ last: string | null; first: string | null }>(
    `SELECT (SELECT to_char(max(day), 'YYYY-MM-DD') FROM ledger_seals) AS last,
            (SELECT to_char(min(recorded_at) AT TIME ZONE 'UTC', 'YYYY-MM-DD') FROM custody_events) AS first`,
    { type: QueryTypes.SELECT },
  );
  let day = row?.last ? nextDay(row.last) : row?.first;
  const sealed: string[] = [];
  while (day && now.getTime() >= Date.parse(dayEnd(day)) + SEAL_GRACE_MS) {
    const result = await sealDay(sequelize, day, now);
    if (result.sealed) sealed.push(day);
    else if (result.reason !== 'already-sealed') break;
    day = nextDay(day);
  }
  return sealed;
}

/** A running seal scheduler. */
export interface SealScheduler {
  /** Runs one pass now (also what the timer does). */
  tick: () => Promise<string[]>;
  stop: () => void;
}

/**
 * Starts sealing finished days in the background: one pass at start, then every `intervalMs`
 * (with a little jitter so several servers do not all try at the same instant). A pass that
 * sealed a day also re-judges every item's anomalies from scratch (the nightly full sweep).
 */
export function startSealScheduler(sequelize: Sequelize, intervalMs = 5 * 60_000): SealScheduler {
  let running: Promise<string[]> | null = null;
  const tick = () => {
    running ??= sealDueDays(sequelize)
      .then(async (days) => {
        if (days.length > 0) {
          logger.info({ days }, 'ledger days sealed');
          // Requests only re-judge items that moved; once a day every chain is judged again.
          await sweepAnomalies(sequelize, { full: true }).catch((err: unknown) => {
            logger.error({ err }, 'the full anomaly sweep failed; requests still sweep what changed');
          });
        }
        return days;
      })
      .catch((err: unknown) => {
        logger.error({ err }, 'sealing the ledger failed; will try again');
        return [];
      })
      .finally(() => {
        running = null;
      });
    return running;
  };
  const timer = setInterval(() => void tick(), intervalMs + Math.floor(Math.random() * 30_000));
  timer.unref();
  void tick();
  return { tick, stop: () => clearInterval(timer) };
}
