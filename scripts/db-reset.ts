// npm run db:reset: rebuilds the local development database with fresh demo data.
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
  } finally {
    if (!wasRunning) cluster.stop();
  }
}

main().catch((err) => {
  log('db:reset', (err as Error).message);
  process.exit(1);
});
