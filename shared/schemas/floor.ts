import type { ItemKind, ProjectionState } from '../domain/ledger/state-machine';

/** GET /api/floor: where work stands across the lab right now. */
export interface FloorView {
  /** How many items are in each state, by kind. */
  states: { kind: ItemKind; state: ProjectionState; count: number }[];
  /** Pieces still in work (not stored, disposed or returned) whose last scan was at each station. */
  stations: { code: string; name: string; kind: string; count: number; oldestSince: string | null }[];
  /** Custody events recorded in the last 24 hours. */
  eventsLast24h: number;
}
