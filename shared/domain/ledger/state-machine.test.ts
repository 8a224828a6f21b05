import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { computeEventHash, verifyChain, type HashedEvent, type LedgerEvent } from './event-hash';
import {
  allowedNext,
  applyEvent,
  emptyProjection,
  EVENT_TYPES,
  ITEM_KINDS,
  ITEM_STATES,
  NO_STATE,
  replay,
  STATES_BY_KIND,
  TRANSITIONS,
  type EventType,
  type ItemKind,
  type Projection,
  type ProjectionState,
} from './state-machine';

// Invented demo codes.
const CODES: Record<ItemKind, string> = { specimen: 'S26-00157-K', half: 'S26-00157-K-B', container: 'C26-00031-T' };

/** A payload that satisfies each type's schema. */
const SAMPLE_PAYLOADS: Record<EventType, HashedEvent['payload']> = {
  registered: {},
  split_from: { from: 'S26-00157-K', half: 'B', fromEvent: 'c'.repeat(64) },
  cut: {},
  conditioning_started: { atmosphere: '23/50' },
  conditioned: {},
  measured: { widthMm: [12.52, 12.47, 12.5], thicknessMm: [1.99, 2.02, 2.0] },
  tested: { fractured: false },
  binned: {},
  retained: {},
  moved: {},
  returned: {},
  disposed: {},
  held: { reason: 'customer query on the certificate' },
  released: {},
  rejected: { reason: 'tool mark in the gauge length', replacement: 'S26-00160-D' },
  sent: {},
  received: {},
  relabelled: { reason: 'label smudged by coolant' },
  label_printed: {},
  attached: { sha256: 'e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855' },
  voided: { reason: 'scanned the wrong piece' },
};

let clock = Date.UTC(2026, 11, 1, 6, 0, 0);

/** Builds the next valid-looking event of the projection's item, with a real hash. */
function nextEvent(
  projection: Projection,
  type: EventType,
  overrides: Partial<HashedEvent> = {},
): LedgerEvent {
  clock += 60_000;
  const at = new Date(clock).toISOString();
  const kind = projection.kind;
  const needsContainer = TRANSITIONS[kind][type]?.needsContainer ?? false;
  const body: HashedEvent = {
    v: 1,
    item: projection.item ?? CODES[kind],
    seq: projection.lastSeq + 1,
    type,
    actor: { kind: 'user', id: 4 },
    station: `ST-${type.length}`,
    container: needsContainer ? `BIN-${projection.lastSeq + 1}` : null,
    occurredAt: at,
    recordedAt: at,
    payload: SAMPLE_PAYLOADS[type],
    idempotencyKey: `key-${clock}`,
    corrects: type === 'voided' ? (projection.effective.at(-1)?.hash ?? null) : null,
    signature: null,
    prevHash: projection.headHash,
    ...overrides,
  };
  return { ...body, hash: computeEventHash(body) };
}

function apply(projection: Projection, type: EventType, overrides: Partial<HashedEvent> = {}): Projection {
  const result = applyEvent(projection, nextEvent(projection, type, overrides));
  if (!result.ok) throw new Error(`${type} refused: ${result.message}`);
  return result.projection;
}

function run(kind: ItemKind, steps: (EventType | [EventType, Partial<HashedEvent>])[]): Projection {
  return steps.reduce<Projection>(
    (projection, step) => (Array.isArray(step) ? apply(projection, step[0], step[1]) : apply(projection, step)),
    emptyProjection(kind, CODES[kind]),
  );
}

/** One projection per reachable state, found by walking the table from nothing (breadth first). */
function reachableStates(kind: ItemKind): Map<ProjectionState, Projection> {
  const found = new Map<ProjectionState, Projection>([[NO_STATE, emptyProjection(kind, CODES[kind])]]);
  const queue = [...found.values()];
  while (queue.length > 0) {
    const projection = queue.shift() as Projection;
    for (const type of allowedNext(kind, projection.state)) {
      const variants = type === 'tested' ? [{ fractured: false }, { fractured: true }] : [SAMPLE_PAYLOADS[type]];
      for (const payload of variants) {
        const result = applyEvent(projection, nextEvent(projection, type, { payload }));
        if (result.ok && !found.has(result.projection.state)) {
          found.set(result.projection.state, result.projection);
          queue.push(result.projection);
        }
      }
    }
  }
  return found;
}

