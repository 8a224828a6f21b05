import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SearchResult } from '../../shared/schemas/trace';
import type { SignedInAgent } from '../factories';
import type { TestContext } from '../support';
import { startTraceRig, type Life } from './trace-fixtures';

let t: TestContext;
let auditor: SignedInAgent;
let life: Life;

beforeAll(async () => {
  ({ t, auditor, life } = await startTraceRig());
});
afterAll(async () => t?.close());

async function search(q: string): Promise<SearchResult> {
  return (await auditor.get(`/api/search?q=${encodeURIComponent(q)}`).expect(200)).body as SearchResult;
}

describe('GET /api/search', () => {
  it('finds a half by its code, typed with or without hyphens, exact match first', async () => {
    for (const q of [life.halfA, life.halfA.replace(/-/g, '').toLowerCase()]) {
      const { hits } = await search(q);
      expect(hits[0]).toMatchObject({ kind: 'half', label: life.halfA, code: life.halfA, matched: 'code', state: 'retained' });
    }
  });

  it('finds the specimen and both halves from the specimen code’s serial', async () => {
    const serial = life.specimen.split('-')[1]!;
    const labels = (await search(serial)).hits.map((h) => h.label);
    expect(labels).toEqual(expect.arrayContaining([life.specimen, life.halfA, life.halfB]));
  });

  it('finds heat numbers, order numbers and purchase-order references in the same list', async () => {
    expect((await search(life.heatNumber)).hits).toEqual([expect.objectContaining({ kind: 'heat', matched: 'heat_number', label: life.heatNumber })]);
    const order = await search(life.orderNumber);
    expect(order.hits[0]).toMatchObject({ kind: 'order', id: life.orderId, matched: 'order_number' });
    const po = await search(life.poReference);
    expect(po.hits[0]).toMatchObject({ kind: 'order', id: life.orderId, matched: 'po_reference', detail: expect.stringContaining(life.orderNumber) });
    expect((await search(life.sampleCode)).hits[0]).toMatchObject({ kind: 'sample', matched: 'sample_code' });
  });

  it('treats % and _ as plain characters, and answers 422 for a search under two characters', async () => {
    expect((await search('%%')).hits).toEqual([]);
    const res = await auditor.get('/api/search?q=a').expect(422);
    expect(res.body.error.details).toEqual([expect.objectContaining({ path: 'q' })]);
  });
});
