import { z } from 'zod';
import { CodeText, GENESIS_HASH, HashHex, type LedgerEvent } from './event-hash';

/** Every custody event type: the main path first, then side steps; messages list them in this order. */
export const EVENT_TYPES = [
  'registered',
  'split_from',
  'cut',
  'conditioning_started',
  'conditioned',
  'measured',
  'tested',
  'binned',
  'retained',
  'moved',
  'returned',
  'disposed',
  'held',
  'released',
  'rejected',
  'sent',
  'received',
  'relabelled',
  'label_printed',
  'attached',
  'voided',
] as const;

/** A custody event type. */
export type EventType = (typeof EVENT_TYPES)[number];

/** The kinds of item that have a chain of custody. */
export const ITEM_KINDS = ['specimen', 'half', 'container'] as const;

/** A kind of item. */
export type ItemKind = (typeof ITEM_KINDS)[number];

/** States of specimens and halves. `broken`: fractured; custody continues in the two halves. */
export const PIECE_STATES = [
  'registered',
  'cut',
  'conditioning',
  'conditioned',
  'measured',
  'tested',
  'broken',
  'binned',
  'retained',
  'held',
  'rejected',
  'in_transit',
  'returned',
  'disposed',
] as const;

/** States of containers; `disposed` means retired. */
export const CONTAINER_STATES = ['active', 'in_transit', 'disposed'] as const;

/** Every item state, across kinds. */
export const ITEM_STATES = [...PIECE_STATES, 'active'] as const;

/** An item state. */
export type ItemState = (typeof ITEM_STATES)[number];

/** The state of an item before its first event. */
export const NO_STATE = 'none';

/** A projection's state: an item state, or `none` before the first event (or after it was voided). */
export type ProjectionState = ItemState | typeof NO_STATE;

/** The states an item of each kind can be in. */
export const STATES_BY_KIND: Record<ItemKind, readonly ItemState[]> = {
  specimen: PIECE_STATES,
  half: ['tested', 'binned', 'retained', 'held', 'in_transit', 'returned', 'disposed'],
  container: CONTAINER_STATES,
};

/**
 * What a transition leads to: a state; `same` (state unchanged); `held-from` / `sent-from` (the
 * state remembered when the item was held / sent); `before-voided` (the state before the voided
 * event); `by-fracture` (tested: `broken` when payload.fractured is true, else `tested`).
 */
export type Outcome = ItemState | 'same' | 'held-from' | 'sent-from' | 'before-voided' | 'by-fracture';

/** One row of a kind's transition table. */
export type Transition = {
  from: readonly ProjectionState[];
  to: Outcome;
  /** The event must name a container (a bin, a storage place). */
  needsContainer: boolean;
};

/** A kind's transition table: the event types it accepts, each with where it may come from. */
export type TransitionTable = Partial<Record<EventType, Transition>>;

const t = (from: readonly ProjectionState[], to: Outcome, needsContainer = false): Transition => ({
  from,
  to,
  needsContainer,
});

// Specimen states in which the piece is on site and free to handle.
const SPECIMEN_ON_HAND = [
  'registered',
  'cut',
  'conditioning',
  'conditioned',
  'measured',
  'tested',
  'binned',
  'retained',
  'rejected',
] as const;
const BEFORE_TEST = ['registered', 'cut', 'conditioning', 'conditioned', 'measured'] as const;
const HALF_ON_HAND = ['tested', 'binned', 'retained'] as const;

