// npm run db:reset: rebuilds the local development database with fresh demo data.
import { rmSync } from 'node:fs';
import path from 'node:path';
import { Cluster } from './lib/postgres';
import { log } from './lib/proc';
import { databaseStep, DEV_PORTS } from './lib/services';

async function main(): Promise<void> {
  const cluster = new Cluster({ name: 'pg-dev', port: DEV_PORTS.postgres });
  const wasRunning = cluster.isRunning();
  if (!wasRunning) cluster.start();
  try {
    cluster.dropDatabase('trabeate');
    await databaseStep(cluster, 'trabeate', { seed: true }).start();
    log('db:reset', 'the development database now holds a fresh demo');
    // Stored files and caught mail belong to the old data. Only clear them while the fakes are
    // not running (npm start is off); otherwise say so.
    if (wasRunning) {
      log('db:reset', 'npm start is running: files under tmp/s3-dev and mail under tmp/mail-dev were kept');
    } else {
      for (const dir of ['tmp/s3-dev', 'tmp/mail-dev']) rmSync(path.resolve(dir), { recursive: true, force: true });
      log('db:reset', 'local files and caught mail cleared');
    }
  } finally {
    if (!wasRunning) cluster.stop();
  }
}

main().catch((err) => {
  log('db:reset', (err as Error).message);
  process.exit(1);
});
