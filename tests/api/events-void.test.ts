import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { LedgerActor } from '../../server/ledger/types';
import { createTestContext, type TestContext } from '../support';
import { signedInAs, TEST_PASSWORD, type SignedInAgent } from '../factories';
import { countRows, createSample, createSpecimen, managerActor, scan } from '../ledger/ledger-fixtures';

let t: TestContext;
let manager: SignedInAgent;
let actor: LedgerActor;
let sampleId: number;

beforeAll(async () => {
  t = await createTestContext();
  manager = await signedInAs(t, 'manager');
  actor = await managerActor(t);
  ({ sampleId } = await createSample(t));
});
afterAll(async () => t?.close());

async function signatureToken(meaning = 'void'): Promise<string> {
  const res = await manager.post('/api/auth/signature', { password: TEST_PASSWORD, meaning }).expect(201);
  return res.body.signatureToken as string;
}

describe('POST /api/events voided', () => {
  it('cancels the most recent event with a reason and a signature, and restores the state before it', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    const cut = await manager.post('/api/events', scan('cut', code)).expect(201);
    const body = scan('voided', code, { payload: { reason: 'Scanned the wrong specimen' }, signatureToken: await signatureToken() });
    const res = await manager.post('/api/events', body).expect(201);
    expect(res.body.event).toMatchObject({ type: 'voided', corrects: cut.body.event.hash, signature: { signer: manager.user.id, meaning: 'void' } });
    expect(res.body.item.state).toBe('registered');
    const again = await manager.post('/api/events', body).expect(200);
    expect(again.body.event.hash).toBe(res.body.event.hash);
  });

  it('refuses a void without a reason, a spent signature, or a signature of another meaning', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    await manager.post('/api/events', scan('cut', code)).expect(201);
    const token = await signatureToken();
    const noReason = await manager.post('/api/events', scan('voided', code, { signatureToken: token })).expect(422);
    expect(noReason.body.error.details).toEqual(expect.arrayContaining([expect.objectContaining({ path: 'payload.reason' })]));
    // The refused void did not spend the signature: it still works once.
    await manager.post('/api/events', scan('voided', code, { payload: { reason: 'wrong' }, signatureToken: token })).expect(201);
    const spent = await manager.post('/api/events', scan('voided', code, { payload: { reason: 'wrong' }, signatureToken: token })).expect(422);
    expect(spent.body.error.code).toBe('signature_used');
    const other = await manager
      .post('/api/events', scan('voided', code, { payload: { reason: 'wrong' }, signatureToken: await signatureToken('disposal') }))
      .expect(422);
    expect(other.body.error.code).toBe('signature_meaning');
    expect(await countRows(t, 'custody_events', `item_code = $1 AND type = 'voided'`, [code])).toBe(1);
  });

  it('refuses a void that names an event other than the most recent in force', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    const cut = await manager.post('/api/events', scan('cut', code)).expect(201);
    await manager.post('/api/events', scan('label_printed', code)).expect(201);
    const res = await manager
      .post('/api/events', scan('voided', code, { payload: { reason: 'x' }, corrects: cut.body.event.hash, signatureToken: await signatureToken() }))
      .expect(409);
    expect(res.body.error.code).toBe('void_refused');
  });
});