/** What may happen to each kind of item, in which state, and what it leads to. */
export const TRANSITIONS: Record<ItemKind, TransitionTable> = {
  specimen: {
    registered: t([NO_STATE], 'registered'),
    cut: t(['registered'], 'cut'),
    conditioning_started: t(['cut'], 'conditioning'),
    conditioned: t(['conditioning'], 'conditioned'),
    // A second measurement supersedes the first; both stay in the ledger.
    measured: t(['cut', 'conditioned', 'measured'], 'measured'),
    tested: t(['measured'], 'by-fracture'),
    binned: t(['tested'], 'binned', true),
    retained: t(['binned', 'rejected'], 'retained', true),
    moved: t(['retained'], 'same', true),
    held: t(SPECIMEN_ON_HAND, 'held'),
    released: t(['held'], 'held-from'),
    relabelled: t([...SPECIMEN_ON_HAND, 'held'], 'same'),
    label_printed: t([...SPECIMEN_ON_HAND, 'held'], 'same'),
    attached: t([...SPECIMEN_ON_HAND, 'held', 'broken', 'in_transit'], 'same'),
    rejected: t(BEFORE_TEST, 'rejected'),
    // Not while conditioning: the chamber time would be lost.
    sent: t(
      SPECIMEN_ON_HAND.filter((state) => state !== 'conditioning'),
      'in_transit',
    ),
    received: t(['in_transit'], 'sent-from'),
    returned: t(['retained', 'rejected'], 'returned'),
    disposed: t(['retained', 'rejected'], 'disposed'),
    voided: t(PIECE_STATES, 'before-voided'),
  },
  half: {
    split_from: t([NO_STATE], 'tested'),
    binned: t(['tested'], 'binned', true),
    retained: t(['binned'], 'retained', true),
    moved: t(['retained'], 'same', true),
    held: t(HALF_ON_HAND, 'held'),
    released: t(['held'], 'held-from'),
    relabelled: t([...HALF_ON_HAND, 'held'], 'same'),
    label_printed: t([...HALF_ON_HAND, 'held'], 'same'),
    attached: t([...HALF_ON_HAND, 'held', 'in_transit'], 'same'),
    sent: t(HALF_ON_HAND, 'in_transit'),
    received: t(['in_transit'], 'sent-from'),
    returned: t(['retained'], 'returned'),
    disposed: t(['retained'], 'disposed'),
    voided: t(STATES_BY_KIND.half, 'before-voided'),
  },
  container: {
    registered: t([NO_STATE], 'active'),
    // A container moved into another (a bag into a box) names the outer one as its container.
    moved: t(['active'], 'same'),
    relabelled: t(['active'], 'same'),
    label_printed: t(['active'], 'same'),
    attached: t(['active', 'in_transit'], 'same'),
    sent: t(['active'], 'in_transit'),
    received: t(['in_transit'], 'sent-from'),
    disposed: t(['active'], 'disposed'),
    voided: t(CONTAINER_STATES, 'before-voided'),
  },
};

const Reason = z.string().trim().min(1, 'a reason is required').max(500);
const AnyPayload = z.record(z.string(), z.unknown());

/**
 * Payload schemas for event types whose payload has required members; other types accept any
 * JSON object. Extra members are allowed (the hash covers them); `measured` is validated by the
 * server against the specimen's geometry.
 */
export const PAYLOAD_SCHEMAS: Record<EventType, z.ZodType<Record<string, unknown>>> = {
  registered: AnyPayload,
  split_from: z.looseObject({
    /** The specimen the half came from. */
    from: CodeText,
    half: z.enum(['A', 'B']),
    /** Hash of the specimen's fractured `tested` event, which links the two chains. */
    fromEvent: HashHex,
  }),
  cut: AnyPayload,
  conditioning_started: AnyPayload,
  conditioned: AnyPayload,
  measured: AnyPayload,
  tested: z.looseObject({ fractured: z.boolean() }),
  binned: AnyPayload,
  retained: AnyPayload,
  moved: AnyPayload,
  held: z.looseObject({ reason: Reason }),
  released: AnyPayload,
  relabelled: z.looseObject({ reason: Reason }),
  label_printed: AnyPayload,
  attached: z.looseObject({ sha256: HashHex }),
  rejected: z.looseObject({ reason: Reason, replacement: CodeText.optional() }),
  sent: AnyPayload,
  received: AnyPayload,
  returned: AnyPayload,
  disposed: AnyPayload,
  voided: z.looseObject({ reason: Reason }),
};

/** The part of a projection that an event changes and a void restores. */
export type Snapshot = {
  state: ProjectionState;
  /** While held: the state to return to on release. */
  heldFrom: ItemState | null;
  /** While in transit: the state to return to on receipt. */
  sentFrom: ItemState | null;
  /** The container the item is in, as far as the ledger knows. */
  container: string | null;
  /** The last station the item was seen at. */
  station: string | null;
};

/** An event that is still in force (not voided, not itself a void), with the snapshot before it. */
export type EffectiveEvent = { seq: number; hash: string; type: EventType; before: Snapshot };

