// The local identity provider: `node --import tsx apps/identity/src/main.ts`. Loopback only; the
// start and test commands run it beside the API with the settings below.
import { createServer } from 'node:http';
import knex from 'knex';
import pino from 'pino';
import { z } from 'zod';
import { pruneExpired } from './adapter';
import { createIdentityProvider } from './provider';
import { pruneFailures } from './throttle';

const list = z.string().transform((s) =>
  s
    .split(',')
    .map((x) => x.trim())
    .filter(Boolean),
);
const envSchema = z.object({
  IDENTITY_DATABASE_URL: z.string().regex(/^postgres(ql)?:\/\//, 'must be a postgres:// URL'),
  IDENTITY_PORT: z.coerce.number().int().min(0).max(65535).default(4311),
  IDENTITY_ISSUER: z.url().optional(),
  IDENTITY_CLIENT_ID: z.string().min(1),
  IDENTITY_CLIENT_SECRET: z.string().min(16),
  IDENTITY_REDIRECT_URIS: list,
  IDENTITY_POST_LOGOUT_REDIRECT_URIS: list,
  LOG_LEVEL: z.string().default('info'),
});

async function main(): Promise<void> {
  const parsed = envSchema.safeParse(process.env);
  if (!parsed.success) {
    console.error(
      `Trabeate identity provider cannot start:\n${parsed.error.issues.map((i) => `  - ${i.path.join('.')} ${i.message}`).join('\n')}`,
    );
    process.exit(78);
  }
  const env = parsed.data;
  const logger = pino({ name: 'trabeate-identity', level: env.LOG_LEVEL, base: { service: 'trabeate-identity' } });
  const db = knex({ client: 'pg', connection: env.IDENTITY_DATABASE_URL, pool: { min: 0, max: 5 } });
  const issuer = env.IDENTITY_ISSUER ?? `http://127.0.0.1:${env.IDENTITY_PORT}`;
  await pruneExpired(db);
  await pruneFailures(db);
  const { app } = await createIdentityProvider({
    db,
    issuer,
    logger,
    clients: [
      {
        clientId: env.IDENTITY_CLIENT_ID,
        clientSecret: env.IDENTITY_CLIENT_SECRET,
        redirectUris: env.IDENTITY_REDIRECT_URIS,
        postLogoutRedirectUris: env.IDENTITY_POST_LOGOUT_REDIRECT_URIS,
      },
    ],
  });
  const server = createServer(app);
  // Loopback only: this provider stands in for a firm's own and is never exposed.
  server.listen(env.IDENTITY_PORT, '127.0.0.1', () => logger.info(`Trabeate identity provider at ${issuer}`));
  const stop = () => {
    server.close(() => void db.destroy().then(() => process.exit(0)));
    setTimeout(() => process.exit(0), 5000).unref();
  };
  process.on('SIGTERM', stop);
  process.on('SIGINT', stop);
}

void main();
