/**
 * The SQL of one ledger write, shared by the server and by the bench's direct-pg baseline so
 * both run the very same transaction.
 */
import pg from 'pg';

/** Columns of a custody event as the API reads them, with instants in the ledger's spelling. */
export const EVENT_COLUMNS = `
  e.id, e.item_code, e.seq, e.type, e.actor_user_id, e.actor_token_id, e.station_code, e.container_code,
  to_char(e.occurred_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') AS occurred_at,
  to_char(e.recorded_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') AS recorded_at,
  e.payload, e.idempotency_key, e.corrects_hash, e.signature, e.prev_hash, e.hash`;

/**
 * Locks the items a unit of work touches, in id order so two units never deadlock. NO KEY
 * UPDATE is enough to serialise writers of one item (it conflicts with itself), and unlike
 * FOR UPDATE it does not block the KEY SHARE locks that other events' foreign keys take on a
 * container row. The stations and containers the events name come back in the same round trip.
 * $1 item codes, $2 station codes (upper case), $3 container codes.
 */
export const LOCK_ITEMS_SQL = `
  SELECT i.id, i.code, i.kind, i.state, i.projection, i.last_seq, i.head_hash, i.parent_item_id, i.half,
         s.geometry_key, o.area_policy,
         (SELECT json_agg(json_build_object('id', st.id, 'code', st.code, 'active', st.active))
            FROM stations st WHERE upper(st.code) = ANY($2::text[])) AS stations,
         (SELECT json_agg(json_build_object('id', ci.id, 'code', ci.code, 'kind', ci.kind, 'state', ci.state,
                                            'containerType', cc.container_type, 'binHalf', cc.bin_half))
            FROM items ci LEFT JOIN containers cc ON cc.item_id = ci.id WHERE ci.code = ANY($3::text[])) AS refs
    FROM items i
    LEFT JOIN specimens s ON s.item_id = i.id
    LEFT JOIN samples sa ON sa.id = s.sample_id
    LEFT JOIN orders o ON o.id = sa.order_id
   WHERE i.code = ANY($1::text[])
   ORDER BY i.id
     FOR NO KEY UPDATE OF i`;

/**
 * Appends the events and updates the touched items' projections in one statement. An
 * idempotency key already taken (a retry that raced its first attempt) fails the whole
 * statement with a unique violation on IDEMPOTENCY_KEY_CONSTRAINT, so nothing of the unit is
 * written even when COMMIT travels with it; the caller rolls back and answers with the stored
 * event. Ids of stations, containers and corrected events are looked up by code and hash.
 * $1 events (JSON), $2 items (JSON), $3 event count (the update checks it as a safeguard).
 */
export const WRITE_EVENTS_SQL = `
  WITH x AS (
    SELECT * FROM jsonb_to_recordset($1::jsonb) AS x(
      item_id bigint, item_code text, seq integer, type text, actor_user_id integer, actor_token_id integer,
      station_code text, container_code text, occurred_at timestamptz, recorded_at timestamptz, payload jsonb,
      idempotency_key text, corrects_hash text, signature jsonb, prev_hash text, hash text)
  ), ins AS (
    INSERT INTO custody_events (item_id, item_code, seq, type, actor_user_id, actor_token_id, station_id,
      station_code, container_id, container_code, occurred_at, recorded_at, payload, idempotency_key,
      corrects_event_id, corrects_hash, signature, prev_hash, hash)
    SELECT x.item_id, x.item_code, x.seq, x.type, x.actor_user_id, x.actor_token_id,
           (SELECT st.id FROM stations st WHERE st.code = x.station_code), x.station_code,
           (SELECT ci.id FROM items ci WHERE ci.code = x.container_code), x.container_code,
           x.occurred_at, x.recorded_at, x.payload, x.idempotency_key,
           -- hash is char(64): compare as char(64) so its unique index serves the lookup.
           CASE WHEN x.corrects_hash IS NULL THEN NULL
                ELSE (SELECT ce.id FROM custody_events ce WHERE ce.hash = x.corrects_hash::char(64)) END,
           x.corrects_hash,
           x.signature, x.prev_hash, x.hash
      FROM x
    RETURNING id, idempotency_key
  ), upd AS (
    UPDATE items i
       SET state = u.state, projection = u.projection, last_seq = u.last_seq, head_hash = u.head_hash,
           last_event_at = u.last_event_at,
           container_id = (SELECT ci.id FROM items ci WHERE ci.code = u.container_code),
           station_id = (SELECT st.id FROM stations st WHERE st.code = u.station_code)
      FROM jsonb_to_recordset($2::jsonb) AS u(id bigint, state text, projection jsonb, last_seq integer,
           head_hash text, last_event_at timestamptz, container_code text, station_code text)
     WHERE i.id = u.id AND (SELECT count(*) FROM ins) = $3
    RETURNING i.id
  )
  SELECT (SELECT coalesce(json_agg(json_build_object('id', ins.id, 'key', ins.idempotency_key)), '[]') FROM ins) AS inserted,
         (SELECT count(*) FROM upd)::integer AS updated`;

