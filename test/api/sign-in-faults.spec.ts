import request from 'supertest';
import { DEMO } from '../../seeds/demo';
import { safeReturnTo } from '../../apps/server/src/auth/auth.routes';
import { testApp, type TestApp } from '../support/app';
import { signIn } from '../support/identity';
import { capturingLogger } from '../support/logs';

// Each sign-in runs argon2 at the provider; with two workers a file's set-up takes a few seconds.
jest.setTimeout(30_000);

const logged = (lines: Array<Record<string, unknown>>, text: RegExp) => lines.some((l) => text.test(String(l['msg'])));

describe('sign-in faults: each gets a clear answer, a log line and no crash', () => {
  let t: TestApp;
  const { logger, lines } = capturingLogger();
  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true, logger });
  });
  afterAll(() => t.close());

  it('answers a callback with no sign-in in progress (missing state) with a page, or JSON when asked', async () => {
    const page = await request(t.app).get('/api/auth/callback?code=abc&state=def');
    expect(page.status).toBe(400);
    expect(page.headers['content-type']).toMatch(/text\/html/);
    expect(page.text).toContain('This sign-in has expired');
    expect(page.text).toContain('href="/api/auth/login"');
    const json = await request(t.app).get('/api/auth/callback').set('Accept', 'application/json');
    expect(json.status).toBe(400);
    expect(json.body.error.code).toBe('sign_in_expired');
    expect(logged(lines, /callback without a live sign-in/)).toBe(true);
  });

  it('refuses a replayed callback: the same code and state work once only', async () => {
    const api = request.agent(t.app);
    const steps = await signIn(api, t.identity!, DEMO.users.principal.email);
    expect(steps.callback?.status).toBe(302);
    const replay = await api.get(steps.callbackPath!).set('Accept', 'application/json');
    expect(replay.status).toBe(400);
    expect(replay.body.error.code).toBe('sign_in_expired');
    const elsewhere = await request(t.app).get(steps.callbackPath!).set('Accept', 'application/json');
    expect(elsewhere.status).toBe(400);
  });

  it('refuses a callback whose state does not match the sign-in this browser started, and uses that sign-in up', async () => {
    const api = request.agent(t.app);
    const steps = await signIn(api, t.identity!, DEMO.users.principal.email, { followCallback: false });
    const tampered = steps.callbackPath!.replace(/state=[^&]+/, 'state=forged-state-value');
    const res = await api.get(tampered).set('Accept', 'application/json');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('sign_in_failed');
    expect(logged(lines, /state that does not match/)).toBe(true);
    // The genuine callback is now refused too: a failed attempt cannot be retried with a guessed state.
    expect((await api.get(steps.callbackPath!)).status).toBe(400);
    expect((await api.get('/api/me')).status).toBe(401);
  });

  it("refuses a callback carried into another browser's sign-in (login CSRF)", async () => {
    const victim = request.agent(t.app);
    await victim.get('/api/auth/login');
    const attacker = request.agent(t.app);
    const steps = await signIn(attacker, t.identity!, DEMO.users.engineerB.email, { followCallback: false });
    const res = await victim.get(steps.callbackPath!).set('Accept', 'application/json');
    expect(res.status).toBe(400);
    expect((await victim.get('/api/me')).status).toBe(401);
  });

  it('explains a sign-in cancelled at the provider', async () => {
    const api = request.agent(t.app);
    const start = await api.get('/api/auth/login');
    const idp = request.agent(t.identity!.issuer);
    const loc = new URL(start.headers['location']);
    const interaction = String((await idp.get(loc.pathname + loc.search)).headers['location']);
    let res = await idp.get(`${interaction}/abort`);
    while ([302, 303].includes(res.status) && !String(res.headers['location']).startsWith('http://127.0.0.1:4310')) {
      const next = new URL(res.headers['location'], t.identity!.issuer);
      res = await idp.get(next.pathname + next.search);
    }
    const back = new URL(res.headers['location']);
    const page = await api.get(back.pathname + back.search);
    expect(page.status).toBe(400);
    expect(page.text).toContain('Sign-in was not completed');
  });

  it('answers an idle-expired session with 401 session_expired', async () => {
    const api = request.agent(t.app);
    await signIn(api, t.identity!, DEMO.users.engineerA.email);
    expect((await api.get('/api/me')).status).toBe(200);
    await t
      .db('sessions')
      .whereRaw(`(sess::jsonb -> 'auth') ->> 'userId' = ?`, [DEMO.users.engineerA.id])
      .update({ expire: new Date(Date.now() - 1000) });
    await t.settled();
    const res = await api.get('/api/me');
    expect(res.status).toBe(401);
    expect(res.body.error).toMatchObject({
      code: 'session_expired',
      message: 'Your session has ended. Sign in again.',
    });
  });

  it('ends a session past its absolute limit even while it is in use', async () => {
    const api = request.agent(t.app);
    await signIn(api, t.identity!, DEMO.users.fenwickContact.email);
    const rows = await t
      .db('sessions')
      .whereRaw(`(sess::jsonb -> 'auth') ->> 'userId' = ?`, [DEMO.users.fenwickContact.id])
      .select('sid', 'sess');
    expect(rows).toHaveLength(1);
    const sess = typeof rows[0].sess === 'string' ? JSON.parse(rows[0].sess) : rows[0].sess;
    sess.auth.signedInAt = Date.now() - 13 * 3_600_000; // the default limit is 12 hours
    await t
      .db('sessions')
      .where({ sid: rows[0].sid })
      .update({ sess: JSON.stringify(sess) });
    await t.settled();
    const res = await api.get('/api/projects');
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('session_expired');
    expect(await t.db('sessions').where({ sid: rows[0].sid }).first()).toBeUndefined();
    expect(logged(lines, /absolute limit/)).toBe(true);
  });

  it('treats a tampered session cookie as no session', async () => {
    const api = request.agent(t.app);
    const steps = await signIn(api, t.identity!, DEMO.users.principal.email);
    const sid = ([] as string[])
      .concat(steps.callback!.headers['set-cookie'])
      .find((c) => c.startsWith('trabeate.sid='))!
      .split(';')[0];
    const forged = sid.slice(0, -3) + (sid.endsWith('AAA') ? 'BBB' : 'AAA');
    const res = await request(t.app).get('/api/me').set('Cookie', forged);
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('session_expired');
    const genuine = await request(t.app).get('/api/me').set('Cookie', sid);
    expect(genuine.status).toBe(200);
  });

  it('refuses someone whose access was removed, as soon as the database says so (a change made elsewhere)', async () => {
    const api = request.agent(t.app);
    await signIn(api, t.identity!, DEMO.users.engineerB.email);
    expect((await api.get('/api/projects')).status).toBe(200);
    await t.db('users').where({ id: DEMO.users.engineerB.id }).update({ disabled_at: new Date() });
    await t.settled();
    const res = await api.get('/api/projects');
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('no_access');
    await t.db('users').where({ id: DEMO.users.engineerB.id }).update({ disabled_at: null });
  });

  it('only ever returns to a path on our own origin after sign-in', async () => {
    expect(safeReturnTo('/projects/x?tab=drawings#rev')).toBe('/projects/x?tab=drawings#rev');
    for (const hostile of [
      '//evil.example/x',
      'https://evil.example/',
      '/\\evil.example',
      'javascript:alert(1)',
      '',
      undefined,
      '/%0d%0aLocation:x',
      'x'.repeat(3000),
    ]) {
      expect(safeReturnTo(hostile)).toMatch(/^\/(?!\/)/);
      expect(safeReturnTo(hostile)).not.toContain('evil');
    }
    const api = request.agent(t.app);
    const steps = await signIn(api, t.identity!, DEMO.users.principal.email, { returnTo: '//evil.example/steal' });
    expect(steps.callback?.headers['location']).toBe('/');
  });
});

