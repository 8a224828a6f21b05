import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SIGNATURE_MEANINGS } from '../../shared/schemas/auth';
import { consumeSignature } from '../../server/auth/signatures';
import { signedInAs, TEST_PASSWORD, type SignedInAgent } from '../factories';
import { createTestContext, type TestContext } from '../support';

let t: TestContext;
let clerk: SignedInAgent;
beforeAll(async () => {
  t = await createTestContext();
  clerk = await signedInAs(t, 'clerk');
});
afterAll(() => t.close());

function consume(token: string, userId: number, expectedMeanings?: ('disposal' | 'void')[]) {
  return t.sequelize.transaction((tx) => consumeSignature(t.ctx, token, { userId, expectedMeanings }, tx));
}

describe('POST /api/auth/signature', () => {
  it('returns a token with the meaning and its statement, that works once', async () => {
    const res = await clerk.post('/api/auth/signature', { password: TEST_PASSWORD, meaning: 'disposal' }).expect(201);
    expect(res.body).toMatchObject({ meaning: 'disposal', statement: SIGNATURE_MEANINGS.disposal });
    const lifetime = new Date(res.body.expiresAt).getTime() - Date.now();
    expect(lifetime).toBeGreaterThan(4 * 60_000);
    expect(lifetime).toBeLessThanOrEqual(5 * 60_000);
    const first = await consume(res.body.signatureToken, clerk.user.id, ['disposal']);
    expect(first).toMatchObject({ signer: clerk.user.id, meaning: 'disposal' });
    expect(Date.parse(first.signedAt)).not.toBeNaN();
    await expect(consume(res.body.signatureToken, clerk.user.id)).rejects.toMatchObject({ status: 422, code: 'signature_used' });
  });

  it('keeps the token when the signed action rolls back', async () => {
    const res = await clerk.post('/api/auth/signature', { password: TEST_PASSWORD, meaning: 'void' }).expect(201);
    await expect(
      t.sequelize.transaction(async (tx) => {
        await consumeSignature(t.ctx, res.body.signatureToken, { userId: clerk.user.id }, tx);
        throw new Error('the action failed');
      }),
    ).rejects.toThrow('the action failed');
    await expect(consume(res.body.signatureToken, clerk.user.id)).resolves.toMatchObject({ meaning: 'void' });
  });

  it('refuses an expired token, another person’s token, and the wrong meaning', async () => {
    const a = await clerk.post('/api/auth/signature', { password: TEST_PASSWORD, meaning: 'disposal' }).expect(201);
    await t.owner.query(`UPDATE signature_tokens SET expires_at = now() - interval '1 second' WHERE user_id = $1 AND used_at IS NULL`, { bind: [clerk.user.id] });
    await expect(consume(a.body.signatureToken, clerk.user.id)).rejects.toMatchObject({ status: 422, code: 'signature_expired' });

    const b = await clerk.post('/api/auth/signature', { password: TEST_PASSWORD, meaning: 'disposal' }).expect(201);
    await expect(consume(b.body.signatureToken, clerk.user.id + 999)).rejects.toMatchObject({ status: 403 });
    await expect(consume(b.body.signatureToken, clerk.user.id, ['void'])).rejects.toMatchObject({ status: 422, code: 'signature_meaning' });
    await expect(consume('made-up-token', clerk.user.id)).rejects.toMatchObject({ status: 403 });
  });

  it('refuses a wrong password with 403, and an unknown meaning with 422', async () => {
    const wrong = await clerk.post('/api/auth/signature', { password: 'not it', meaning: 'disposal' }).expect(403);
    expect(wrong.body.error.code).toBe('signature_refused');
    const odd = await clerk.post('/api/auth/signature', { password: TEST_PASSWORD, meaning: 'whatever' }).expect(422);
    expect(odd.body.error.details).toEqual([expect.objectContaining({ path: 'meaning' })]);
  });

  it('answers 401 to nobody', async () => {
    const { default: request } = await import('supertest');
    await request(t.app).post('/api/auth/signature').send({ password: 'x', meaning: 'void' }).expect(401);
  });
});