/** The unique constraint a second event with a used idempotency key breaks. */
export const IDEMPOTENCY_KEY_CONSTRAINT = 'custody_events_idempotency_key_key';

/** Stored events under some idempotency keys. $1 keys. */
export const EVENTS_BY_KEYS_SQL = `SELECT ${EVENT_COLUMNS} FROM custody_events e WHERE e.idempotency_key = ANY($1::text[])`;

/** One refused scan, kept outside the ledger. */
export const INSERT_REFUSALS_SQL = `
  INSERT INTO scan_refusals (actor_user_id, actor_token_id, item_code, type, idempotency_key, code, message, details)
  SELECT * FROM jsonb_to_recordset($1::jsonb) AS r(actor_user_id integer, actor_token_id integer, item_code text,
    type text, idempotency_key text, code text, message text, details jsonb)`;

/** A value the ledger's statements take: text, a whole number, a list of text, or null. */
export type SqlValue = string | number | readonly string[] | null;

function literal(value: SqlValue): string {
  if (value === null) return 'NULL';
  if (typeof value === 'number') {
    if (!Number.isSafeInteger(value)) throw new TypeError(`not a whole number: ${value}`);
    return String(value);
  }
  if (typeof value === 'string') return pg.escapeLiteral(value);
  return value.length === 0 ? `'{}'::text[]` : `ARRAY[${value.map((v) => pg.escapeLiteral(v)).join(', ')}]::text[]`;
}

/**
 * A statement with its $n parameters written in as quoted literals (pg's escapeLiteral), for the
 * simple query protocol, which takes several statements in one message but no parameters. The
 * ledger uses it to send BEGIN with the lock and COMMIT with the write: two round trips a scan
 * instead of four. Only the constants in this file go through it; none holds a `$` of its own.
 */
export function inlineParams(sql: string, params: readonly SqlValue[]): string {
  return sql.replace(/\$(\d+)(?!\d)/g, (_, n: string) => {
    const index = Number(n) - 1;
    if (index < 0 || index >= params.length) throw new RangeError(`no value for $${n}`);
    return literal(params[index] as SqlValue);
  });
}

/** The first message of a ledger transaction: BEGIN, then the lock (and the stored keys, if asked). */
export function openingMessage(lock: readonly [string[], string[], string[]], keys: readonly string[] | null): string {
  const parts = ['BEGIN', inlineParams(LOCK_ITEMS_SQL, lock)];
  if (keys !== null) parts.push(inlineParams(EVENTS_BY_KEYS_SQL, [keys]));
  return parts.join(';\n');
}

/** The last message of a ledger transaction: the write (when there is one), then COMMIT. */
export function closingMessage(write: readonly [string, string, number] | null): string {
  return write === null ? 'COMMIT' : `${inlineParams(WRITE_EVENTS_SQL, write)};\nCOMMIT`;
}
