import request from 'supertest';
import { DEMO } from '../../seeds/demo';
import { testApp, type TestApp } from '../support/app';
import { signIn } from '../support/identity';

jest.setTimeout(30_000);

const IDLE_MINUTES = 60;
const TOUCH_SECONDS = 300;

/**
 * The session row's version: PostgreSQL gives every written row version a new xmin, so an
 * unchanged xmin proves the row was not updated (not even with the same values).
 */
async function sessionRow(t: TestApp, userId: string) {
  const rows = await t
    .db('sessions')
    .whereRaw(`(sess::jsonb -> 'auth') ->> 'userId' = ?`, [userId])
    .select('sid', 'sess', 'expire', t.db.raw('xmin::text as version'));
  expect(rows).toHaveLength(1);
  const sess = typeof rows[0].sess === 'string' ? JSON.parse(rows[0].sess) : rows[0].sess;
  return { sid: rows[0].sid as string, sess, expire: new Date(rows[0].expire), version: rows[0].version as string };
}

/** As if the last push of the idle expiry happened `seconds` ago. */
async function rewind(t: TestApp, sid: string, sess: { cookie: { expires: string } }, seconds: number) {
  const expires = new Date(Date.now() + IDLE_MINUTES * 60_000 - seconds * 1000);
  await t
    .db('sessions')
    .where({ sid })
    .update({
      sess: JSON.stringify({ ...sess, cookie: { ...sess.cookie, expires: expires.toISOString() } }),
      expire: expires,
    });
  return expires;
}

const sessionCookie = (res: request.Response) =>
  ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((c) => c.startsWith('trabeate.sid='));

describe('sessions on read requests', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await testApp({
      seed: true,
      identity: true,
      config: { SESSION_IDLE_MINUTES: IDLE_MINUTES, SESSION_TOUCH_SECONDS: TOUCH_SECONDS },
    });
  });
  afterAll(() => t.close());

  it('writes nothing to the database while a signed-in person reads', async () => {
    const api = request.agent(t.app);
    await signIn(api, t.identity!, DEMO.users.principal.email);
    const project = DEMO.projects.kestrel.id;
    expect((await api.get('/api/me')).status).toBe(200);
    const before = await sessionRow(t, DEMO.users.principal.id);
    const userBefore = await t.db('users').where({ id: DEMO.users.principal.id }).first(t.db.raw('xmin::text as v'));
    const limitsBefore = await t.db('rate_limits').select('key', 'hits', t.db.raw('xmin::text as v'));

    for (const path of [
      '/api/me',
      '/api/projects?page=1&pageSize=25&sort=name&direction=asc&status=active',
      `/api/projects/${project}`,
      `/api/projects/${project}/full`,
      `/api/projects/${project}/activity`,
      '/api/me',
    ]) {
      const res = await api.get(path);
      expect(res.status).toBe(200);
      expect(sessionCookie(res)).toBeUndefined();
    }

    const after = await sessionRow(t, DEMO.users.principal.id);
    expect(after.version).toBe(before.version);
    expect(after.expire.getTime()).toBe(before.expire.getTime());
    expect(await t.db('users').where({ id: DEMO.users.principal.id }).first(t.db.raw('xmin::text as v'))).toEqual(
      userBefore,
    );
    expect(await t.db('rate_limits').select('key', 'hits', t.db.raw('xmin::text as v'))).toEqual(limitsBefore);
  });

  it('extends the idle expiry, row and cookie, on the first request after the touch interval', async () => {
    const api = request.agent(t.app);
    await signIn(api, t.identity!, DEMO.users.engineerA.email);
    const start = await sessionRow(t, DEMO.users.engineerA.id);

    // Just inside the interval: still no write.
    const recent = await rewind(t, start.sid, start.sess, TOUCH_SECONDS - 30);
    const inside = await sessionRow(t, DEMO.users.engineerA.id);
    const quiet = await api.get('/api/me');
    expect(quiet.status).toBe(200);
    expect(sessionCookie(quiet)).toBeUndefined();
    const still = await sessionRow(t, DEMO.users.engineerA.id);
    expect(still.version).toBe(inside.version);
    expect(still.expire.getTime()).toBe(recent.getTime());

    // Past the interval: one write, and the browser gets the cookie again with the new expiry.
    const stale = await rewind(t, start.sid, start.sess, TOUCH_SECONDS + 30);
    const res = await api.get('/api/projects');
    expect(res.status).toBe(200);
    const cookie = sessionCookie(res);
    expect(cookie).toBeDefined();
    const renewed = await sessionRow(t, DEMO.users.engineerA.id);
    expect(renewed.sid).toBe(start.sid);
    expect(renewed.expire.getTime()).toBeGreaterThan(stale.getTime() + 20_000);
    expect(Math.abs(renewed.expire.getTime() - (Date.now() + IDLE_MINUTES * 60_000))).toBeLessThan(10_000);
    const cookieExpires = new Date(/Expires=([^;]+)/i.exec(cookie!)![1]).getTime();
    expect(Math.abs(cookieExpires - renewed.expire.getTime())).toBeLessThan(2_000);

    // And the next read writes nothing again.
    await api.get('/api/me');
    expect((await sessionRow(t, DEMO.users.engineerA.id)).version).toBe(renewed.version);
  });

  it('still ends a session left idle past its expiry', async () => {
    const api = request.agent(t.app);
    await signIn(api, t.identity!, DEMO.users.engineerB.email);
    const row = await sessionRow(t, DEMO.users.engineerB.id);
    await rewind(t, row.sid, row.sess, IDLE_MINUTES * 60 + 5);
    const res = await api.get('/api/me');
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('session_expired');
  });
});
