import { createJobs, type Jobs } from '../../apps/server/src/jobs';
import type { Db } from '../../apps/server/src/db/db';
import { pruneExpired } from '../../apps/server/src/maintenance/prune';
import { freshDatabase } from '../support/database';

describe('pruning expired rows', () => {
  let db: Db;
  let url: string;
  let drop: () => Promise<void>;
  beforeAll(async () => {
    ({ db, url, drop } = await freshDatabase());
  });
  afterAll(() => drop());

  it('deletes expired sessions, spent rate-limit windows and expired provider records, and keeps the live ones', async () => {
    const past = new Date(Date.now() - 60_000);
    const future = new Date(Date.now() + 3_600_000);
    await db('sessions').insert([
      { sid: 'old', sess: JSON.stringify({ cookie: {} }), expire: past },
      { sid: 'live', sess: JSON.stringify({ cookie: {} }), expire: future },
    ]);
    await db('rate_limits').insert([
      { key: 'sign-in:old', hits: 3, reset_at: past },
      { key: 'sign-in:live', hits: 1, reset_at: future },
    ]);
    await db('identity_payloads').insert([
      { model: 'Session', id: 'old', payload: '{}', expires_at: past },
      { model: 'Session', id: 'live', payload: '{}', expires_at: future },
      { model: 'Client', id: 'forever', payload: '{}', expires_at: null },
    ]);

    await expect(pruneExpired(db)).resolves.toEqual({ sessions: 1, rateLimits: 1, identityPayloads: 1 });
    expect((await db('sessions').pluck('sid')).sort()).toEqual(['live']);
    expect(await db('rate_limits').pluck('key')).toEqual(['sign-in:live']);
    expect((await db('identity_payloads').pluck('id')).sort()).toEqual(['forever', 'live']);
    await expect(pruneExpired(db)).resolves.toEqual({ sessions: 0, rateLimits: 0, identityPayloads: 0 });
  });

  it('is scheduled in PostgreSQL once, however many API processes register it', async () => {
    const a: Jobs = createJobs({ databaseUrl: url, mailFrom: 'Trabeate <notices@trabeate.test>' });
    const b: Jobs = createJobs({ databaseUrl: url, mailFrom: 'Trabeate <notices@trabeate.test>' });
    try {
      await a.start();
      await b.start();
      const handler = async () => undefined;
      await a.every('maintenance.prune', '*/10 * * * *', handler);
      await b.every('maintenance.prune', '*/10 * * * *', handler);
      const schedules = await a.boss.getSchedules();
      expect(schedules.filter((s) => s.name === 'maintenance.prune')).toEqual([
        expect.objectContaining({ name: 'maintenance.prune', cron: '*/10 * * * *', timezone: 'UTC' }),
      ]);
    } finally {
      await a.stop();
      await b.stop();
    }
  });
});
