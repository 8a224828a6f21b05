import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { halfCode } from '../../shared/domain/codes';
import {
  EVENT_TYPES,
  STATES_BY_KIND,
  TRANSITIONS,
  type EventType,
  type ItemKind,
  type ItemState,
} from '../../shared/domain/ledger/state-machine';
import { recordEvent, recordEvents } from '../../server/commands/record-event';
import { isRecorded, type LedgerActor } from '../../server/ledger/types';
import { createTestContext, type TestContext } from '../support';
import { signedInAs, type SignedInAgent } from '../factories';
import { createContainer, createSample, createSpecimen, FLAT_READINGS, managerActor, scan } from '../ledger/ledger-fixtures';

let t: TestContext;
let manager: SignedInAgent;
let actor: LedgerActor;
let sampleId: number;
let places: { bin: string; bag: string; shelf: string };

beforeAll(async () => {
  t = await createTestContext();
  manager = await signedInAs(t, 'manager');
  actor = await managerActor(t);
  ({ sampleId } = await createSample(t));
  places = { bin: await createContainer(t, actor, 'bin'), bag: await createContainer(t, actor, 'bag'), shelf: await createContainer(t, actor, 'shelf') };
});
afterAll(async () => t?.close());

// Types that a scan may post; registered, split_from and voided are tested on their own below.
const SCANNED = EVENT_TYPES.filter((type) => !['registered', 'split_from', 'voided'].includes(type));
// Types that restore a remembered state are not used to reach a state.
const NOT_FOR_PATHS = new Set<EventType>(['released', 'received', 'voided', 'registered', 'split_from']);
const START: Record<ItemKind, ItemState> = { specimen: 'registered', half: 'tested', container: 'active' };

type Step = { type: EventType; fractured?: boolean };

/** Shortest path of events from an item's first state to each state, from the transition table. */
function pathsFor(kind: ItemKind): Map<ItemState, Step[]> {
  const paths = new Map<ItemState, Step[]>([[START[kind], []]]);
  const queue: ItemState[] = [START[kind]];
  while (queue.length > 0) {
    const state = queue.shift()!;
    for (const type of EVENT_TYPES) {
      const transition = TRANSITIONS[kind][type];
      if (!transition || NOT_FOR_PATHS.has(type) || !transition.from.includes(state)) continue;
      const outcomes: [ItemState, Step][] =
        transition.to === 'same'
          ? [[state, { type }]]
          : transition.to === 'by-fracture'
            ? [['broken', { type, fractured: true }], ['tested', { type, fractured: false }]]
            : typeof transition.to === 'string' && !transition.to.includes('-')
              ? [[transition.to as ItemState, { type }]]
              : [];
      for (const [next, step] of outcomes) {
        if (paths.has(next)) continue;
        paths.set(next, [...paths.get(state)!, step]);
        queue.push(next);
      }
    }
  }
  return paths;
}

function body(kind: ItemKind, type: EventType, code: string, fractured = false): Record<string, unknown> {
  const payload: Record<string, unknown> =
    type === 'measured'
      ? FLAT_READINGS
      : type === 'tested'
        ? { fractured }
        : ['held', 'relabelled', 'rejected', 'voided'].includes(type)
          ? { reason: 'table test' }
          : type === 'attached'
            ? { sha256: 'b'.repeat(64) }
            : {};
  const containerCode =
    type === 'binned' ? places.bin : type === 'retained' ? places.bag : type === 'moved' ? (kind === 'container' ? places.shelf : places.bag) : null;
  return { idempotencyKey: randomUUID(), type, itemCode: code, occurredAt: new Date().toISOString(), payload, containerCode };
}

async function drive(kind: ItemKind, code: string, steps: Step[]): Promise<void> {
  const outcomes = await recordEvents(t.ctx, steps.map((s) => body(kind, s.type, code, s.fractured)), { actor });
  for (const outcome of outcomes) if (!isRecorded(outcome)) throw new Error(`setup refused: ${JSON.stringify(outcome)}`);
}

/** A new item of a kind, brought to a state through the ledger. */
async function itemIn(kind: ItemKind, state: ItemState): Promise<string> {
  const steps = pathsFor(kind).get(state);
  if (!steps) throw new Error(`no path to ${kind} ${state}`);
  let code: string;
  if (kind === 'container') {
    code = await createContainer(t, actor, 'bag');
  } else {
    code = await createSpecimen(t, actor, sampleId);
    if (kind === 'half') {
      await drive('specimen', code, [...pathsFor('specimen').get('measured')!, { type: 'tested', fractured: true }]);
      code = halfCode(code, 'A');
    }
  }
  await drive(kind, code, steps);
  return code;
}

const KINDS: ItemKind[] = ['specimen', 'half', 'container'];

