// Production migration entry: `node dist/server/migrate.js [--seed-demo]`. Runs before the API
// starts (the compose file runs it once as its own service), never from each API replica.
import { createDb, migrateLatest } from './db/db';
import { loadConfig } from './core/config';
import { seedDemo } from '../../../seeds/demo';

async function main(): Promise<void> {
  const config = loadConfig();
  const db = createDb(config.DATABASE_URL, 2);
  try {
    const applied = await migrateLatest(db);
    console.log(applied.length ? `applied: ${applied.join(', ')}` : 'schema up to date');
    if (process.argv.includes('--seed-demo'))
      console.log((await seedDemo(db)) ? 'demo inserted' : 'demo already present');
  } finally {
    await db.destroy();
  }
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