/** An item's current state, derived from its events alone. Plain JSON, so it can be stored. */
export type Projection = Snapshot & {
  kind: ItemKind;
  item: string | null;
  /** Events in force, oldest first; a void pops the last one and restores its snapshot. */
  effective: EffectiveEvent[];
  lastSeq: number;
  headHash: string;
};

/** The members of an event the state machine reads. A full LedgerEvent fits. */
export type TransitionEvent = Pick<
  LedgerEvent,
  'item' | 'seq' | 'type' | 'station' | 'container' | 'payload' | 'corrects' | 'prevHash' | 'hash'
>;

/** Why an event was refused. state_refused is the 409 case; event_invalid the 422 case. */
export type ApplyRefusal =
  | { ok: false; code: 'state_refused'; state: ProjectionState; allowed: EventType[]; message: string }
  | { ok: false; code: 'event_invalid'; issues: { path: string; message: string }[]; message: string }
  | { ok: false; code: 'void_refused'; expected: string | null; actual: string | null; message: string }
  | { ok: false; code: 'chain_refused'; expected: string | number | null; actual: string | number | null; message: string };

/** Result of applyEvent. `halves` is present when a specimen fractured: create half A and half B. */
export type ApplyResult = { ok: true; projection: Projection; halves?: readonly ['A', 'B'] } | ApplyRefusal;

/** Result of replay; on refusal, the index of the refused event. */
export type ReplayResult = { ok: true; projection: Projection } | { ok: false; eventIndex: number; refusal: ApplyRefusal };

/** The projection of an item that has no events yet. */
export function emptyProjection(kind: ItemKind, item: string | null = null): Projection {
  return {
    kind,
    item,
    state: NO_STATE,
    heldFrom: null,
    sentFrom: null,
    container: null,
    station: null,
    effective: [],
    lastSeq: 0,
    headHash: GENESIS_HASH,
  };
}

/** Whether a string names a known event type. */
export function isEventType(type: string): type is EventType {
  return (EVENT_TYPES as readonly string[]).includes(type);
}

/** The event types that may follow an item of this kind in this state, in EVENT_TYPES order. */
export function allowedNext(kind: ItemKind, state: ProjectionState): EventType[] {
  const table = TRANSITIONS[kind];
  return EVENT_TYPES.filter((type) => table[type]?.from.includes(state) ?? false);
}

/** How a state reads in a sentence. */
export function describeState(state: ProjectionState): string {
  if (state === NO_STATE) return 'not yet recorded';
  return state.replace(/_/g, ' ');
}

function resolveOutcome(outcome: Outcome, current: Projection, event: TransitionEvent): ItemState {
  switch (outcome) {
    case 'same':
      return current.state as ItemState;
    case 'held-from':
      return current.heldFrom ?? (current.state as ItemState);
    case 'sent-from':
      return current.sentFrom ?? (current.state as ItemState);
    case 'by-fracture':
      return event.payload.fractured === true ? 'broken' : 'tested';
    case 'before-voided':
      throw new Error('a void is applied by popping the effective events');
    default:
      return outcome;
  }
}

function snapshotOf(projection: Projection): Snapshot {
  const { state, heldFrom, sentFrom, container, station } = projection;
  return { state, heldFrom, sentFrom, container, station };
}

const CONTAINER_SETTING: ReadonlySet<EventType> = new Set([
  'registered',
  'split_from',
  'binned',
  'retained',
  'moved',
  'sent',
  'received',
]);
const CONTAINER_CLEARING: ReadonlySet<EventType> = new Set(['returned', 'disposed']);

function chainRefused(expected: string | number, actual: string | number, message: string): ApplyRefusal {
  return { ok: false, code: 'chain_refused', expected, actual, message };
}

function invalid(issues: { path: string; message: string }[], item: string, type: string): ApplyRefusal {
  return {
    ok: false,
    code: 'event_invalid',
    issues,
    message: `${item} ${type}: ${issues.map((issue) => `${issue.path} ${issue.message}`).join('; ')}`,
  };
}

/**
 * Applies one event to an item's projection, or says why it may not follow. Checks, in order:
 * the event continues this item's chain (item, seq, prevHash); its type is known; the item's
 * state allows it (`state_refused`, with what may follow); its payload, container and
 * `corrects` fit the type (`event_invalid`); a void names the most recent event in force
 * (`void_refused`). Never changes the projection it is given.
 */
