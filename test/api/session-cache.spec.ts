import { createHash } from 'node:crypto';
import type { Knex } from 'knex';
import type TestAgent from 'supertest/lib/agent';
import type { SessionWithCaller } from '../../apps/server/src/auth/caller.repository';
import { EVERY_SESSION_KEY, SessionCache, sessionBucket } from '../../apps/server/src/auth/session-cache';
import type { ChangeFeed } from '../../apps/server/src/core/change-feed';
import { DEMO } from '../../seeds/demo';
import { send, signedInAs } from '../support/agents';
import { testApp, type TestApp } from '../support/app';

/** A feed whose notices the test sends by hand. */
function handFeed() {
  const generations = new Map<string, number>();
  let live = true;
  const feed: ChangeFeed = {
    live: () => live,
    generation: (key) => String(generations.get(key) ?? 0),
    changed: (key) => void generations.set(key, (generations.get(key) ?? 0) + 1),
    close: async () => undefined,
  };
  return { feed, setLive: (v: boolean) => (live = v) };
}

const row = (minutes = 60): SessionWithCaller => ({
  sess: { auth: { userId: 'u1', signedInAt: Date.now() } },
  caller: null,
  expiresAt: Date.now() + minutes * 60_000,
});

describe('SessionCache', () => {
  it("names a session's bucket as the trigger does: 'session:' and md5's first two hex digits", () => {
    // The digest computed apart, as PostgreSQL's left(md5(sid), 2) gives it.
    const sid = 'abc';
    expect(sessionBucket(sid)).toBe(`session:${createHash('md5').update(sid).digest('hex').slice(0, 2)}`);
    expect(sessionBucket(sid)).toBe('session:90'); // md5('abc') = 900150983cd24fb0d6963f7d28e17f72 (RFC 1321, A.5)
  });

  it("serves a kept row until its bucket's or everyone's notice, and drops it then", () => {
    const { feed } = handFeed();
    const cache = new SessionCache(feed, { maxEntries: 10, maxAgeMs: 60_000 });
    const value = row();
    cache.keep('s1', cache.start('s1'), value);
    expect(cache.get('s1')).toBe(value);
    feed.changed(sessionBucket('s1'));
    expect(cache.get('s1')).toBeUndefined();
    cache.keep('s1', cache.start('s1'), row());
    expect(cache.get('s1')).toBeDefined();
    feed.changed(EVERY_SESSION_KEY);
    expect(cache.get('s1')).toBeUndefined();
  });

  it('never keeps a row read while a change to it was on its way (the number moved during the query)', () => {
    const { feed } = handFeed();
    const cache = new SessionCache(feed, { maxEntries: 10, maxAgeMs: 60_000 });
    const started = cache.start('s1');
    feed.changed(sessionBucket('s1')); // committed while the query ran
    cache.keep('s1', started, row());
    expect(cache.get('s1')).toBeUndefined();
  });

  it('serves nothing while the feed is not listening, and keeps nothing', () => {
    const { feed, setLive } = handFeed();
    const cache = new SessionCache(feed, { maxEntries: 10, maxAgeMs: 60_000 });
    cache.keep('s1', cache.start('s1'), row());
    setLive(false);
    expect(cache.get('s1')).toBeUndefined();
    expect(cache.start('s2')).toBeUndefined();
    cache.keep('s2', { bucket: sessionBucket('s2'), generation: '0/0' }, row());
    setLive(true);
    expect(cache.get('s2')).toBeUndefined();
  });

  it('never serves a row past its expiry, nor one kept longer than maxAgeMs', () => {
    const { feed } = handFeed();
    const cache = new SessionCache(feed, { maxEntries: 10, maxAgeMs: 50 });
    cache.keep('ended', cache.start('ended'), row(-1));
    expect(cache.get('ended')).toBeUndefined();
    const now = Date.now();
    const clock = jest.spyOn(Date, 'now');
    try {
      clock.mockReturnValue(now);
      cache.keep('s1', cache.start('s1'), row());
      clock.mockReturnValue(now + 49);
      expect(cache.get('s1')).toBeDefined();
      clock.mockReturnValue(now + 51);
      expect(cache.get('s1')).toBeUndefined();
    } finally {
      clock.mockRestore();
    }
  });

  it('keeps at most maxEntries (the oldest go first), forgets on request, and freezes what it keeps', () => {
    const { feed } = handFeed();
    const cache = new SessionCache(feed, { maxEntries: 2, maxAgeMs: 60_000 });
    for (const sid of ['a', 'b', 'c']) cache.keep(sid, cache.start(sid), row());
    expect(cache.size).toBe(2);
    expect(cache.get('a')).toBeUndefined();
    expect(cache.get('c')).toBeDefined();
    cache.forget('c');
    expect(cache.get('c')).toBeUndefined();
    const kept = cache.get('b')!;
    expect(() => {
      (kept.sess as { auth: { userId: string } }).auth.userId = 'someone else';
    }).toThrow(TypeError);
  });
});

