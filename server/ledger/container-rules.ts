import type { EventType, ItemKind } from '../../shared/domain/ledger/state-machine';

/** The container types the lab registers (containers.container_type). */
export const CONTAINER_TYPES = ['bin', 'bag', 'box', 'shelf', 'cart'] as const;

/** A container type. */
export type ContainerType = (typeof CONTAINER_TYPES)[number];

/** What the rules need to know about the container an event names. */
export interface ContainerFacts {
  code: string;
  containerType: ContainerType;
  /** A bin at a test cell may be marked for half A (and whole specimens) or half B only. */
  binHalf: 'A' | 'B' | null;
}

/** What the rules need to know about the item the event is for. */
export interface PieceFacts {
  kind: ItemKind;
  /** For a half: which one. */
  half: 'A' | 'B' | null;
}

const STORAGE: readonly ContainerType[] = ['bag', 'box', 'shelf'];
const PLACES_FOR_MOVES: readonly ContainerType[] = ['bag', 'box', 'shelf', 'cart'];

/**
 * Whether an event may put this item in this container; a sentence saying why not, or null.
 * Binned takes a bin (and a bin marked for one half takes only that half; whole specimens go
 * with half A, the half that keeps the mark); retained takes a storage container (bag, box,
 * shelf); a piece moves into storage or onto a cart; a container may sit in any other container.
 */
export function containerProblem(type: EventType, piece: PieceFacts, container: ContainerFacts): string | null {
  const name = `${container.code} is a ${container.containerType}`;
  if (type === 'binned') {
    if (container.containerType !== 'bin') return `${name}; binned needs a bin.`;
    if (container.binHalf !== null) {
      const side = piece.kind === 'half' ? piece.half : 'A';
      if (side !== container.binHalf) {
        const what = piece.kind === 'half' ? `half ${piece.half}` : 'a whole specimen';
        return `${container.code} is the bin for half ${container.binHalf}; ${what} goes in the ${side} bin.`;
      }
    }
    return null;
  }
  if (type === 'retained' && !STORAGE.includes(container.containerType)) {
    return `${name}; retained needs a storage container (bag, box or shelf).`;
  }
  if (type === 'moved' && piece.kind !== 'container' && !PLACES_FOR_MOVES.includes(container.containerType)) {
    return `${name}; a piece moves into a bag, box or shelf, or onto a cart.`;
  }
  return null;
}
