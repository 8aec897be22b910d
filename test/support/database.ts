import { randomBytes } from 'node:crypto';
import knex from 'knex';
import { createDb, type Db } from '../../apps/server/src/db/db';
import { testEnv } from './env';

/**
 * Each API test file gets its own database, copied from a migrated template, so files run in
 * parallel without seeing each other's rows. Dropped again by `drop()`.
 */
export async function freshDatabase(): Promise<{ db: Db; url: string; drop: () => Promise<void> }> {
  const adminUrl = testEnv('TEST_PG_ADMIN_URL');
  const template = testEnv('TEST_DB_TEMPLATE');
  const name = `t_${randomBytes(6).toString('hex')}`;
  const admin = knex({ client: 'pg', connection: adminUrl, pool: { min: 0, max: 1 } });
  try {
    await admin.raw(`create database "${name}" template "${template}"`);
  } finally {
    await admin.destroy();
  }
  const url = adminUrl.replace(/\/[^/]*$/, `/${name}`);
  const db = createDb(url, 4);
  return {
    db,
    url,
    drop: async () => {
      await db.destroy();
      const a = knex({ client: 'pg', connection: adminUrl, pool: { min: 0, max: 1 } });
      try {
        await a.raw(`drop database if exists "${name}" with (force)`);
      } finally {
        await a.destroy();
      }
    },
  };
}
