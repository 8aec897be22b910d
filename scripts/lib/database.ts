import { createDb, migrateLatest } from '../../apps/server/src/db/db';
import { seedDemo } from '../../seeds/demo';
import { log } from './proc';

/** Brings a database to the latest schema and, when asked, inserts the demo if it is absent. */
export async function prepareDatabase(url: string, opts: { seed: boolean }): Promise<void> {
  const db = createDb(url, 2);
  try {
    const applied = await migrateLatest(db);
    log('database', applied.length ? `migrated: ${applied.join(', ')}` : 'schema up to date');
    if (opts.seed) {
      const seeded = await seedDemo(db);
      log('database', seeded ? 'demo data inserted' : 'demo data already present (kept)');
    }
  } finally {
    await db.destroy();
  }
}