/** The states of a kind, with the state before the first event. */
function statesOf(kind: ItemKind): ProjectionState[] {
  return [NO_STATE, ...STATES_BY_KIND[kind]];
}

const REACHED = new Map(ITEM_KINDS.map((kind) => [kind, reachableStates(kind)]));

describe('transition tables', () => {
  it.each(ITEM_KINDS)('%s: every state can be reached from nothing', (kind) => {
    expect([...(REACHED.get(kind)?.keys() ?? [])].sort()).toEqual(statesOf(kind).sort());
  });

  it.each(ITEM_KINDS)('%s: tables name only states of their kind', (kind) => {
    const own = new Set<string>(statesOf(kind));
    for (const transition of Object.values(TRANSITIONS[kind])) {
      for (const from of transition.from) expect(own.has(from)).toBe(true);
      if ((ITEM_STATES as readonly string[]).includes(transition.to)) expect(own.has(transition.to)).toBe(true);
    }
  });

  it('spells event types in lower snake case, each once', () => {
    expect(new Set(EVENT_TYPES).size).toBe(EVENT_TYPES.length);
    for (const type of EVENT_TYPES) expect(type).toMatch(/^[a-z]+(_[a-z]+)*$/);
  });

  it('lists what may follow in a measured specimen', () => {
    expect(allowedNext('specimen', 'measured')).toEqual([
      'measured',
      'tested',
      'held',
      'rejected',
      'sent',
      'relabelled',
      'label_printed',
      'attached',
      'voided',
    ]);
    expect(allowedNext('specimen', NO_STATE)).toEqual(['registered']);
    expect(allowedNext('half', NO_STATE)).toEqual(['split_from']);
    expect(allowedNext('specimen', 'disposed')).toEqual(['voided']);
    expect(allowedNext('specimen', 'broken')).toEqual(['attached', 'voided']);
  });

  // Generated from the tables: every allowed transition of every kind.
  const allowedCases = ITEM_KINDS.flatMap((kind) =>
    statesOf(kind).flatMap((state) =>
      allowedNext(kind, state).map((type) => [kind, state, type, TRANSITIONS[kind][type]?.to ?? '?'] as const),
    ),
  );

  it.each(allowedCases)('%s in %s accepts %s (→ %s)', (kind, state, type, outcome) => {
    const before = REACHED.get(kind)?.get(state) as Projection;
    const result = applyEvent(before, nextEvent(before, type));
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const after = result.projection;
    const expected: Record<string, ProjectionState | undefined> = {
      same: before.state,
      'held-from': before.heldFrom ?? undefined,
      'sent-from': before.sentFrom ?? undefined,
      'before-voided': before.effective.at(-1)?.before.state,
      // The sample tested payload is unbroken.
      'by-fracture': 'tested',
    };
    expect(after.state).toBe(expected[outcome] ?? outcome);
    expect(after.lastSeq).toBe(before.lastSeq + 1);
  });

  // Generated from the tables: every type that a state does not allow.
  const refusedCases = ITEM_KINDS.flatMap((kind) =>
    statesOf(kind).map((state) => [kind, state] as const),
  );

  it.each(refusedCases)('%s in %s refuses every other event type, saying what may follow', (kind, state) => {
    const before = REACHED.get(kind)?.get(state) as Projection;
    const allowed = allowedNext(kind, state);
    for (const type of EVENT_TYPES.filter((candidate) => !allowed.includes(candidate))) {
      const result = applyEvent(before, nextEvent(before, type));
      expect(result).toMatchObject({ ok: false, code: 'state_refused', state, allowed });
      if (!result.ok) expect(result.message).toContain(`; next may be: ${allowed.join(', ')}`);
    }
  });
});

