// npm test [-- suite ...]: starts the services on test ports against throwaway databases, runs
// every Jest suite (lint, typecheck, libs, client, api, build, e2e) in one run, stops everything and prints a
// summary. Exits non-zero on any failure. Pass suite names to run only those.
import { spawn } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs';
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
  freePort,
  identityService,
  localSignIn,
  postgresService,
  startAll,
  TEST_PORTS,
  type Service,
} from './lib/services';

// Only for the PostgreSQL watchdog's pid file; every child of this command exits with it.
const RUN_DIR = path.resolve(`tmp/run/test-${process.pid}`);
const SUITES = ['lint', 'typecheck', 'libs', 'client', 'api', 'build', 'e2e'] as const;
type Suite = (typeof SUITES)[number];
const NEEDS: Record<Suite, { db?: boolean; client?: boolean; api?: boolean }> = {
  lint: {},
  typecheck: {},
  libs: {},
  client: {},
  api: { db: true },
  build: { client: true },
  e2e: { db: true, client: true, api: true },
};

async function main(): Promise<number> {
  // The AWS SDK's notice that its 2027 releases need Node 22 is known (README, "Runtime notes");
  // every child inherits this, so test output stays readable.
  process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= 'true';
  const args = process.argv.slice(2);
  // Leading suite names choose the suites; everything from the first other argument on goes to Jest
  // (npm test -- api -t "health").
  const firstOther = args.findIndex((a) => !(SUITES as readonly string[]).includes(a));
  const chosen = (firstOther < 0 ? args : args.slice(0, firstOther)) as Suite[];
  const passThrough = firstOther < 0 ? [] : args.slice(firstOther);
  if (passThrough.length && !passThrough[0].startsWith('-')) {
    log('test', `unknown suite "${passThrough[0]}"; choose from ${SUITES.join(', ')}`);
    return 2;
  }
  const suites: Suite[] = chosen.length ? chosen : [...SUITES];
  const needs = (k: 'db' | 'client' | 'api') => suites.some((s) => NEEDS[s][k]);

  const ports = {
    postgres: await freePort(TEST_PORTS.postgres),
    api: await freePort(TEST_PORTS.api),
    identity: await freePort(TEST_PORTS.identity),
    s3: await freePort(TEST_PORTS.s3),
    smtp: await freePort(TEST_PORTS.smtp),
    smtpHttp: await freePort(TEST_PORTS.smtpHttp),
    stripe: await freePort(4325),
  };
  const cluster = needs('db')
    ? new Cluster({ name: `pg-test-${process.pid}`, port: ports.postgres, fast: true })
    : undefined;
  const services: Service[] = [];
  // The e2e API's session secret; browser tests get it too, to build signed links (an expired one, say).
  const e2eSessionSecret = randomBytes(32).toString('hex');
  if (cluster) {
    services.push(postgresService(cluster, { runDir: RUN_DIR }));
    services.push(databaseStep(cluster, 'trabeate_template', { seed: false }));
    if (needs('api')) services.push(databaseStep(cluster, 'trabeate_e2e', { seed: true }));
  }
  if (needs('client')) services.push(clientBuildStep(process.env.CI === 'true'));
  if (needs('api') && cluster) {
    // The e2e API signs in against the real local provider, on the same seeded database.
    const signIn = localSignIn(cluster.url('trabeate_e2e'), ports, e2eSessionSecret);
    // The e2e API keeps files and mail in the local fakes (temporary folders, removed on stop).
    services.push(s3Service({ port: ports.s3 }));
    services.push(smtpService({ port: ports.smtp, httpPort: ports.smtpHttp }));
    services.push(
      stripeService({ port: ports.stripe, webhookUrl: `http://127.0.0.1:${ports.api}/api/webhooks/stripe` }),
    );
    services.push(identityService({ ...signIn.identity, LOG_LEVEL: 'warn' }, ports.identity));
    services.push(
      apiService(
        {
          ...signIn.api,
          NODE_ENV: 'test',
          DATABASE_URL: cluster.url('trabeate_e2e'),
          CLIENT_DIST,
          LOG_LEVEL: 'warn',
          PUBLIC_URL: `http://127.0.0.1:${ports.api}`,
          ...fakeServicesEnv({ port: ports.s3 }, { port: ports.smtp, httpPort: ports.smtpHttp }),
          DEV_OUTBOX_URL: `http://127.0.0.1:${ports.smtpHttp}`,
          ...fakeStripeEnv(ports.stripe),
          JOBS_POLL_SECONDS: '0.5',
        },
        ports.api,
      ),
    );
  }

  let stopAll: (() => Promise<void>) | undefined;
  const cleanup = async () => {
    await stopAll?.();
    cluster?.remove();
    rmSync(RUN_DIR, { recursive: true, force: true });
  };
  process.on('SIGINT', () => void cleanup().then(() => process.exit(130)));
  process.on('SIGTERM', () => void cleanup().then(() => process.exit(143)));

  try {
    stopAll = await startAll(services);
  } catch (err) {
    log('test', `could not start the services: ${(err as Error).message}`);
    await cleanup();
    return 1;
  }

  const results = path.resolve(`tmp/jest-results-${process.pid}.json`);
  mkdirSync(path.dirname(results), { recursive: true });
  const env: NodeJS.ProcessEnv = { ...process.env, NODE_ENV: 'test' };
  if (cluster) {
    env.TEST_PG_ADMIN_URL = cluster.url('postgres');
    env.TEST_DB_TEMPLATE = 'trabeate_template';
  }
  if (needs('api')) {
    env.E2E_OUTBOX_URL = `http://127.0.0.1:${ports.smtpHttp}`;
    env.E2E_BASE_URL = `http://127.0.0.1:${ports.api}`;
    env.E2E_IDENTITY_URL = `http://127.0.0.1:${ports.identity}`;
    // Lets a browser test give a new invitee an account at the local provider, as seeds/identity.ts does.
    if (cluster) env.E2E_DATABASE_URL = cluster.url('trabeate_e2e');
    env.E2E_SESSION_SECRET = e2eSessionSecret;
  }
  const jestArgs = [
    'jest',
    '--maxWorkers=2',
    '--json',
    `--outputFile=${results}`,
    '--selectProjects',
    ...suites,
    ...passThrough,
  ];
  const code = await new Promise<number>((resolve) => {
    const child = spawn('npx', jestArgs, { stdio: 'inherit', env });
    child.on('exit', (c) => resolve(c ?? 1));
  });

  await cleanup();
  printSummary(results, suites);
  rmSync(results, { force: true });
  return code;
}