describe('POST /api/events: every transition of the state machine', () => {
  for (const kind of KINDS) {
    for (const state of STATES_BY_KIND[kind]) {
      it(`${kind} in ${state}: allowed types answer 201, the others 409 with the state and what may follow`, async () => {
        const refusedItem = await itemIn(kind, state);
        for (const type of SCANNED) {
          const allowed = TRANSITIONS[kind][type]?.from.includes(state) ?? false;
          if (allowed) {
            const code = await itemIn(kind, state);
            const res = await manager.post('/api/events', body(kind, type, code));
            expect({ type, status: res.status, error: res.body.error }).toEqual({ type, status: 201, error: undefined });
          } else {
            const res = await manager.post('/api/events', body(kind, type, refusedItem));
            expect({ type, status: res.status, code: res.body.error?.code }).toEqual({ type, status: 409, code: 'state_refused' });
            expect(res.body.error.details.state).toBe(state);
            expect(res.body.error.details.allowed).not.toContain(type);
          }
        }
        const check = await manager.get(`/api/items/${refusedItem}`).expect(200);
        expect(check.body.state).toBe(state);
      });
    }
  }
});

describe('voided, registered and split_from transitions', () => {
  const signature = () => ({ signer: actor.id, meaning: 'void', signedAt: new Date().toISOString() });

  for (const kind of KINDS) {
    it(`a void of a ${kind} restores the state before its last event, from every state`, async () => {
      for (const state of STATES_BY_KIND[kind]) {
        const steps = pathsFor(kind).get(state)!;
        // Halves start in tested; voids of split_from and of a fracture are tested separately.
        if ((steps.length === 0 && kind !== 'container') || state === 'broken') continue;
        const code = await itemIn(kind, state);
        const before = await manager.get(`/api/items/${code}/events`).expect(200);
        const recorded = await recordEvent(t.ctx, scan('voided', code, { payload: { reason: 'table test' } }), { actor, signature: signature() });
        expect(recorded.event.corrects).toBe(before.body.events.at(-1).hash);
        const expected = kind === 'container' && steps.length === 0 ? 'none' : steps.length > 0 ? (await stateAfter(kind, steps.slice(0, -1))) : 'none';
        expect({ state, after: recorded.item.state }).toEqual({ state, after: expected });
      }
    });
  }

  async function stateAfter(kind: ItemKind, steps: Step[]): Promise<string> {
    let state: ItemState = START[kind];
    for (const [s, path] of pathsFor(kind)) if (path.length === steps.length && path.every((p, i) => p.type === steps[i]?.type && p.fractured === steps[i]?.fractured)) state = s;
    return state;
  }

  it('refuses a void of an item with nothing in force, and registered after the first event', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    const voided = await recordEvent(t.ctx, scan('voided', code, { payload: { reason: 'registered in error' } }), { actor, signature: signature() });
    expect(voided.item.state).toBe('none');
    await expect(recordEvent(t.ctx, scan('voided', code, { payload: { reason: 'again' } }), { actor, signature: signature() })).rejects.toMatchObject({
      status: 409,
      code: 'state_refused',
    });
    const again = await recordEvent(t.ctx, scan('registered', code), { actor, allowRegistration: true });
    expect(again.item.state).toBe('registered');
    await expect(recordEvent(t.ctx, scan('registered', code), { actor, allowRegistration: true })).rejects.toMatchObject({ status: 409 });
  });

  it('refuses a void of a fracture while its halves live, and allows it once their split_from is voided', async () => {
    const code = await itemIn('specimen', 'broken');
    await expect(recordEvent(t.ctx, scan('voided', code, { payload: { reason: 'wrong specimen' } }), { actor, signature: signature() })).rejects.toMatchObject({
      status: 409,
      code: 'void_refused',
    });
    for (const side of ['A', 'B'] as const) {
      const half = await recordEvent(t.ctx, scan('voided', halfCode(code, side), { payload: { reason: 'wrong specimen' } }), { actor, signature: signature() });
      expect(half.item.state).toBe('none');
    }
    const restored = await recordEvent(t.ctx, scan('voided', code, { payload: { reason: 'wrong specimen' } }), { actor, signature: signature() });
    expect(restored.item.state).toBe('measured');
    const retest = await manager.post('/api/events', body('specimen', 'tested', code, true)).expect(201);
    expect(retest.body.halves).toEqual([halfCode(code, 'A'), halfCode(code, 'B')]);
    const half = await manager.get(`/api/items/${halfCode(code, 'A')}/events`).expect(200);
    expect(half.body.events.map((e: { type: string }) => e.type)).toEqual(['split_from', 'voided', 'split_from']);
    expect(half.body.chain.ok).toBe(true);
  });

  it('refuses a void without a signature, and from a role without events.void', async () => {
    const code = await itemIn('specimen', 'cut');
    await expect(recordEvent(t.ctx, scan('voided', code, { payload: { reason: 'x' } }), { actor })).rejects.toMatchObject({ status: 422, code: 'signature_required' });
    const tech = await signedInAs(t, 'technician');
    const res = await tech.post('/api/events', scan('voided', code, { payload: { reason: 'x' }, signatureToken: 'whatever' })).expect(403);
    expect(res.body.error.message).toMatch(/manager/);
  });
});
