import request from 'supertest';
import { DEMO } from '../../seeds/demo';
import { DEFAULT_SIGN_IN_STARTS } from '../../apps/server/src/auth/rate-limit';
import { testApp, type TestApp } from '../support/app';
import { signIn } from '../support/identity';

// Sixty full sign-ins run argon2 sixty times at the provider; on a shared two-core machine that
// takes a while.
jest.setTimeout(180_000);

const PEOPLE = [
  DEMO.users.principal,
  DEMO.users.engineerA,
  DEMO.users.engineerB,
  DEMO.users.fenwickContact,
  DEMO.users.harbourlightContact,
];

/** Runs `n` tasks, `width` at a time. */
async function inBatches<T>(n: number, width: number, task: (i: number) => Promise<T>): Promise<T[]> {
  const out: T[] = [];
  for (let i = 0; i < n; i += width) {
    out.push(...(await Promise.all(Array.from({ length: Math.min(width, n - i) }, (_, j) => task(i + j)))));
  }
  return out;
}

describe('sign-in limits per address, with the production default', () => {
  let t: TestApp;
  beforeEach(async () => {
    // SIGN_IN_RATE_LIMIT left out: the limit under test is the one production runs with.
    t = await testApp({ seed: true, identity: true, config: { SIGN_IN_RATE_LIMIT: undefined } });
  });
  afterEach(() => t.close());

  it('lets an office of 60 people behind one address sign in within a quarter hour; only starts are counted', async () => {
    const answers = await inBatches(60, 4, async (i) => {
      const api = request.agent(t.app);
      const steps = await signIn(api, t.identity!, PEOPLE[i % PEOPLE.length].email);
      const me = await api.get('/api/me');
      return { callback: steps.callback?.status, me: me.status };
    });
    expect(answers.filter((a) => a.callback === 302 && a.me === 200)).toHaveLength(60);
    const [{ hits }] = await t.db('rate_limits').select('hits');
    expect(hits).toBe(60);
  });

  it('answers 429 with Retry-After once one address opens sign-ins at an abusive rate, and still finishes a sign-in already under way', async () => {
    const api = request.agent(t.app);
    const underWay = await signIn(api, t.identity!, DEMO.users.engineerA.email, { followCallback: false });
    const statuses = await inBatches(DEFAULT_SIGN_IN_STARTS - 1, 25, async () =>
      request(t.app)
        .get('/api/auth/login')
        .then((r) => r.status),
    );
    expect(statuses.every((s) => s === 302)).toBe(true);

    const refused = await request(t.app).get('/api/auth/login').set('Accept', 'application/json');
    expect(refused.status).toBe(429);
    expect(refused.body.error.code).toBe('too_many_requests');
    const retryAfter = Number(refused.headers['retry-after']);
    expect(retryAfter).toBeGreaterThan(0);
    expect(retryAfter).toBeLessThanOrEqual(15 * 60);

    const callback = await api.get(underWay.callbackPath!);
    expect(callback.status).toBe(302);
    expect((await api.get('/api/me')).status).toBe(200);
  });
});
