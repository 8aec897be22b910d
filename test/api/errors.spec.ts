import request from 'supertest';
import { testApp, type TestApp } from '../support/app';

describe('API errors', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await testApp();
  });
  afterAll(() => t.close());

  it('answers an unknown API route with 404 in the error shape', async () => {
    const res = await request(t.app).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body).toEqual({
      error: { code: 'not_found', message: 'No API route for GET /api/no-such-thing', requestId: expect.any(String) },
    });
  });

  it('answers malformed JSON with 400 and no stack trace', async () => {
    const res = await request(t.app).post('/api/health').set('Content-Type', 'application/json').send('{"span": ');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('malformed_json');
    expect(JSON.stringify(res.body)).not.toMatch(/at .*\.(ts|js):\d+/);
  });

  it('answers a body over the limit with 413', async () => {
    const big = JSON.stringify({ blob: 'x'.repeat(1_100_000) });
    const res = await request(t.app).post('/api/health').set('Content-Type', 'application/json').send(big);
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('payload_too_large');
  });
});

describe('the core schema', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await testApp({ seed: true });
  });
  afterAll(() => t.close());

  it('holds the demo firm, its people, clients and projects', async () => {
    const counts = await Promise.all(
      ['firms', 'users', 'client_organisations', 'projects'].map(async (table) =>
        Number((await t.db(table).count({ n: '*' }))[0].n),
      ),
    );
    expect(counts).toEqual([1, 5, 2, 2]);
  });

  it('refuses a person who is both in the firm and a client contact', async () => {
    const firm = await t.db('firms').first();
    const org = await t.db('client_organisations').first();
    await expect(
      t.db('users').insert({
        firm_id: firm.id,
        email: 'x@example.test',
        display_name: 'X',
        firm_role: 'engineer',
        client_organisation_id: org.id,
      }),
    ).rejects.toThrow(/users_one_kind/);
  });

  it('keeps project references unique within a firm', async () => {
    const p = await t.db('projects').first();
    const { id: _id, created_at: _c, updated_at: _u, ...rest } = p;
    await expect(t.db('projects').insert({ ...rest, name: 'Copy' })).rejects.toThrow(/unique/);
  });
});
