import type { EventSignature } from '../../shared/domain/ledger/event-hash';
import { EVENT_FORMAT_VERSION } from '../../shared/domain/ledger/event-hash';
import type { z } from 'zod';
import type { EventView } from './types';

/** A custody_events row as EVENT_COLUMNS selects it. */
export interface EventRow {
  id: string | number;
  item_code: string;
  seq: number;
  type: string;
  actor_user_id: number | null;
  actor_token_id: number | null;
  station_code: string | null;
  container_code: string | null;
  occurred_at: string;
  recorded_at: string;
  payload: Record<string, unknown>;
  idempotency_key: string;
  corrects_hash: string | null;
  signature: z.infer<typeof EventSignature> | null;
  prev_hash: string;
  hash: string;
}

/** Turns a stored row back into the event it hashes: the fourteen members of format v1, its hash and id. */
export function eventFromRow(row: EventRow): EventView {
  return {
    id: Number(row.id),
    v: EVENT_FORMAT_VERSION,
    item: row.item_code,
    seq: row.seq,
    type: row.type,
    actor:
      row.actor_user_id !== null
        ? { kind: 'user', id: row.actor_user_id }
        : { kind: 'instrument', id: Number(row.actor_token_id) },
    station: row.station_code,
    container: row.container_code,
    occurredAt: row.occurred_at,
    recordedAt: row.recorded_at,
    payload: row.payload as EventView['payload'],
    idempotencyKey: row.idempotency_key,
    corrects: row.corrects_hash,
    signature: row.signature,
    prevHash: row.prev_hash,
    hash: row.hash,
  };
}
