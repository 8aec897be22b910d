import { randomBytes } from 'node:crypto';
import type { Express } from 'express';
import { createApp, type AppDeps } from '../../apps/server/src/app';
import { createLogger } from '../../apps/server/src/core/logger';
import type { Db } from '../../apps/server/src/db/db';
import { seedDemo } from '../../seeds/demo';
import { freshDatabase } from './database';
import { startIdentity, TEST_CLIENT, TEST_PUBLIC_URL, type TestIdentity } from './identity';

export interface TestApp {
  app: Express;
  db: Db;
  /** The local identity provider serving this file's database (when asked for). */
  identity?: TestIdentity;
  close: () => Promise<void>;
}

/**
 * The real app on its own fresh database (optionally with the demo data), not listening. With
 * `identity`, the real local provider runs in-process and the app signs in against it.
 */
export async function testApp(
  opts: { seed?: boolean; identity?: boolean; config?: Partial<AppDeps['config']>; logger?: AppDeps['logger'] } = {},
): Promise<TestApp> {
  const { db, drop } = await freshDatabase();
  if (opts.seed) await seedDemo(db);
  const identity = opts.identity ? await startIdentity(db) : undefined;
  const logger = opts.logger ?? createLogger(process.env.TEST_LOG_LEVEL ?? 'silent');
  const config: AppDeps['config'] = {
    TRUST_PROXY: false,
    PUBLIC_URL: TEST_PUBLIC_URL,
    SESSION_SECRET: randomBytes(24).toString('hex'),
    SIGN_IN_RATE_LIMIT: 1000,
    ...(identity
      ? { OIDC_ISSUER: identity.issuer, OIDC_CLIENT_ID: TEST_CLIENT.clientId, OIDC_CLIENT_SECRET: TEST_CLIENT.clientSecret, OIDC_ALLOW_INSECURE_HTTP: true }
      : {}),
    ...opts.config,
  };
  const app = createApp({ config, db, logger });
  return {
    app,
    db,
    identity,
    close: async () => {
      await identity?.stop();
      await drop();
    },
  };
}
