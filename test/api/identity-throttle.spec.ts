import request from 'supertest';
import { DEMO } from '../../seeds/demo';
import { DEMO_PASSWORD } from '../../seeds/identity';
import { testApp, type TestApp } from '../support/app';
import { startIdentity, type TestIdentity } from '../support/identity';
import { accountKey, waitAfter, type ThrottlePolicy } from '../../apps/identity/src/throttle';

jest.setTimeout(60_000);

// Two free failures, then 30 s, 60 s, 120 s… (long enough that no test waits for one to pass).
const POLICY: ThrottlePolicy = { freeFailures: 2, firstWaitSeconds: 30, maxWaitSeconds: 600, forgetAfterSeconds: 3600 };
const WRONG = 'not-the-password';

/**
 * Opens the provider's password form for a sign-in the API started. `at` may be another provider
 * instance on the same database with the same client settings: it serves the same sign-in.
 */
async function passwordForm(t: TestApp, at: TestIdentity) {
  const start = await request(t.app).get('/api/auth/login');
  const auth = new URL(start.headers['location']);
  const idp = request.agent(at.issuer);
  let res = await idp.get(auth.pathname + auth.search);
  while ([302, 303].includes(res.status)) {
    const next = new URL(res.headers['location'], at.issuer);
    res = await idp.get(next.pathname + next.search);
  }
  const csrf = /name="csrf" value="([^"]+)"/.exec(res.text)?.[1];
  const action = /<form method="post" action="([^"]+)"/.exec(res.text)?.[1];
  if (!csrf || !action) throw new Error(`no password form (${res.status}): ${res.text.slice(0, 200)}`);
  return (email: string, password: string) => idp.post(action).type('form').send({ csrf, email, password });
}

const errorText = (res: request.Response) => /<p class="error"[^>]*>([^<]*)<\/p>/.exec(res.text)?.[1] ?? '';

/** What waiting would do: the wait ends now (the clock moves on, as far as the provider can tell). */
const waitIsOver = (t: TestApp, email: string) =>
  t
    .db('identity_sign_in_failures')
    .where({ account_key: accountKey(email) })
    .update({ wait_until: t.db.raw("now() - interval '1 second'") });

describe('failed passwords at the local identity provider', () => {
  let t: TestApp;
  beforeEach(async () => {
    t = await testApp({ seed: true, identity: { throttle: POLICY } });
  });
  afterEach(() => t.close());

  it('makes each failure past the free ones wait longer, and says on the page how long', async () => {
    expect([1, 2, 3, 4, 5].map((n) => waitAfter(n, POLICY))).toEqual([0, 0, 30, 60, 120]);
    const email = DEMO.users.engineerA.email;
    const post = await passwordForm(t, t.identity!);

    for (let i = 0; i < 2; i++) {
      const res = await post(email, WRONG);
      expect(res.status).toBe(401);
      expect(errorText(res)).toBe('That e-mail address and password do not match.');
      expect(res.headers['retry-after']).toBeUndefined();
    }
    const third = await post(email, WRONG);
    expect(third.status).toBe(401);
    expect(errorText(third)).toMatch(/do not match\. Wait 30 seconds before the next try/);
    expect(third.headers['retry-after']).toBe('30');

    // While waiting, even the right password is not checked.
    const early = await post(email, DEMO_PASSWORD);
    expect(early.status).toBe(429);
    expect(errorText(early)).toMatch(/Wait (29|30) seconds, then try again/);
    expect(Number(early.headers['retry-after'])).toBeGreaterThanOrEqual(29);

    await waitIsOver(t, email);
    const fourth = await post(email, WRONG);
    expect(errorText(fourth)).toMatch(/Wait 1 minute before the next try/);
    await waitIsOver(t, email);
    const fifth = await post(email, WRONG);
    expect(errorText(fifth)).toMatch(/Wait 2 minutes before the next try/);
    expect(fifth.headers['retry-after']).toBe('120');
  });

  it('answers an e-mail address that has no account with the same words and the same waits', async () => {
    const known = await passwordForm(t, t.identity!);
    const unknown = await passwordForm(t, t.identity!);
    for (let i = 0; i < 4; i++) {
      const a = await known(DEMO.users.engineerB.email, WRONG);
      const b = await unknown('nobody.here@stray.example', WRONG);
      expect(b.status).toBe(a.status);
      // the same words; the waits the same to within the second that passes between the two asks
      const seconds = (text: string) => Number(/Wait (\d+) seconds/.exec(text)?.[1] ?? NaN);
      const words = (text: string) => text.replace(/Wait \d+ seconds/, 'Wait N seconds');
      expect(words(errorText(b))).toBe(words(errorText(a)));
      if (/Wait \d+ seconds/.test(errorText(a)))
        expect(Math.abs(seconds(errorText(b)) - seconds(errorText(a)))).toBeLessThanOrEqual(1);
    }
    expect(await t.db('identity_sign_in_failures').count({ n: '*' })).toEqual([{ n: '2' }]);
    // Nothing typed is kept: rows carry a hash of the address, not the address.
    const keys = (await t.db('identity_sign_in_failures').select('account_key')).map((r) => r.account_key);
    expect(keys.join(' ')).not.toMatch(/@/);
  });

  it('shares the count between two provider processes on the same database', async () => {
    const other = await startIdentity(t.db, { throttle: POLICY });
    try {
      const email = DEMO.users.principal.email;
      const here = await passwordForm(t, t.identity!);
      const there = await passwordForm(t, other);
      expect((await here(email, WRONG)).status).toBe(401);
      expect((await there(email, WRONG)).status).toBe(401);
      const third = await here(email, WRONG);
      expect(errorText(third)).toMatch(/Wait 30 seconds/);
      const refusedThere = await there(email, DEMO_PASSWORD);
      expect(refusedThere.status).toBe(429);
      expect(errorText(refusedThere)).toMatch(/Wait \d+ seconds, then try again/);
    } finally {
      await other.stop();
    }
  });

  it('does not count a right password, and forgets earlier failures once one succeeds', async () => {
    const email = DEMO.users.fenwickContact.email;
    const key = accountKey(email);
    const first = await passwordForm(t, t.identity!);
    expect((await first(email, DEMO_PASSWORD)).status).toBe(303);
    expect(await t.db('identity_sign_in_failures').where({ account_key: key }).first()).toBeUndefined();

    const second = await passwordForm(t, t.identity!);
    expect((await second(email, WRONG)).status).toBe(401);
    expect((await second(email, WRONG)).status).toBe(401);
    expect((await second(email, DEMO_PASSWORD)).status).toBe(303);
    expect(await t.db('identity_sign_in_failures').where({ account_key: key }).first()).toBeUndefined();

    // Had the success or the earlier failures counted, this would already be a wait.
    const third = await passwordForm(t, t.identity!);
    for (let i = 0; i < 2; i++) {
      const res = await third(email, WRONG);
      expect(res.status).toBe(401);
      expect(errorText(res)).toBe('That e-mail address and password do not match.');
    }
  });

  it('counts tries sent all at once: once the wait starts, the rest are refused unchecked', async () => {
    const email = DEMO.users.harbourlightContact.email;
    const post = await passwordForm(t, t.identity!);
    const answers = await Promise.all(Array.from({ length: 8 }, () => post(email, WRONG)));
    const statuses = answers.map((a) => a.status).sort();
    expect(statuses).toEqual([401, 401, 401, 429, 429, 429, 429, 429]);
    const row = await t
      .db('identity_sign_in_failures')
      .where({ account_key: accountKey(email) })
      .first('failures');
    expect(row.failures).toBe(3);
  });
});