describe('sign-in when the provider is down', () => {
  it('answers the login with 503 and a page when the provider cannot be reached, and logs it', async () => {
    const { logger, lines } = capturingLogger();
    const t = await testApp({
      logger,
      config: {
        OIDC_ISSUER: 'http://127.0.0.1:9',
        OIDC_CLIENT_ID: 'x',
        OIDC_CLIENT_SECRET: 'y',
        OIDC_ALLOW_INSECURE_HTTP: true,
      },
    });
    try {
      const page = await request(t.app).get('/api/auth/login');
      expect(page.status).toBe(503);
      expect(page.text).toContain('The sign-in service is not answering');
      const json = await request(t.app).get('/api/auth/login').set('Accept', 'application/json');
      expect(json.body.error.code).toBe('identity_provider_unavailable');
      expect(logged(lines, /discovery failed/)).toBe(true);
      expect((await request(t.app).get('/api/health')).status).toBe(200);
    } finally {
      await t.close();
    }
  });

  it('answers the callback with 503 when the provider goes down between the sign-in page and the code exchange', async () => {
    const t = await testApp({ seed: true, identity: true });
    try {
      const api = request.agent(t.app);
      const steps = await signIn(api, t.identity!, DEMO.users.principal.email, { followCallback: false });
      await t.identity!.stop();
      const res = await api.get(steps.callbackPath!);
      expect(res.status).toBe(503);
      expect(res.text).toContain('The sign-in service is not answering');
      expect((await api.get('/api/me')).status).toBe(401);
    } finally {
      await t.close().catch(() => undefined);
    }
  });

  it('answers 503 when sign-in is not configured at all', async () => {
    const t = await testApp();
    try {
      const res = await request(t.app).get('/api/auth/login').set('Accept', 'application/json');
      expect(res.status).toBe(503);
      expect(res.body.error.code).toBe('service_unavailable');
    } finally {
      await t.close();
    }
  });
});

describe('sign-in rate limit', () => {
  it('answers 429 once an address has started too many sign-ins, counted in PostgreSQL', async () => {
    const t = await testApp({ seed: true, identity: true, config: { SIGN_IN_RATE_LIMIT: 3 } });
    try {
      for (let i = 0; i < 3; i++) expect((await request(t.app).get('/api/auth/login')).status).toBe(302);
      const res = await request(t.app).get('/api/auth/login').set('Accept', 'application/json');
      expect(res.status).toBe(429);
      expect(res.body.error.code).toBe('too_many_requests');
      const [{ hits }] = await t.db('rate_limits').select('hits');
      expect(hits).toBe(4);
    } finally {
      await t.close();
    }
  });
});