/** The statements sent through the app's database while `fn` runs that read sessions (or any, with `all`). */
async function sessionQueries(t: TestApp, fn: () => Promise<unknown>, all = false): Promise<number> {
  let n = 0;
  const onQuery = (q: Knex.Sql) => {
    if (all || /from sessions s/.test(q.sql)) n++;
  };
  t.db.on('query', onQuery);
  try {
    await fn();
  } finally {
    t.db.off('query', onQuery);
  }
  return n;
}

describe('kept sessions in the app (a live change feed, as main.ts runs it)', () => {
  let t: TestApp;
  let principal: TestAgent;
  let engineer: TestAgent;
  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true });
    principal = await signedInAs(t, DEMO.users.principal.email);
    engineer = await signedInAs(t, DEMO.users.engineerA.email);
  });
  afterAll(() => t.close());

  it('reads a signed-in session from the database once, then answers from what it kept', async () => {
    await principal.get('/api/me');
    const n = await sessionQueries(
      t,
      async () => {
        for (let i = 0; i < 5; i++) expect((await principal.get('/api/me')).status).toBe(200);
      },
      true,
    );
    // No statement at all: the firm's names and date settings come with the kept caller.
    expect(n).toBe(0);
  });

  it("sees the firm's date settings changed elsewhere once the notice arrives", async () => {
    const firmId = DEMO.firm.id;
    const before = await t.db('firms').where({ id: firmId }).first('date_locale', 'time_zone');
    expect((await principal.get('/api/me')).body.firm).toMatchObject({ timeZone: before.time_zone });
    await t.db('firms').where({ id: firmId }).update({ date_locale: 'en-IN', time_zone: 'Asia/Kolkata' });
    try {
      await t.settled();
      expect((await principal.get('/api/me')).body.firm).toMatchObject({
        dateLocale: 'en-IN',
        timeZone: 'Asia/Kolkata',
      });
    } finally {
      await t.db('firms').where({ id: firmId }).update(before);
      await t.settled();
    }
  });

  it('sees a sign-out made by another process (its row deleted) once the notice arrives', async () => {
    const other = await signedInAs(t, DEMO.users.engineerB.email);
    expect((await other.get('/api/me')).status).toBe(200);
    await t.db('sessions').whereRaw(`(sess::jsonb -> 'auth') ->> 'userId' = ?`, [DEMO.users.engineerB.id]).del();
    await t.settled();
    const res = await other.get('/api/me');
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('session_expired');
  });

  it("sees a person's new name and role changed elsewhere once the notice arrives", async () => {
    expect((await engineer.get('/api/me')).body.user.displayName).not.toBe('Renamed Elsewhere');
    const before = await t.db('users').where({ id: DEMO.users.engineerA.id }).first('display_name');
    await t.db('users').where({ id: DEMO.users.engineerA.id }).update({ display_name: 'Renamed Elsewhere' });
    try {
      await t.settled();
      expect((await engineer.get('/api/me')).body.user.displayName).toBe('Renamed Elsewhere');
    } finally {
      await t.db('users').where({ id: DEMO.users.engineerA.id }).update({ display_name: before.display_name });
      await t.settled();
    }
  });

  it('reads every session again after a change request through this process, before any notice', async () => {
    await engineer.get('/api/me'); // kept
    expect(await sessionQueries(t, () => engineer.get('/api/me'))).toBe(0);
    const res = await send(principal, 'patch', `/api/people/${DEMO.users.engineerA.id}`, { role: 'engineer' });
    expect(res.status).toBeLessThan(500);
    // The change request may have changed a person, a role or a name any session carries.
    expect(await sessionQueries(t, () => engineer.get('/api/me'))).toBe(1);
  });

  it('keeps nothing while the feed is not listening: every read queries', async () => {
    const feedPids = await t.db.raw(
      `select pid from pg_stat_activity where application_name = 'trabeate change feed' and datname = current_database()`,
    );
    expect(feedPids.rows.length).toBeGreaterThan(0);
    await t.db.raw(
      `select pg_terminate_backend(pid) from pg_stat_activity where application_name = 'trabeate change feed' and datname = current_database()`,
    );
    const end = Date.now() + 5000;
    while (t.changes!.live() && Date.now() < end) await new Promise((r) => setTimeout(r, 10));
    expect(t.changes!.live()).toBe(false);
    const n = await sessionQueries(t, async () => {
      for (let i = 0; i < 3; i++) expect((await principal.get('/api/me')).status).toBe(200);
    });
    expect(n).toBe(3);
    // Back after the reconnect (ChangeFeed retries every second).
    const back = Date.now() + 10_000;
    while (!t.changes!.live() && Date.now() < back) await new Promise((r) => setTimeout(r, 50));
    expect(t.changes!.live()).toBe(true);
  });
});
