import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createStation, signedInAs, type SignedInAgent } from '../factories';
import { createTestContext, type TestContext } from '../support';

let t: TestContext;
let manager: SignedInAgent;
beforeAll(async () => {
  t = await createTestContext();
  manager = await signedInAs(t, 'manager');
});
afterAll(() => t.close());

describe('POST /api/stations', () => {
  it('creates a station with an upper-case code, and 409 for a taken code', async () => {
    const res = await manager.post('/api/stations', { code: 'frame-9', name: 'Frame nine', kind: 'frame' }).expect(201);
    expect(res.body).toMatchObject({ code: 'FRAME-9', active: true, tokens: [] });
    await manager.post('/api/stations', { code: 'FRAME-9', name: 'Again', kind: 'frame' }).expect(409);
  });

  it('answers 422 for a bad code or kind', async () => {
    const res = await manager.post('/api/stations', { code: '9 x', name: 'Bad', kind: 'oven' }).expect(422);
    expect(res.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['code', 'kind']);
  });
});

describe('POST /api/stations/:id/tokens', () => {
  it('shows the token once, keeps only its hash, and the token then authenticates as the station', async () => {
    const station = await createStation(t, { code: 'CELL-7' });
    const res = await manager.post(`/api/stations/${station.id}/tokens`, { name: 'Cell 7 robot', eventTypes: ['measured', 'tested'] }).expect(201);
    expect(res.body.token).toMatch(/^hmi_/);
    expect(res.body.prefix).toBe(res.body.token.slice(0, 10));
    const [rows] = await t.owner.query('SELECT token_hash FROM instrument_tokens WHERE id = $1', { bind: [res.body.id] });
    expect((rows as { token_hash: string }[])[0]!.token_hash).not.toContain(res.body.token);
    const detail = await manager.get(`/api/stations/${station.id}`).expect(200);
    expect(JSON.stringify(detail.body)).not.toContain(res.body.token);
    expect(detail.body.tokens).toEqual([expect.objectContaining({ name: 'Cell 7 robot', eventTypes: ['measured', 'tested'], revokedAt: null })]);

    await request(t.app).get('/api/stations').set('Authorization', `Bearer ${res.body.token}`).expect(200);
    // An instrument may not manage stations, whatever its token.
    await request(t.app).post('/api/stations').set('Authorization', `Bearer ${res.body.token}`).send({}).expect(403);
  });

  it('answers 422 for an unknown event type or none', async () => {
    const station = await createStation(t);
    await manager.post(`/api/stations/${station.id}/tokens`, { name: 'X', eventTypes: ['teleported'] }).expect(422);
    await manager.post(`/api/stations/${station.id}/tokens`, { name: 'X', eventTypes: [] }).expect(422);
  });
});

describe('POST /api/stations/:id/tokens/:tokenId/revoke', () => {
  it('makes the token answer 401 at once', async () => {
    const station = await createStation(t);
    const made = await manager.post(`/api/stations/${station.id}/tokens`, { name: 'Gauge', eventTypes: ['measured'] }).expect(201);
    await manager.post(`/api/stations/${station.id}/tokens/${made.body.id}/revoke`).expect(200);
    const res = await request(t.app).get('/api/stations').set('Authorization', `Bearer ${made.body.token}`).expect(401);
    expect(res.body.error.code).toBe('token_revoked');
  });

  it('refuses tokens of a deactivated station with 401', async () => {
    const station = await createStation(t);
    const made = await manager.post(`/api/stations/${station.id}/tokens`, { name: 'Saw', eventTypes: ['cut'] }).expect(201);
    await manager.patch(`/api/stations/${station.id}`, { active: false }).expect(200);
    const res = await request(t.app).get('/api/stations').set('Authorization', `Bearer ${made.body.token}`).expect(401);
    expect(res.body.error.code).toBe('station_inactive');
  });

  it('answers 401 for a made-up token', async () => {
    const res = await request(t.app).get('/api/stations').set('Authorization', 'Bearer hmi_madeup').expect(401);
    expect(res.body.error.code).toBe('bad_token');
  });
});
