import { randomUUID } from 'node:crypto';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { allowedNext, type EventType, type ItemKind } from '../../shared/domain/ledger/state-machine';
import { rebuildProjections } from '../../server/commands/rebuild-projections';
import { recordEvent, recordEvents } from '../../server/commands/record-event';
import { verifyLedger } from '../../server/commands/verify-ledger';
import { isRecorded, type LedgerActor } from '../../server/ledger/types';
import { createTestContext, type TestContext } from '../support';
import { createContainer, createSample, createSpecimen, FLAT_READINGS, managerActor } from './ledger-fixtures';

let t: TestContext;
let actor: LedgerActor;

beforeAll(async () => {
  t = await createTestContext();
  actor = await managerActor(t);
});
afterAll(async () => t?.close());

interface Tracked {
  code: string;
  kind: ItemKind;
  state: string;
}

describe('npm run ledger:rebuild (rebuildProjections)', () => {
  it('rebuilds projections equal to the stored ones after a random run of a few thousand valid events', { timeout: 240_000 }, async () => {
    // A seeded generator from fast-check, so a failure can be replayed with the same seed.
    const seed = 20261201;
    const [choices] = fc.sample(fc.infiniteStream(fc.integer({ min: 0, max: 1_000_000 })), { seed, numRuns: 1 });
    const random = choices![Symbol.iterator]();
    const pick = <T,>(list: readonly T[]): T => list[(random.next().value as number) % list.length]!;

    const { sampleId } = await createSample(t);
    const items: Tracked[] = [];
    for (let i = 0; i < 60; i++) items.push({ code: await createSpecimen(t, actor, sampleId), kind: 'specimen', state: 'registered' });
    const bins = [await createContainer(t, actor, 'bin'), await createContainer(t, actor, 'bin')];
    const storage = [await createContainer(t, actor, 'bag'), await createContainer(t, actor, 'box'), await createContainer(t, actor, 'bag')];
    const shelves = [await createContainer(t, actor, 'shelf'), await createContainer(t, actor, 'shelf')];
    for (const code of storage) items.push({ code, kind: 'container', state: 'active' });

    const payloadFor = (type: EventType): Record<string, unknown> => {
      switch (type) {
        case 'measured':
          return FLAT_READINGS;
        case 'tested':
          return { fractured: pick([true, true, false]) };
        case 'held':
        case 'relabelled':
        case 'rejected':
        case 'voided':
          return { reason: 'random run' };
        case 'attached':
          return { sha256: 'a'.repeat(64) };
        default:
          return {};
      }
    };
    const containerFor = (type: EventType, item: Tracked): string | null => {
      if (type === 'binned') return pick(bins);
      if (type === 'retained') return pick(storage);
      if (type === 'moved') return item.kind === 'container' ? pick(shelves) : pick(storage);
      return null;
    };
    const skip = new Set<EventType>(['registered', 'split_from', 'disposed']);

    let accepted = 0;
    let rounds = 0;
    while (accepted < 2_500 && rounds < 400) {
      rounds++;
      // One event per item per batch, so each is built from the item's known state.
      const chosen = [...new Set(Array.from({ length: 40 }, () => pick(items)))];
      const batch: { item: Tracked; input: Record<string, unknown> }[] = [];
      const voids: { item: Tracked; input: Record<string, unknown> }[] = [];
      for (const item of chosen) {
        const allowed = allowedNext(item.kind, item.state as never).filter((type) => !skip.has(type));
        if (allowed.length === 0) continue;
        const type = pick(allowed);
        const input = {
          idempotencyKey: randomUUID(),
          type,
          itemCode: item.code,
          containerCode: containerFor(type, item),
          occurredAt: new Date().toISOString(),
          payload: payloadFor(type),
        };
        (type === 'voided' ? voids : batch).push({ item, input });
      }
      const outcomes = await recordEvents(t.ctx, batch.map((b) => b.input), { actor });
      for (const [index, outcome] of outcomes.entries()) {
        if (!isRecorded(outcome)) continue;
        accepted++;
        batch[index]!.item.state = outcome.item.state;
        for (const half of outcome.halves) {
          // A half voided back to nothing splits again when its specimen fractures again.
          const known = items.find((i) => i.code === half);
          if (known) known.state = 'tested';
          else items.push({ code: half, kind: 'half', state: 'tested' });
        }
      }
      for (const { item, input } of voids) {
        const signature = { signer: actor.id, meaning: 'void', signedAt: new Date().toISOString() };
        try {
          const outcome = await recordEvent(t.ctx, input, { actor, signature });
          accepted++;
          item.state = outcome.item.state;
        } catch {
          // A void of a fractured test while its halves live is refused; the run goes on.
        }
      }
    }
    expect(accepted).toBeGreaterThanOrEqual(2_500);

    const report = await rebuildProjections(t.sequelize);
    expect(report.differences).toEqual([]);
    expect(report.eventsReplayed).toBeGreaterThan(2_500);
    expect((await verifyLedger(t.sequelize)).ok).toBe(true);
  });

  it('reports a projection that no longer matches its ledger', async () => {
    const { sampleId } = await createSample(t);
    const code = await createSpecimen(t, actor, sampleId);
    await t.owner.query(`UPDATE items SET state = 'tested' WHERE code = $1`, { bind: [code] });
    const report = await rebuildProjections(t.sequelize);
    expect(report.differences).toContainEqual({ item: code, field: 'state', stored: 'tested', rebuilt: 'registered' });
    await t.owner.query(`UPDATE items SET state = 'registered' WHERE code = $1`, { bind: [code] });
  });
});
