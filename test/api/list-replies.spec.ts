import type TestAgent from 'supertest/lib/agent';
import type { ChangeFeed } from '../../apps/server/src/core/change-feed';
import { ReplyCache } from '../../apps/server/src/core/reply-cache';
import { DEMO } from '../../seeds/demo';
import { testApp, type TestApp } from '../support/app';
import { send, signedInAs, until } from '../support/agents';

jest.setTimeout(60_000);

const KESTREL = DEMO.projects.kestrel.id;
const LIST = '/api/projects?page=1&pageSize=25&sort=name&direction=asc&status=active';

describe('projects list replies kept until the firm’s lists change', () => {
  let t: TestApp;
  let principal: TestAgent;
  let engineer: TestAgent;
  /** List queries the app sent to PostgreSQL since the last reset. */
  let listQueries = 0;
  const countQuery = (q: { sql: string }) => {
    if (q.sql.includes('total_count')) listQueries++;
  };
  const nameOf = async (api: TestAgent, id: string) => {
    const res = await api.get(LIST);
    expect(res.status).toBe(200);
    return (res.body.items as Array<{ id: string; name: string }>).find((p) => p.id === id)?.name;
  };

  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true });
    principal = await signedInAs(t, DEMO.users.principal.email);
    engineer = await signedInAs(t, DEMO.users.engineerB.email);
    t.db.on('query', countQuery);
  });
  afterAll(async () => {
    t.db.removeListener('query', countQuery);
    await t.close();
  });

  it('answers the same list again without reading the database', async () => {
    await until('the change feed listening', async () => t.changes!.live());
    await principal.get(LIST);
    listQueries = 0;
    const again = await principal.get(LIST);
    const third = await principal.get(LIST);
    expect(listQueries).toBe(0);
    expect(again.headers['content-type']).toMatch(/application\/json/);
    expect(third.body).toEqual(again.body);
    expect(again.body.items.length).toBeGreaterThan(0);
  });

  it('shows a change made through this API at once, to the person who made it', async () => {
    await principal.get(LIST);
    const res = await send(principal, 'patch', `/api/projects/${KESTREL}`, { name: 'Kestrel Yard (renamed here)' });
    expect(res.status).toBe(200);
    expect(await nameOf(principal, KESTREL)).toBe('Kestrel Yard (renamed here)');
  });

  it('shows a change another process made once the database’s notice arrives', async () => {
    await principal.get(LIST);
    // Written apart from the app, as a second API process or a script would.
    await t.db('projects').where({ id: KESTREL }).update({ name: 'Kestrel Yard (renamed elsewhere)' });
    await until(
      'the notice',
      async () => (await nameOf(principal, KESTREL)) === 'Kestrel Yard (renamed elsewhere)',
      5000,
    );
    expect(await nameOf(principal, KESTREL)).toBe('Kestrel Yard (renamed elsewhere)');
  });

  it('keeps each person’s list apart: an engineer never gets the principal’s', async () => {
    const all = (await principal.get(LIST)).body.items as Array<{ id: string }>;
    const mine = (await engineer.get(LIST)).body.items as Array<{ id: string }>;
    const members = await t.db('project_members').where({ user_id: DEMO.users.engineerB.id }).pluck('project_id');
    expect(mine.map((p) => p.id).sort()).toEqual(
      all
        .map((p) => p.id)
        .filter((id) => members.includes(id))
        .sort(),
    );
    // Taken off a project (by another process): it leaves that engineer's list.
    await t.db('project_members').where({ user_id: DEMO.users.engineerB.id, project_id: members[0] }).del();
    await until(
      'the notice',
      async () => {
        const now = (await engineer.get(LIST)).body.items as Array<{ id: string }>;
        return !now.some((p) => p.id === members[0]);
      },
      5000,
    );
  });

  it('keeps nothing while the feed is not listening, and catches up when it listens again', async () => {
    await t.db.raw(
      `select pg_terminate_backend(pid) from pg_stat_activity where application_name = 'trabeate change feed'`,
    );
    await until('the feed to notice its loss', async () => !t.changes!.live(), 5000);
    await t.db('projects').where({ id: KESTREL }).update({ name: 'Kestrel Yard (renamed while deaf)' });
    listQueries = 0;
    expect(await nameOf(principal, KESTREL)).toBe('Kestrel Yard (renamed while deaf)');
    await principal.get(LIST);
    expect(listQueries).toBe(2);
    await until('the feed listening again', async () => t.changes!.live(), 10_000);
    expect(await nameOf(principal, KESTREL)).toBe('Kestrel Yard (renamed while deaf)');
  });
});

describe('ReplyCache', () => {
  /** A feed whose numbers move only when the test says so. */
  const feed = () => {
    let n = 0;
    let live = true;
    const f: ChangeFeed & { bump(): void; deafen(): void } = {
      live: () => live,
      generation: () => String(n),
      changed: () => void n++,
      close: async () => undefined,
      bump: () => void n++,
      deafen: () => void (live = false),
    };
    return f;
  };

  it('never serves a reply whose queries overlapped a change (kept under the number read before them)', () => {
    const f = feed();
    const cache = new ReplyCache(f, { maxEntries: 10, maxAgeMs: 60_000 });
    const before = cache.start('firm');
    f.bump(); // a change commits while the reply is being made
    cache.keep('firm', 'list', before, '{"stale":true}');
    expect(cache.get('firm', 'list')).toBeUndefined();
    const now = cache.start('firm');
    cache.keep('firm', 'list', now, '{"fresh":true}');
    expect(cache.get('firm', 'list')).toBe('{"fresh":true}');
  });

  it('makes a reply again after its age limit, drops the oldest past its size, and keeps nothing when deaf', () => {
    const f = feed();
    let clock = 1_000_000;
    const now = jest.spyOn(Date, 'now').mockImplementation(() => clock);
    try {
      const cache = new ReplyCache(f, { maxEntries: 2, maxAgeMs: 60_000 });
      cache.keep('firm', 'a', cache.start('firm'), 'A');
      clock += 60_001;
      expect(cache.get('firm', 'a')).toBeUndefined();
      cache.keep('firm', 'a', cache.start('firm'), 'A');
      cache.keep('firm', 'b', cache.start('firm'), 'B');
      cache.keep('firm', 'c', cache.start('firm'), 'C');
      expect([cache.get('firm', 'a'), cache.get('firm', 'b'), cache.get('firm', 'c')]).toEqual([undefined, 'B', 'C']);
      f.deafen();
      expect(cache.get('firm', 'b')).toBeUndefined();
      expect(cache.start('firm')).toBeUndefined();
    } finally {
      now.mockRestore();
    }
  });
});
