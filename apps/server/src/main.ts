import { createServer } from 'node:http';
import { createApp } from './app';
import { ConfigError, LOCAL_DEFAULTS, loadConfig } from './core/config';
import { createJobs } from './jobs';
import { pruneExpired, PRUNE_CRON, PRUNE_JOB } from './maintenance/prune';
import { sweepIncompleteUploads, UPLOAD_SWEEP_CRON, UPLOAD_SWEEP_JOB } from './maintenance/sweep-uploads';
import { REMINDER_CRON, REMINDER_JOB, sendOverdueReminders } from './invoices/reminders';
import { createNotices } from './notices/notices';
import { createMailTransport } from './mail';
import { createObjectStore, objectStoreConfigFrom } from './storage';
import { createLogger } from './core/logger';
import { gracefulShutdown } from './core/shutdown';
import { createDb } from './db/db';
import { startChangeFeed } from './core/change-feed';

async function main(): Promise<void> {
  let config;
  try {
    config = loadConfig();
  } catch (err) {
    if (err instanceof ConfigError) {
      console.error(`Trabeate API cannot start.\n${err.message}\nSee .env.example for every setting.`);
      process.exit(78);
    }
    throw err;
  }
  const logger = createLogger(config.LOG_LEVEL, undefined, { sync: false });
  const db = createDb(config.DATABASE_URL, config.DATABASE_POOL_MAX);
  const store = createObjectStore(
    objectStoreConfigFrom({ ...config, S3_BUCKET: config.S3_BUCKET ?? LOCAL_DEFAULTS.S3_BUCKET }),
  );
  // Every API process also works the mail queue: pg-boss shares the jobs out through PostgreSQL.
  const jobs = createJobs({
    databaseUrl: config.DATABASE_URL,
    transport: createMailTransport({ ...config, SMTP_HOST: config.SMTP_HOST ?? LOCAL_DEFAULTS.SMTP_HOST }),
    mailFrom: config.MAIL_FROM,
    pollingIntervalSeconds: config.JOBS_POLL_SECONDS,
    logger,
  });
  await jobs.start();
  await jobs.every(PRUNE_JOB, PRUNE_CRON, async () => {
    logger.info(await pruneExpired(db), 'pruned expired sessions and sign-in records');
  });
  await jobs.every(UPLOAD_SWEEP_JOB, UPLOAD_SWEEP_CRON, async () => {
    logger.info(await sweepIncompleteUploads(store), 'aborted incomplete uploads older than a day');
  });
  const reminderNotices = createNotices(jobs, config.PUBLIC_URL, logger);
  await jobs.every(REMINDER_JOB, REMINDER_CRON, async () => {
    const today = new Date().toISOString().slice(0, 10);
    logger.info({ sent: await sendOverdueReminders(db, reminderNotices, today) }, 'overdue invoice reminders queued');
  });
  const changes = await startChangeFeed(config.DATABASE_URL, logger);
  const app = createApp({
    config: { ...config, SMTP_HOST: config.SMTP_HOST ?? LOCAL_DEFAULTS.SMTP_HOST },
    db,
    logger,
    store,
    jobs,
    changes,
  });
  const server = createServer(app);
  server.listen(config.PORT, config.HOST, () => {
    const address = server.address();
    const port = typeof address === 'object' && address ? address.port : config.PORT;
    logger.info({ host: config.HOST, port }, `Trabeate API listening on http://${config.HOST}:${port}`);
  });

  let stopping = false;
  const shutdown = (signal: string) => {
    if (stopping) return;
    stopping = true;
    logger.info({ signal }, 'shutting down: finishing requests in flight');
    gracefulShutdown(server, config.SHUTDOWN_GRACE_MS, async () => {
      // A mail being sent finishes first; one not yet taken stays queued for another process.
      await jobs.stop();
      await changes.close();
      store.close();
      await db.destroy();
    }).then(
      () => {
        logger.info('stopped');
        process.exit(0);
      },
      (err: unknown) => {
        logger.error({ err }, 'shutdown failed');
        process.exit(1);
      },
    );
  };
  process.on('SIGTERM', () => shutdown('SIGTERM'));
  process.on('SIGINT', () => shutdown('SIGINT'));
}

void main();
