import type { Transaction } from 'sequelize';
import type { EventSignature } from '../../shared/domain/ledger/event-hash';
import type { EventError, RecordedEvent } from '../../shared/schemas/events';

// The API's answer shapes are defined once in shared/, where the client reads them too.
export type { EventError, EventView, ItemSummary, RecordedEvent } from '../../shared/schemas/events';
import type { Role } from '../../shared/permissions';
import type { z } from 'zod';

/**
 * Who records an event. `req.actor` (server/middleware/auth.ts) fits as it is; internal callers
 * (intake's cut list, disposal batches) pass the person behind the request.
 */
export type LedgerActor =
  | { kind: 'user'; id: number; role: Role }
  | { kind: 'instrument'; id: number; stationId: number; stationCode: string; eventTypes: readonly string[] };

/** An event that was refused: nothing was written to the ledger; the refusal was logged. */
export interface RefusedEvent {
  status: 403 | 404 | 409 | 422;
  error: EventError;
}

/** What happened to one event of a unit of work. */
export type EventOutcome = RecordedEvent | RefusedEvent;

/** Options every ledger write takes. */
export interface RecordOptions {
  actor: LedgerActor;
  /** Run inside the caller's transaction (intake registering specimens); else the ledger opens its own. */
  transaction?: Transaction;
  /** The signature the event carries (required for a void; disposals and overrides may pass theirs), already checked and consumed. Applies to every event of the unit. */
  signature?: z.infer<typeof EventSignature> | null;
  /** Let `registered` and `split_from` through: only the server's own registration paths do. */
  allowRegistration?: boolean;
}

/** Narrows an outcome to a recorded (or replayed) event. */
export function isRecorded(outcome: EventOutcome): outcome is RecordedEvent {
  return outcome.status === 200 || outcome.status === 201;
}