describe('applyEvent', () => {
  it('refuses a scan that does not fit, with the state and what may follow', () => {
    const measured = run('specimen', ['registered', 'cut', 'measured']);
    const result = applyEvent(measured, nextEvent(measured, 'binned'));
    expect(result).toEqual({
      ok: false,
      code: 'state_refused',
      state: 'measured',
      allowed: ['measured', 'tested', 'held', 'rejected', 'sent', 'relabelled', 'label_printed', 'attached', 'voided'],
      message:
        'S26-00157-K is measured; next may be: measured, tested, held, rejected, sent, relabelled, label_printed, attached, voided',
    });
  });

  it('follows a specimen along the main path, tracking container and station', () => {
    const conditioned = run('specimen', ['registered', 'cut', 'conditioning_started', 'conditioned']);
    expect(conditioned.state).toBe('conditioned');
    const tested = run('specimen', ['registered', 'cut', 'measured', 'tested']);
    expect(tested.state).toBe('tested');
    const binned = apply(tested, 'binned', { container: 'BIN-WHOLE', station: 'CELL-2' });
    expect(binned).toMatchObject({ state: 'binned', container: 'BIN-WHOLE', station: 'CELL-2' });
    const retained = apply(binned, 'retained', { container: 'BAG-0091', station: 'STORE-A' });
    const moved = apply(retained, 'moved', { container: 'SHELF-3', station: null });
    // An event without a station leaves the last known station in place.
    expect(moved).toMatchObject({ state: 'retained', container: 'SHELF-3', station: 'STORE-A' });
    const disposed = apply(moved, 'disposed');
    expect(disposed).toMatchObject({ state: 'disposed', container: null, lastSeq: 8 });
    expect(allowedNext('specimen', disposed.state)).toEqual(['voided']);
  });

  it('breaks a fractured specimen and asks for halves A and B', () => {
    const measured = run('specimen', ['registered', 'cut', 'measured']);
    const result = applyEvent(measured, nextEvent(measured, 'tested', { payload: { fractured: true, maxForceN: 11250 } }));
    expect(result).toMatchObject({ ok: true, halves: ['A', 'B'], projection: { state: 'broken' } });
    const unbroken = applyEvent(measured, nextEvent(measured, 'tested', { payload: { fractured: false } }));
    expect('halves' in unbroken).toBe(false);
    expect(unbroken).toMatchObject({ ok: true, projection: { state: 'tested' } });
  });

  it('starts a half in tested and takes it to storage and back to the customer', () => {
    const half = run('half', ['split_from', 'binned', 'retained', 'moved', 'returned']);
    expect(half.state).toBe('returned');
    const split = run('half', ['split_from']);
    expect(split.state).toBe('tested');
  });

  it('requires a container for binned, retained and moved', () => {
    const tested = run('specimen', ['registered', 'cut', 'measured', 'tested']);
    const result = applyEvent(tested, nextEvent(tested, 'binned', { container: null }));
    expect(result).toMatchObject({ ok: false, code: 'event_invalid', issues: [{ path: 'container' }] });
  });

  it.each([
    ['rejected', { replacement: 'S26-00160-D' }, 'payload.reason'],
    ['rejected', { reason: '   ' }, 'payload.reason'],
    ['relabelled', {}, 'payload.reason'],
    ['held', { reason: '' }, 'payload.reason'],
    ['tested', {}, 'payload.fractured'],
    ['tested', { fractured: 'yes' }, 'payload.fractured'],
  ] as const)('refuses %s with payload %j (%s)', (type, payload, path) => {
    const measured = run('specimen', ['registered', 'cut', 'measured']);
    const result = applyEvent(measured, nextEvent(measured, type, { payload }));
    expect(result).toMatchObject({ ok: false, code: 'event_invalid' });
    if (!result.ok && result.code === 'event_invalid') expect(result.issues.map((i) => i.path)).toContain(path);
  });

  it('refuses a half without its origin, and an attachment without a hash', () => {
    const empty = emptyProjection('half', CODES.half);
    const result = applyEvent(empty, nextEvent(empty, 'split_from', { payload: { from: 'S26-00157-K', half: 'C' } }));
    expect(result).toMatchObject({ ok: false, code: 'event_invalid' });
    const half = run('half', ['split_from']);
    const attached = applyEvent(half, nextEvent(half, 'attached', { payload: { sha256: 'not-a-hash' } }));
    expect(attached).toMatchObject({ ok: false, code: 'event_invalid', issues: [{ path: 'payload.sha256' }] });
  });

  it('rejects before test only, with a reason, and lets a reject go to storage', () => {
    const rejected = run('specimen', ['registered', 'cut', 'rejected']);
    expect(rejected.state).toBe('rejected');
    expect(apply(rejected, 'retained', { container: 'REJ-BOX' }).state).toBe('retained');
    const tested = run('specimen', ['registered', 'cut', 'measured', 'tested']);
    expect(applyEvent(tested, nextEvent(tested, 'rejected'))).toMatchObject({ ok: false, code: 'state_refused' });
  });

  it('holds and releases back to the state it came from', () => {
    const held = run('specimen', ['registered', 'cut', 'measured', 'tested', 'binned', 'held']);
    expect(held).toMatchObject({ state: 'held', heldFrom: 'binned' });
    const refused = applyEvent(held, nextEvent(held, 'retained'));
    expect(refused).toMatchObject({ ok: false, code: 'state_refused' });
    if (!refused.ok) expect(refused.message).toMatch(/^S26-00157-K is held \(was binned\); next may be: released,/);
    const relabelled = apply(held, 'relabelled');
    expect(relabelled.state).toBe('held');
    expect(apply(relabelled, 'released')).toMatchObject({ state: 'binned', heldFrom: null });
  });

  it('sends and receives back to the state it came from', () => {
    const retained = run('half', ['split_from', 'binned', 'retained']);
    const sent = apply(retained, 'sent', { container: 'CRATE-7' });
    expect(sent).toMatchObject({ state: 'in_transit', sentFrom: 'retained', container: 'CRATE-7' });
    expect(applyEvent(sent, nextEvent(sent, 'held'))).toMatchObject({ ok: false, code: 'state_refused' });
    const received = apply(sent, 'received', { container: 'SHELF-9', station: 'STORE-B' });
    expect(received).toMatchObject({ state: 'retained', sentFrom: null, container: 'SHELF-9', station: 'STORE-B' });
    const container = run('container', ['registered', 'sent', 'received']);
    expect(container).toMatchObject({ state: 'active', sentFrom: null });
  });

  it('voids the most recent event in force and restores everything before it', () => {
    const tested = run('specimen', ['registered', 'cut', 'measured', 'tested']);
    const binned = apply(tested, 'binned', { container: 'BIN-9', station: 'CELL-1' });
    const voided = apply(binned, 'voided');
    const { lastSeq, headHash, ...restored } = voided;
    const { lastSeq: _l, headHash: _h, ...original } = tested;
    expect(restored).toEqual(original);
    expect(lastSeq).toBe(6);
    expect(headHash).not.toBe(tested.headHash);
    // Voiding again reaches further back, one event in force at a time.
    const twice = apply(voided, 'voided');
    expect(twice.state).toBe('measured');
    expect(apply(twice, 'voided').state).toBe('cut');
    expect(apply(apply(twice, 'voided'), 'voided').state).toBe('registered');
  });

  it('voids a hold or a release, restoring what they remembered', () => {
    const held = run('specimen', ['registered', 'cut', 'held']);
    expect(apply(held, 'voided')).toMatchObject({ state: 'cut', heldFrom: null });
    const released = apply(held, 'released');
    expect(apply(released, 'voided')).toMatchObject({ state: 'held', heldFrom: 'cut' });
  });

  it('voids a registration back to nothing', () => {
    const registered = run('container', ['registered']);
    const voided = apply(registered, 'voided');
    expect(voided).toMatchObject({ state: NO_STATE, effective: [], lastSeq: 2 });
    expect(allowedNext('container', voided.state)).toEqual(['registered']);
  });

  it('refuses a void of anything but the most recent event in force', () => {
    const measured = run('specimen', ['registered', 'cut', 'measured']);
    const cutHash = measured.effective[1].hash;
    expect(applyEvent(measured, nextEvent(measured, 'voided', { corrects: cutHash }))).toMatchObject({
      ok: false,
      code: 'void_refused',
      expected: measured.effective[2].hash,
      actual: cutHash,
    });
    const voided = apply(measured, 'voided');
    // The voided event is no longer in force, and a void cannot itself be voided.
    expect(applyEvent(voided, nextEvent(voided, 'voided', { corrects: measured.effective[2].hash }))).toMatchObject({
      ok: false,
      code: 'void_refused',
    });
    expect(applyEvent(voided, nextEvent(voided, 'voided', { corrects: voided.headHash }))).toMatchObject({
      ok: false,
      code: 'void_refused',
    });
    expect(applyEvent(measured, nextEvent(measured, 'voided', { corrects: null }))).toMatchObject({
      ok: false,
      code: 'event_invalid',
      issues: [{ path: 'corrects' }],
    });
  });

  it('refuses corrects on anything but a void', () => {
    const cut = run('specimen', ['registered', 'cut']);
    const result = applyEvent(cut, nextEvent(cut, 'measured', { corrects: cut.headHash }));
    expect(result).toMatchObject({ ok: false, code: 'event_invalid', issues: [{ path: 'corrects' }] });
  });

  it('refuses an event that does not continue the chain', () => {
    const cut = run('specimen', ['registered', 'cut']);
    expect(applyEvent(cut, nextEvent(cut, 'measured', { seq: 4 }))).toMatchObject({ code: 'chain_refused', expected: 3, actual: 4 });
    expect(applyEvent(cut, nextEvent(cut, 'measured', { prevHash: 'a'.repeat(64) }))).toMatchObject({ code: 'chain_refused' });
    expect(applyEvent(cut, nextEvent(cut, 'measured', { item: 'S26-00158-F' }))).toMatchObject({ code: 'chain_refused' });
  });

  it('refuses an unknown event type', () => {
    const cut = run('specimen', ['registered', 'cut']);
    const event = { ...nextEvent(cut, 'measured'), type: 'polished' };
    expect(applyEvent(cut, event)).toMatchObject({ ok: false, code: 'event_invalid', issues: [{ path: 'type' }] });
  });

  it('never changes the projection it is given', () => {
    const measured = run('specimen', ['registered', 'cut', 'measured']);
    const copy = structuredClone(measured);
    apply(measured, 'tested');
    apply(measured, 'voided');
    expect(measured).toEqual(copy);
  });
});

