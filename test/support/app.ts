import type { Express } from 'express';
import { createApp } from '../../apps/server/src/app';
import { createLogger } from '../../apps/server/src/core/logger';
import type { Db } from '../../apps/server/src/db/db';
import { seedDemo } from '../../seeds/demo';
import { freshDatabase } from './database';

export interface TestApp {
  app: Express;
  db: Db;
  close: () => Promise<void>;
}

/** The real app on its own fresh database (optionally with the demo data), not listening. */
export async function testApp(opts: { seed?: boolean } = {}): Promise<TestApp> {
  const { db, drop } = await freshDatabase();
  if (opts.seed) await seedDemo(db);
  const logger = createLogger(process.env.TEST_LOG_LEVEL ?? 'silent');
  const app = createApp({ config: { TRUST_PROXY: false }, db, logger });
  return { app, db, close: drop };
}