interface JestJson {
  numPassedTests: number;
  numFailedTests: number;
  numPendingTests: number;
  numTotalTests: number;
  testResults: { name: string; assertionResults: { status: string }[] }[];
}

function suiteOf(file: string): Suite {
  const rel = path.relative(process.cwd(), file);
  if (rel.startsWith('libs/')) return 'libs';
  if (rel.startsWith('apps/client/')) return 'client';
  if (rel.startsWith('test/e2e/')) return 'e2e';
  if (rel.startsWith('test/build/')) return 'build';
  if (rel.startsWith('test/static/lint')) return 'lint';
  if (rel.startsWith('test/static/typecheck')) return 'typecheck';
  return 'api';
}

function printSummary(file: string, suites: Suite[]): void {
  if (!existsSync(file)) {
    log('test', 'no results were written');
    return;
  }
  const json = JSON.parse(readFileSync(file, 'utf8')) as JestJson;
  const rows = new Map<Suite, { passed: number; failed: number; skipped: number }>(
    suites.map((s) => [s, { passed: 0, failed: 0, skipped: 0 }]),
  );
  for (const r of json.testResults) {
    const row = rows.get(suiteOf(r.name));
    if (!row) continue;
    for (const a of r.assertionResults) {
      if (a.status === 'passed') row.passed++;
      else if (a.status === 'failed') row.failed++;
      else row.skipped++;
    }
  }
  console.log('\nTrabeate test summary');
  for (const [suite, row] of rows) {
    console.log(
      `  ${suite.padEnd(7)} ${String(row.passed).padStart(4)} passed  ${String(row.failed).padStart(3)} failed  ${String(row.skipped).padStart(3)} skipped`,
    );
  }
  console.log(`${json.numPassedTests} passed, ${json.numFailedTests} failed, ${json.numPendingTests} skipped`);
}

main().then(
  (code) => process.exit(code),
  (err) => {
    console.error(err);
    process.exit(1);
  },
);