/** Turns random numbers into a valid event sequence for a kind, applying each step as it goes. */
function validSequence(kind: ItemKind, choices: readonly number[]): LedgerEvent[] {
  let projection = emptyProjection(kind, CODES[kind]);
  const events: LedgerEvent[] = [];
  for (const choice of choices) {
    const allowed = allowedNext(kind, projection.state);
    const type = allowed[choice % allowed.length];
    const overrides: Partial<HashedEvent> =
      type === 'tested' ? { payload: { fractured: choice % 2 === 0 } } : { station: choice % 3 === 0 ? null : `ST-${choice % 5}` };
    const event = nextEvent(projection, type, overrides);
    const result = applyEvent(projection, event);
    if (!result.ok) throw new Error(`generator built a refused event: ${result.message}`);
    projection = result.projection;
    events.push(event);
  }
  return events;
}

describe('replay', () => {
  it('gives the same projection as stepwise application through storage, for random valid sequences', () => {
    fc.assert(
      fc.property(fc.constantFrom(...ITEM_KINDS), fc.array(fc.nat(), { maxLength: 40 }), (kind, choices) => {
        const events = validSequence(kind, choices);
        const replayed = replay(kind, events);
        expect(replayed.ok).toBe(true);
        if (!replayed.ok) return;
        // Stepwise as the server does it: load the stored projection, apply one event, store it.
        let stored = JSON.stringify(emptyProjection(kind, events[0]?.item ?? null));
        for (const event of events) {
          const result = applyEvent(JSON.parse(stored) as Projection, event);
          expect(result.ok).toBe(true);
          if (result.ok) stored = JSON.stringify(result.projection);
        }
        expect(JSON.parse(stored)).toEqual(replayed.projection);
        expect(replayed.projection.lastSeq).toBe(events.length);
        expect(verifyChain(events).ok).toBe(true);
      }),
      { numRuns: 150 },
    );
  });

  it('restores the exact projection when the last event in force is voided', () => {
    fc.assert(
      fc.property(fc.constantFrom(...ITEM_KINDS), fc.array(fc.nat(), { minLength: 1, maxLength: 30 }), (kind, choices) => {
        const events = validSequence(kind, choices);
        const steps: Projection[] = [emptyProjection(kind, CODES[kind])];
        for (const event of events) {
          const result = applyEvent(steps[steps.length - 1], event);
          if (result.ok) steps.push(result.projection);
        }
        const last = steps[steps.length - 1];
        if (last.state === NO_STATE) return;
        const target = last.effective[last.effective.length - 1];
        // The projection just before the target event was applied.
        const beforeTarget = steps[target.seq - 1];
        const voided = apply(last, 'voided');
        expect({ ...voided, lastSeq: 0, headHash: '' }).toEqual({ ...beforeTarget, lastSeq: 0, headHash: '' });
      }),
      { numRuns: 150 },
    );
  });

  it('names the first refused event', () => {
    const events = validSequence('specimen', [0, 0, 0]);
    const stray = { ...events[2], seq: 3 };
    const result = replay('specimen', [events[0], events[2], stray]);
    expect(result).toMatchObject({ ok: false, eventIndex: 1, refusal: { code: 'chain_refused' } });
  });

  it('replays nothing to the empty projection', () => {
    expect(replay('half', [])).toEqual({ ok: true, projection: emptyProjection('half') });
  });
});
