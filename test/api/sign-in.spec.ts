import request from 'supertest';
import { logoutResponseSchema, meSchema, type Role } from '@trabeate/contracts';
import { DEMO } from '../../seeds/demo';
import { testApp, type TestApp } from '../support/app';
import { signIn, xsrfToken } from '../support/identity';

// Each sign-in runs argon2 at the provider; with two workers a file's set-up takes a few seconds.
jest.setTimeout(30_000);

interface Case {
  role: Role;
  user: { id: string; email: string; name: string };
  org: { id: string; name: string } | null;
}
const CASES: Case[] = [
  { role: 'principal', user: DEMO.users.principal, org: null },
  { role: 'engineer', user: DEMO.users.engineerA, org: null },
  { role: 'engineer', user: DEMO.users.engineerB, org: null },
  { role: 'client', user: DEMO.users.fenwickContact, org: DEMO.clients.fenwick },
  { role: 'client', user: DEMO.users.harbourlightContact, org: DEMO.clients.harbourlight },
];

const cookieNamed = (res: request.Response, name: string) =>
  ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((c) => c.startsWith(`${name}=`));

describe('signing in through the local identity provider', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true });
  });
  afterAll(() => t.close());

  it.each(CASES.map((c) => [c.role, c.user.email, c] as const))(
    'a %s (%s) signs in and /api/me names them and their role',
    async (_r, _e, c) => {
      const api = request.agent(t.app);
      const steps = await signIn(api, t.identity!, c.user.email, { returnTo: '/projects' });
      expect(steps.callback?.status).toBe(302);
      expect(steps.callback?.headers['location']).toBe('/projects');
      const me = await api.get('/api/me');
      expect(me.status).toBe(200);
      expect(meSchema.parse(me.body)).toMatchObject({
        access: 'granted',
        user: { id: c.user.id, email: c.user.email, displayName: c.user.name, role: c.role, clientOrganisation: c.org },
        firm: { id: DEMO.firm.id, name: DEMO.firm.name },
      });
      const bound = await t.db('users').where({ id: c.user.id }).first('oidc_subject', 'last_signed_in_at');
      expect(bound.oidc_subject).toEqual(expect.any(String));
      expect(bound.last_signed_in_at).not.toBeNull();
    },
  );

  it('sends the browser to the provider with PKCE (S256), state and nonce', async () => {
    const res = await request(t.app).get('/api/auth/login');
    expect(res.status).toBe(302);
    const url = new URL(res.headers['location']);
    expect(url.origin).toBe(t.identity!.issuer);
    for (const p of ['state', 'nonce', 'code_challenge'])
      expect(url.searchParams.get(p)?.length).toBeGreaterThanOrEqual(32);
    expect(url.searchParams.get('code_challenge_method')).toBe('S256');
    expect(url.searchParams.get('scope')).toBe('openid email profile');
  });

  it('gives a new session id at sign-in, in an httpOnly SameSite=Lax cookie, and a readable XSRF-TOKEN', async () => {
    const api = request.agent(t.app);
    const steps = await signIn(api, t.identity!, DEMO.users.principal.email);
    const before = cookieNamed(steps.start, 'trabeate.sid');
    const after = cookieNamed(steps.callback!, 'trabeate.sid');
    expect(before).toBeDefined();
    expect(after).toBeDefined();
    expect(after!.split(';')[0]).not.toBe(before!.split(';')[0]);
    expect(after).toMatch(/HttpOnly/i);
    expect(after).toMatch(/SameSite=Lax/i);
    expect(after).not.toMatch(/Secure/i); // the test PUBLIC_URL is http; https turns Secure on
    const xsrf = cookieNamed(steps.callback!, 'XSRF-TOKEN');
    expect(xsrf).toBeDefined();
    expect(xsrf).not.toMatch(/HttpOnly/i);
  });

  it('keeps a valid XSRF-TOKEN on later /api/me calls, and replaces a missing or tampered one', async () => {
    const api = request.agent(t.app);
    const steps = await signIn(api, t.identity!, DEMO.users.principal.email);
    const issued = cookieNamed(steps.callback!, 'XSRF-TOKEN')!.split(';')[0];
    const again = await api.get('/api/me');
    expect(again.status).toBe(200);
    expect(cookieNamed(again, 'XSRF-TOKEN')).toBeUndefined();
    const token = decodeURIComponent(issued.slice('XSRF-TOKEN='.length));
    expect(xsrfToken(api)).toBe(token);

    const session = cookieNamed(steps.callback!, 'trabeate.sid')!.split(';')[0];
    const tampered = await request(t.app)
      .get('/api/me')
      .set('Cookie', `${session}; XSRF-TOKEN=${encodeURIComponent(`${'0'.repeat(64)}.${token.split('.')[1]}`)}`);
    const replaced = cookieNamed(tampered, 'XSRF-TOKEN');
    expect(replaced).toBeDefined();
    expect(replaced!.split(';')[0]).not.toBe(issued);
    const missing = await request(t.app).get('/api/me').set('Cookie', session);
    expect(cookieNamed(missing, 'XSRF-TOKEN')).toBeDefined();
    // The kept token still lets a change through.
    expect((await api.post('/api/auth/logout').set('X-XSRF-TOKEN', token)).status).toBe(200);
  });

  it('keeps the sign-in page on its own origin with labelled fields, and refuses a wrong password with a message', async () => {
    const api = request.agent(t.app);
    const steps = await signIn(api, t.identity!, DEMO.users.principal.email, { password: 'not-the-password' });
    expect(steps.loginPage.text).toMatch(/<label for="email">/);
    expect(steps.loginPage.text).toMatch(/<label for="password">/);
    expect(steps.loginPage.text).not.toMatch(/https?:\/\/(?!127\.0\.0\.1)/);
    expect(steps.loginPage.headers['content-security-policy']).toContain("default-src 'none'");
    expect(steps.afterPassword.status).toBe(401);
    expect(steps.afterPassword.text).toContain('That e-mail address and password do not match.');
    expect(steps.callbackPath).toBeNull();
    expect((await api.get('/api/me')).status).toBe(401);
  });

  it('refuses the sign-in form without its CSRF token', async () => {
    const api = request.agent(t.app);
    const start = await api.get('/api/auth/login');
    const idp = request.agent(t.identity!.issuer);
    const auth = await idp.get(new URL(start.headers['location']).pathname + new URL(start.headers['location']).search);
    const interaction = String(auth.headers['location']);
    const res = await idp
      .post(`${interaction}/login`)
      .type('form')
      .send({ email: DEMO.users.principal.email, password: 'x', csrf: 'forged' });
    expect(res.status).toBe(403);
    expect(res.text).toContain('Sign-in refused');
  });

  it('answers /api/me for someone the provider knows but the firm never invited with access "none", and other routes with 403 no_access', async () => {
    const api = request.agent(t.app);
    const steps = await signIn(api, t.identity!, 'wren.adebayo@stray.example');
    expect(steps.callback?.status).toBe(302);
    const me = await api.get('/api/me');
    expect(me.status).toBe(200);
    expect(meSchema.parse(me.body)).toEqual({
      access: 'none',
      identity: { email: 'wren.adebayo@stray.example', name: 'Wren Adebayo' },
      message: expect.stringContaining('nobody at the firm has given you access'),
    });
    const projects = await api.get('/api/projects');
    expect(projects.status).toBe(403);
    expect(projects.body.error.code).toBe('no_access');
  });

  it('signs out: ends the Trabeate session and answers with the provider end-session URL', async () => {
    const api = request.agent(t.app);
    const steps = await signIn(api, t.identity!, DEMO.users.engineerA.email);
    await api.get('/api/me');
    const sessionsOf = async () =>
      Number(
        (
          await t
            .db('sessions')
            .whereRaw(`(sess::jsonb -> 'auth') ->> 'userId' = ?`, [DEMO.users.engineerA.id])
            .count({ n: '*' })
        )[0].n,
      );
    const before = await sessionsOf();
    const res = await api.post('/api/auth/logout').set('X-XSRF-TOKEN', xsrfToken(api));
    expect(res.status).toBe(200);
    const { endSessionUrl } = logoutResponseSchema.parse(res.body);
    const url = new URL(endSessionUrl!);
    expect(url.origin).toBe(t.identity!.issuer);
    expect(url.searchParams.get('id_token_hint')).toEqual(expect.any(String));
    expect(url.searchParams.get('post_logout_redirect_uri')).toBe('http://127.0.0.1:4310/');
    expect((await api.get('/api/me')).status).toBe(401);
    expect(await sessionsOf()).toBe(before - 1);

    // The provider's own sign-out page (RP-initiated logout) confirms, then returns to Trabeate.
    const confirm = await steps.idp.get(url.pathname + url.search);
    expect(confirm.status).toBe(200);
    expect(confirm.text).toContain('Sign out of the sign-in service too?');
    const xsrf = /name="xsrf" value="([^"]+)"/.exec(confirm.text)?.[1];
    const action = /<form[^>]*action="([^"]+)"/.exec(confirm.text)?.[1];
    const done = await steps.idp
      .post(new URL(action!, t.identity!.issuer).pathname)
      .type('form')
      .send({ xsrf, logout: 'yes' });
    expect(done.status).toBe(303);
    expect(done.headers['location']).toBe('http://127.0.0.1:4310/');
  });
});
