/** The shapes the scanner reads from the ledger API. */
import type { EventType, ItemKind, ProjectionState } from '../../../../shared/domain/ledger/state-machine';

/** An item's state after an event, as POST /api/events answers. */
export interface ItemSummary {
  code: string;
  kind: ItemKind;
  state: ProjectionState;
  allowed: EventType[];
  container: string | null;
  station: string | null;
}

/** A recorded (201) or replayed (200) event. */
export interface RecordedEvent {
  status: 200 | 201;
  replayed: boolean;
  event: { hash: string; seq: number; type: EventType; item: string; occurredAt: string };
  item: ItemSummary;
  halves: string[];
  flags: string[];
}

/** The API's error body. */
export interface EventError {
  code: string;
  message: string;
  details?: unknown;
}

/** POST /api/events/batch: one result per event, in order. */
export interface BatchAnswer {
  recorded: number;
  replayed: number;
  refused: number;
  results: ({ index: number } & (RecordedEvent | { status: number; error: EventError }))[];
}

/** GET /api/items/:code for a specimen, half or container. */
export interface ItemView {
  kind: ItemKind;
  code: string;
  state: ProjectionState;
  stateLabel: string;
  allowed: EventType[];
  location: { text: string };
  specimen?: { geometryKey: string; shape: string; testStandard: string; sample: string | null; order: string | null; heat: string | null };
  half?: { side: 'A' | 'B'; specimen: string | null };
  container?: { containerType: string; name: string; binHalf: 'A' | 'B' | null; contents: number };
}

/** GET /api/items/:code for a badge. */
export interface BadgeView {
  kind: 'badge';
  code: string;
  user: { id: number; name: string; role: string; active: boolean };
}
