import { randomBytes } from 'node:crypto';
import type { Express } from 'express';
import { createApp, type AppDeps } from '../../apps/server/src/app';
import { startChangeFeed, type ChangeFeed } from '../../apps/server/src/core/change-feed';
import { createLogger } from '../../apps/server/src/core/logger';
import type { Db } from '../../apps/server/src/db/db';
import { seedDemo } from '../../seeds/demo';
import { createJobs, type Jobs, type RetryPolicy } from '../../apps/server/src/jobs';
import { createMailTransport, mailConfigSchema } from '../../apps/server/src/mail';
import type { ObjectStore } from '../../apps/server/src/storage';
import type { FakeS3 } from '../../scripts/fakes/s3';
import { freshDatabase } from './database';
import { fakeObjectStore } from './fakes';
import { startIdentity, TEST_CLIENT, TEST_PUBLIC_URL, type TestIdentity } from './identity';

export interface TestApp {
  app: Express;
  db: Db;
  /** The local identity provider serving this file's database (when asked for). */
  identity?: TestIdentity;
  /** The S3 fake (in this process) and the store the app writes deliverables to. */
  s3: FakeS3;
  store: ObjectStore;
  /** The mail queue; its worker runs only when `mail` was given. */
  jobs: Jobs;
  /** The change feed the app listens with (unless `changes: false`). */
  changes?: ChangeFeed;
  /**
   * Waits until the app's change feed has heard every notice of changes committed before the call,
   * as another API process's change is seen: for a test that writes to the database directly and
   * then asks the app (a notice of its own, sent after them, arrives after them).
   */
  settled: () => Promise<void>;
  close: () => Promise<void>;
}

let syncNotices = 0;

/** Short waits for tests; production uses DEFAULT_MAIL_RETRY (minutes, doubling). */
export const TEST_MAIL_RETRY: RetryPolicy = { retryLimit: 5, retryDelay: 1, retryBackoff: false };

/**
 * The real app on its own fresh database (optionally with the demo data), not listening. With
 * `identity`, the real local provider runs in-process and the app signs in against it.
 */
export async function testApp(
  opts: {
    seed?: boolean;
    /** With `seed`: also the demo's fee agreement and invoices (seeds/demo-fees.ts). */
    seedFees?: boolean;
    /** true, or the provider's test options (its throttle, say). */
    identity?: boolean | Parameters<typeof startIdentity>[1];
    config?: Partial<AppDeps['config']>;
    logger?: AppDeps['logger'];
    /** Run the mail worker against an SMTP server on this loopback port. */
    mail?: { smtpPort: number };
    /** false: no change feed, so no list replies are kept (every read queries), as without main.ts. */
    changes?: boolean;
  } = {},
): Promise<TestApp> {
  const { db, url, drop } = await freshDatabase();
  const files = await fakeObjectStore();
  const jobs = createJobs({
    databaseUrl: url,
    transport: opts.mail
      ? createMailTransport(mailConfigSchema.parse({ SMTP_PORT: String(opts.mail.smtpPort) }))
      : undefined,
    mailFrom: 'Trabeate <notices@trabeate.invalid>',
    retry: TEST_MAIL_RETRY,
    pollingIntervalSeconds: 0.5,
  });
  let identity: TestIdentity | undefined;
  let changes: ChangeFeed | undefined;
  const close = async () => {
    await changes?.close();
    await identity?.stop();
    await jobs.stop();
    await files.close();
    await drop();
  };
  try {
    await jobs.start();
    // API tests build their own fee scenarios on a clean invoice series; the demo's fees have their own test.
    if (opts.seed) await seedDemo(db, { fees: opts.seedFees ?? false });
    identity = opts.identity
      ? await startIdentity(db, typeof opts.identity === 'object' ? opts.identity : {})
      : undefined;
  } catch (err) {
    // pg-boss keeps timers running; a set-up that fails must not leave them to outlive the test file.
    await close();
    throw err;
  }
  const logger = opts.logger ?? createLogger(process.env.TEST_LOG_LEVEL ?? 'silent');
  // As main.ts runs it: list replies kept until the database says the firm's lists changed.
  if (opts.changes !== false) changes = await startChangeFeed(url, logger);
  const config: AppDeps['config'] = {
    TRUST_PROXY: false,
    PUBLIC_URL: TEST_PUBLIC_URL,
    SESSION_SECRET: randomBytes(24).toString('hex'),
    SIGN_IN_RATE_LIMIT: 1000,
    ...(identity
      ? {
          OIDC_ISSUER: identity.issuer,
          OIDC_CLIENT_ID: TEST_CLIENT.clientId,
          OIDC_CLIENT_SECRET: TEST_CLIENT.clientSecret,
          OIDC_ALLOW_INSECURE_HTTP: true,
        }
      : {}),
    ...opts.config,
  };
  const app = createApp({ config, db, logger, store: files.store, jobs, changes });
  const settled = async () => {
    if (!changes?.live()) return;
    const key = `sync:${process.pid}:${++syncNotices}`;
    const before = changes.generation(key);
    await db.raw(`select pg_notify('trabeate_changes', ?)`, [key]);
    const end = Date.now() + 10_000;
    while (changes.generation(key) === before) {
      if (Date.now() > end) throw new Error('the change feed did not hear its own notice within 10 s');
      await new Promise((r) => setTimeout(r, 1));
    }
  };
  return {
    app,
    db,
    identity,
    s3: files.s3,
    store: files.store,
    jobs,
    changes,
    settled,
    close,
  };
}
