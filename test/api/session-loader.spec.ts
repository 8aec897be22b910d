import type { Knex } from 'knex';
import { sessionLoader } from '../../apps/server/src/auth/caller.repository';
import type { Db } from '../../apps/server/src/db/db';
import { DEMO } from '../../seeds/demo';
import { testApp, type TestApp } from '../support/app';

/** A session row as the store keeps it, for `userId`, ending `minutes` from now. */
async function addSession(t: TestApp, sid: string, userId: string, minutes = 60) {
  const expires = new Date(Date.now() + minutes * 60_000);
  await t.db('sessions').insert({
    sid,
    sess: JSON.stringify({ cookie: { expires: expires.toISOString() }, auth: { userId, signedInAt: Date.now() } }),
    expire: expires,
  });
}

/** Counts the statements PostgreSQL is sent through `db` while `fn` runs. */
async function statements<T>(db: Db, fn: () => Promise<T>): Promise<{ result: T; sql: string[] }> {
  const sql: string[] = [];
  const onQuery = (q: Knex.Sql) => sql.push(q.sql);
  db.on('query', onQuery);
  try {
    return { result: await fn(), sql };
  } finally {
    db.off('query', onQuery);
  }
}

describe('session lookups under load (sessionLoader)', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await testApp({ seed: true });
    await addSession(t, 'sid-principal', DEMO.users.principal.id);
    await addSession(t, 'sid-client', DEMO.users.fenwickContact.id);
    await addSession(t, 'sid-ended', DEMO.users.principal.id, -1);
  });
  afterAll(() => t.close());

  it('answers lookups asked in the same turn with one statement, each with its own session and person', async () => {
    const loader = sessionLoader(t.db);
    const { result, sql } = await statements(t.db, () =>
      Promise.all(['sid-principal', 'sid-client', 'sid-principal', 'sid-ended', 'sid-unknown'].map(loader.load)),
    );
    expect(sql).toHaveLength(1);
    const [principal, client, again, ended, unknown] = result;
    expect(principal?.caller).toMatchObject({ id: DEMO.users.principal.id, firm_role: 'principal' });
    expect(principal?.caller?.firm_name).toBe(DEMO.firm.name);
    expect(client?.caller).toMatchObject({
      id: DEMO.users.fenwickContact.id,
      firm_role: null,
      client_organisation_id: DEMO.clients.fenwick.id,
    });
    expect(again).toEqual(principal);
    expect(ended).toBeUndefined();
    expect(unknown).toBeUndefined();
  });

  it('reads the person afresh on every lookup: a disabled account is seen at once', async () => {
    const loader = sessionLoader(t.db);
    await addSession(t, 'sid-engineer', DEMO.users.engineerA.id);
    expect((await loader.load('sid-engineer'))?.caller?.id).toBe(DEMO.users.engineerA.id);
    await t.db('users').where({ id: DEMO.users.engineerA.id }).update({ disabled_at: t.db.fn.now() });
    try {
      const found = await loader.load('sid-engineer');
      expect(found?.sess).toBeDefined();
      expect(found?.caller).toBeNull();
    } finally {
      await t.db('users').where({ id: DEMO.users.engineerA.id }).update({ disabled_at: null });
    }
  });

  it('while the allowed number of statements run, gathers later lookups into the next one', async () => {
    const loader = sessionLoader(t.db, { maxInFlight: 1 });
    const { result, sql } = await statements(t.db, async () => {
      const first = loader.load('sid-principal');
      await new Promise((r) => setImmediate(r)); // the first statement is now on its way
      const later = ['sid-client', 'sid-principal', 'sid-client'].map(loader.load);
      return Promise.all([first, ...later]);
    });
    expect(sql).toHaveLength(2);
    expect(result.map((r) => r?.caller?.id)).toEqual([
      DEMO.users.principal.id,
      DEMO.users.fenwickContact.id,
      DEMO.users.principal.id,
      DEMO.users.fenwickContact.id,
    ]);
  });

  it('passes a failed statement to every lookup in it, and the next lookups still work', async () => {
    let calls = 0;
    const flaky = {
      raw: (...args: Parameters<Db['raw']>) =>
        ++calls === 1 ? Promise.reject(new Error('connection reset')) : t.db.raw(...args),
    } as unknown as Db;
    const loader = sessionLoader(flaky);
    const failed = await Promise.allSettled([loader.load('sid-principal'), loader.load('sid-client')]);
    expect(failed.map((r) => r.status)).toEqual(['rejected', 'rejected']);
    expect((await loader.load('sid-client'))?.caller?.id).toBe(DEMO.users.fenwickContact.id);
  });
});