export function applyEvent(projection: Projection, event: TransitionEvent): ApplyResult {
  const item = event.item;
  if (projection.item !== null && projection.item !== item) {
    return chainRefused(projection.item, item, `Event for ${item} applied to ${projection.item}`);
  }
  const expectedSeq = projection.lastSeq + 1;
  if (event.seq !== expectedSeq) {
    return chainRefused(expectedSeq, event.seq, `${item}: expected seq ${expectedSeq}, got ${event.seq}`);
  }
  if (event.prevHash !== projection.headHash) {
    return chainRefused(projection.headHash, event.prevHash, `${item} seq ${event.seq}: prevHash is not the item's head hash`);
  }
  if (!isEventType(event.type)) {
    return invalid([{ path: 'type', message: `is not an event type: ${event.type}` }], item, event.type);
  }
  const type = event.type;
  const transition = TRANSITIONS[projection.kind][type];
  if (transition === undefined || !transition.from.includes(projection.state)) {
    const allowed = allowedNext(projection.kind, projection.state);
    const was = projection.heldFrom ?? projection.sentFrom;
    const detail = was !== null ? ` (was ${describeState(was)})` : '';
    return {
      ok: false,
      code: 'state_refused',
      state: projection.state,
      allowed,
      message: `${item} is ${describeState(projection.state)}${detail}; next may be: ${allowed.join(', ')}`,
    };
  }

  const issues: { path: string; message: string }[] = [];
  const payload = PAYLOAD_SCHEMAS[type].safeParse(event.payload);
  if (!payload.success) {
    for (const issue of payload.error.issues) {
      issues.push({ path: ['payload', ...issue.path].join('.'), message: issue.message });
    }
  }
  if (transition.needsContainer && event.container === null) {
    issues.push({ path: 'container', message: `is required: ${type} needs a container` });
  }
  if (type !== 'voided' && event.corrects !== null) {
    issues.push({ path: 'corrects', message: 'is only for voided events' });
  }
  if (type === 'voided' && event.corrects === null) {
    issues.push({ path: 'corrects', message: 'must name the event to void' });
  }
  if (issues.length > 0) return invalid(issues, item, type);

  const base = { item, lastSeq: event.seq, headHash: event.hash };
  if (type === 'voided') {
    const target = projection.effective.at(-1);
    if (target === undefined || target.hash !== event.corrects) {
      return {
        ok: false,
        code: 'void_refused',
        expected: target?.hash ?? null,
        actual: event.corrects,
        message:
          target === undefined
            ? `${item} has no event in force to void`
            : `${item}: only the most recent event in force may be voided (seq ${target.seq}, ${target.type})`,
      };
    }
    return {
      ok: true,
      projection: { ...projection, ...target.before, ...base, effective: projection.effective.slice(0, -1) },
    };
  }

  const state = resolveOutcome(transition.to, projection, event);
  const next: Projection = {
    ...projection,
    ...base,
    state,
    heldFrom: type === 'held' ? (projection.state as ItemState) : type === 'released' ? null : projection.heldFrom,
    sentFrom: type === 'sent' ? (projection.state as ItemState) : type === 'received' ? null : projection.sentFrom,
    container: CONTAINER_SETTING.has(type) ? event.container : CONTAINER_CLEARING.has(type) ? null : projection.container,
    station: event.station ?? projection.station,
    effective: [...projection.effective, { seq: event.seq, hash: event.hash, type, before: snapshotOf(projection) }],
  };
  if (projection.kind === 'specimen' && type === 'tested' && state === 'broken') {
    return { ok: true, projection: next, halves: ['A', 'B'] };
  }
  return { ok: true, projection: next };
}

/**
 * Rebuilds an item's projection from its events, oldest first, starting from nothing. Gives
 * the same projection as applying the events one by one; stops at the first refused event.
 */
export function replay(kind: ItemKind, events: readonly TransitionEvent[]): ReplayResult {
  let projection = emptyProjection(kind, events[0]?.item ?? null);
  for (let index = 0; index < events.length; index++) {
    const result = applyEvent(projection, events[index]);
    if (!result.ok) return { ok: false, eventIndex: index, refusal: result };
    projection = result.projection;
  }
  return { ok: true, projection };
}
