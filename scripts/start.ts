// npm start: PostgreSQL, migrations and the demo seed on first run, the client build and the API,
// all on loopback. Ctrl-C stops everything this started; data is kept for the next start.
// Each fake runs in its own process and is restarted when it dies; every child exits when this
// command dies, and the next start stops anything a crashed run still left (pid files in tmp/run).
import path from 'node:path';
import { createObjectStore, objectStoreConfigFrom, storageConfigSchema } from '../apps/server/src/storage';
import { createDb } from '../apps/server/src/db/db';
import { storeMissingInvoicePdfs } from '../apps/server/src/invoices/invoices.service';
import { storeDemoDrawingFiles } from '../seeds/demo-drawings';
import { CLIENT_DIST } from './lib/client-build';
import { fakeServicesEnv, s3Service, smtpService, stripeService } from './lib/fake-services';
import { fakeStripeEnv } from './fakes/stripe';
import { releaseRunDir, takeOverRunDir } from './lib/leftovers';
import { Cluster } from './lib/postgres';
import { log } from './lib/proc';
import {
  apiService,
  clientBuildStep,
  databaseStep,
  DEV_PORTS,
  identityService,
  localSignIn,
  postgresService,
  startAll,
} from './lib/services';

const RUN_DIR = path.resolve('tmp/run/start');

async function main(): Promise<void> {
  try {
    await takeOverRunDir(RUN_DIR);
  } catch (err) {
    log('start', (err as Error).message);
    process.exit(1);
  }
  const runDir = RUN_DIR;
  const cluster = new Cluster({ name: 'pg-dev', port: DEV_PORTS.postgres });
  const database = 'trabeate';
  const stripePort = 4315;
  // A fixed local secret keeps sessions across restarts of `npm start`; never used in production.
  const signIn = localSignIn(cluster.url(database), DEV_PORTS, 'local-development-session-secret-not-for-production');
  const env = {
    ...signIn.api,
    NODE_ENV: 'development',
    DATABASE_URL: cluster.url(database),
    CLIENT_DIST,
    PUBLIC_URL: `http://127.0.0.1:${DEV_PORTS.api}`,
    LOG_LEVEL: process.env.LOG_LEVEL ?? 'info',
    // Files and mail go to the local fakes; the outbox page reads the SMTP fake's HTTP API.
    ...fakeServicesEnv({ port: DEV_PORTS.s3 }, { port: DEV_PORTS.smtp, httpPort: DEV_PORTS.smtpHttp }),
    DEV_OUTBOX_URL: `http://127.0.0.1:${DEV_PORTS.smtpHttp}`,
    // Card payments go to the local payments fake.
    ...fakeStripeEnv(stripePort),
  };
  const services = [
    postgresService(cluster, { runDir }),
    databaseStep(cluster, database, { seed: true }),
    clientBuildStep(),
    // Kept under tmp/ so files and caught mail survive restarts, like the database.
    s3Service({ port: DEV_PORTS.s3, directory: path.resolve('tmp/s3-dev'), runDir }),
    smtpService({
      port: DEV_PORTS.smtp,
      httpPort: DEV_PORTS.smtpHttp,
      directory: path.resolve('tmp/mail-dev'),
      runDir,
    }),
    stripeService({
      port: stripePort,
      webhookUrl: `http://127.0.0.1:${DEV_PORTS.api}/api/webhooks/stripe`,
      runDir,
    }),
    identityService({ ...signIn.identity, LOG_LEVEL: process.env.LOG_LEVEL ?? 'info' }, DEV_PORTS.identity, {
      runDir,
    }),
    apiService(env, DEV_PORTS.api, { runDir }),
  ];

  let stopAll: (() => Promise<void>) | undefined;
  let stopping = false;
  const stop = async (code: number) => {
    if (stopping) return;
    stopping = true;
    log('start', 'stopping…');
    await stopAll?.();
    releaseRunDir(RUN_DIR);
    process.exit(code);
  };
  process.on('SIGINT', () => void stop(0));
  process.on('SIGTERM', () => void stop(0));
  process.on('SIGHUP', () => void stop(0));
  // A bug in this command must not leave the services running without it.
  process.on('uncaughtException', (err) => {
    log('start', `failed: ${err.stack ?? err.message}`);
    void stop(1);
  });

  try {
    stopAll = await startAll(services);
    await storeDemoFiles(env);
  } catch (err) {
    log('start', `could not start: ${(err as Error).message}`);
    releaseRunDir(RUN_DIR);
    process.exit(1);
  }
  log('start', '');
  log('start', `Trabeate is running at http://127.0.0.1:${DEV_PORTS.api}/  (Ctrl-C stops everything)`);
  log('start', `Local sign-in at http://127.0.0.1:${DEV_PORTS.identity}/ (demo accounts: see README, local only)`);
  log(
    'start',
    `Local S3 at http://127.0.0.1:${DEV_PORTS.s3}/, caught mail at http://127.0.0.1:${DEV_PORTS.smtpHttp}/messages`,
  );
  log('start', '');
}

void main();

/**
 * The demo register's PDFs and the demo invoices' PDFs live in S3, which is up only now; missing
 * ones are put there.
 */
async function storeDemoFiles(env: Record<string, string>): Promise<void> {
  const store = createObjectStore(objectStoreConfigFrom(storageConfigSchema.parse(env)));
  const db = createDb(env.DATABASE_URL, 2);
  try {
    const stored = await storeDemoDrawingFiles(store);
    if (stored) log('start', `demo drawing files stored in S3: ${stored}`);
    const invoices = await storeMissingInvoicePdfs(db, store);
    if (invoices) log('start', `demo invoice PDFs stored in S3: ${invoices}`);
  } finally {
    store.close();
    await db.destroy();
  }
}
