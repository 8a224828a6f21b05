/** The shapes the scanner reads from the ledger API. */
import type { EventType, ItemKind, ProjectionState } from '../../../../shared/domain/ledger/state-machine';
import type { EventError, RecordedEvent } from '../../../../shared/schemas/events';

export type { EventError, ItemSummary, RecordedEvent } from '../../../../shared/schemas/events';

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
