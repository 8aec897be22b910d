// npm start: PostgreSQL, migrations and the demo seed on first run, the client build and the API,
// all on loopback. Ctrl-C stops everything this started; data is kept for the next start.
import path from 'node:path';
import { CLIENT_DIST } from './lib/client-build';
import { fakeServicesEnv, s3Service, smtpService, stripeService } from './lib/fake-services';
import { fakeStripeEnv } from './fakes/stripe';
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

async function main(): Promise<void> {
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
    postgresService(cluster),
    databaseStep(cluster, database, { seed: true }),
    clientBuildStep(),
    // Kept under tmp/ so files and caught mail survive restarts, like the database.
    s3Service({ port: DEV_PORTS.s3, directory: path.resolve('tmp/s3-dev') }),
    smtpService({ port: DEV_PORTS.smtp, httpPort: DEV_PORTS.smtpHttp, directory: path.resolve('tmp/mail-dev') }),
    stripeService({ port: stripePort, webhookUrl: `http://127.0.0.1:${DEV_PORTS.api}/api/webhooks/stripe` }),
    identityService({ ...signIn.identity, LOG_LEVEL: process.env.LOG_LEVEL ?? 'info' }, DEV_PORTS.identity),
    apiService(env, DEV_PORTS.api),
  ];

  let stopAll: (() => Promise<void>) | undefined;
  let stopping = false;
  const stop = async (code: number) => {
    if (stopping) return;
    stopping = true;
    log('start', 'stopping…');
    await stopAll?.();
    process.exit(code);
  };
  process.on('SIGINT', () => void stop(0));
  process.on('SIGTERM', () => void stop(0));

  try {
    stopAll = await startAll(services);
  } catch (err) {
    log('start', `could not start: ${(err as Error).message}`);
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
