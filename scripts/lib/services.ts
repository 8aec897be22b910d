import { API_NODE_FLAGS } from './api-node-flags';
import { Cluster } from './postgres';
import { httpOk, log, waitFor } from './proc';
import { supervise, type Supervised } from './supervisor';

/** Preloaded into the API and identity children: they stop when their parent goes away. */
const EXIT_WITH_PARENT = ['--import', './scripts/lib/exit-with-parent.mjs'];

/**
 * Every service the product needs locally, in start order. Each has a start, a readiness check
 * and a stop; the start and test commands run this same list with different ports and data.
 * Later features add their local fakes (S3, SMTP, payments) here.
 */
export interface Service {
  name: string;
  start(): Promise<void>;
  ready(): Promise<void>;
  stop(): Promise<void>;
}

export interface Ports {
  postgres: number;
  api: number;
  identity: number;
  s3: number;
  smtp: number;
  /** The SMTP fake's JSON outbox (GET /messages). */
  smtpHttp: number;
}

export const DEV_PORTS: Ports = { postgres: 5442, api: 4310, identity: 4311, s3: 4312, smtp: 4313, smtpHttp: 4314 };
export const TEST_PORTS: Ports = { postgres: 5443, api: 4320, identity: 4321, s3: 4322, smtp: 4323, smtpHttp: 4324 };

/**
 * The local identity provider and the API's settings for it. LOCAL ONLY: the client secret is
 * fixed and public; production points the API at the firm's own provider.
 */
export function localSignIn(
  databaseUrl: string,
  ports: Ports,
  sessionSecret: string,
): { identity: Record<string, string>; api: Record<string, string> } {
  const apiUrl = `http://127.0.0.1:${ports.api}`;
  const client = { id: 'trabeate-local', secret: 'local-only-client-secret-not-for-production' };
  return {
    identity: {
      IDENTITY_DATABASE_URL: databaseUrl,
      IDENTITY_PORT: String(ports.identity),
      IDENTITY_ISSUER: `http://127.0.0.1:${ports.identity}`,
      IDENTITY_CLIENT_ID: client.id,
      IDENTITY_CLIENT_SECRET: client.secret,
      IDENTITY_REDIRECT_URIS: `${apiUrl}/api/auth/callback`,
      IDENTITY_POST_LOGOUT_REDIRECT_URIS: `${apiUrl}/`,
    },
    api: {
      OIDC_ISSUER: `http://127.0.0.1:${ports.identity}`,
      OIDC_CLIENT_ID: client.id,
      OIDC_CLIENT_SECRET: client.secret,
      OIDC_ALLOW_INSECURE_HTTP: 'true',
      SESSION_SECRET: sessionSecret,
    },
  };
}

export function identityService(env: Record<string, string>, port: number, opts: { runDir?: string } = {}): Service {
  let child: Supervised | undefined;
  return {
    name: 'identity',
    start: async () => {
      child = supervise({
        name: 'identity',
        args: [...EXIT_WITH_PARENT, '--import', 'tsx', 'apps/identity/src/main.ts'],
        env: { ...process.env, ...env, IDENTITY_PORT: String(port) },
        restart: false,
        runDir: opts.runDir,
      });
      await child.start();
    },
    ready: () =>
      waitFor('the identity provider', async () => {
        if (child?.pid() === undefined) throw new Error('the identity provider process exited');
        return httpOk(`http://127.0.0.1:${port}/.well-known/openid-configuration`);
      }),
    stop: async () => {
      await child?.stop();
    },
  };
}

export function postgresService(cluster: Cluster, opts: { runDir?: string } = {}): Service {
  let watchdog: { disarm(): void } | undefined;
  return {
    name: 'postgres',
    start: async () => {
      cluster.start();
      // pg_ctl runs PostgreSQL as a daemon that would outlive a crashed start command.
      if (opts.runDir) watchdog = cluster.watchParent(opts.runDir);
    },
    ready: async () => undefined, // pg_ctl -w returns once connections are accepted
    stop: async () => {
      watchdog?.disarm();
      cluster.stop();
    },
  };
}

/**
 * The API as a child process: from TypeScript through tsx (start, tests), or from the bundled
 * production build when `bundle` names it (benchmarks measure what production runs).
 */
export function apiService(
  env: Record<string, string>,
  port: number,
  opts: { bundle?: string; runDir?: string } = {},
): Service {
  let child: Supervised | undefined;
  return {
    name: 'api',
    start: async () => {
      const args = opts.bundle ? [...API_NODE_FLAGS, opts.bundle] : ['--import', 'tsx', 'apps/server/src/main.ts'];
      child = supervise({
        name: 'api',
        args: [...EXIT_WITH_PARENT, ...args],
        env: { ...process.env, ...env, PORT: String(port), HOST: '127.0.0.1' },
        restart: false,
        runDir: opts.runDir,
      });
      await child.start();
    },
    ready: () =>
      waitFor('the API', async () => {
        if (child?.pid() === undefined) throw new Error('the API process exited');
        return httpOk(`http://127.0.0.1:${port}/api/health`);
      }),
    stop: async () => {
      await child?.stop();
    },
  };
}

/** Starts services in order, each ready before the next; returns a stop for all, in reverse. */
export async function startAll(services: Service[]): Promise<() => Promise<void>> {
  const started: Service[] = [];
  const stopAll = async () => {
    for (const s of started.reverse()) {
      try {
        await s.stop();
      } catch (err) {
        log(s.name, `stop failed: ${(err as Error).message}`);
      }
    }
    started.length = 0;
  };
  try {
    for (const s of services) {
      started.push(s);
      await s.start();
      await s.ready();
    }
  } catch (err) {
    await stopAll();
    throw err;
  }
  return stopAll;
}

/** Not a process: creates the database if needed, migrates it and (optionally) seeds the demo. */
export function databaseStep(cluster: Cluster, name: string, opts: { seed: boolean; template?: string }): Service {
  return {
    name: 'database',
    start: async () => {
      cluster.ensureDatabase(name, opts.template);
      const { prepareDatabase } = await import('./database');
      await prepareDatabase(cluster.url(name), opts);
    },
    ready: async () => undefined,
    stop: async () => undefined,
  };
}

/** Not a process: builds the client once so the API can serve it (skipped when up to date). */
export function clientBuildStep(force = false): Service {
  return {
    name: 'client',
    start: async () => {
      const { buildClient } = await import('./client-build');
      buildClient({ force });
    },
    ready: async () => undefined,
    stop: async () => undefined,
  };
}

/**
 * The preferred port when it is free on loopback, otherwise one the system picks, so two test
 * runs on one machine (a developer's and CI's, say) do not collide.
 */
export async function freePort(preferred: number): Promise<number> {
  const { createServer } = await import('node:net');
  const tryListen = (port: number) =>
    new Promise<number>((resolve, reject) => {
      const srv = createServer();
      srv.once('error', reject);
      srv.listen(port, '127.0.0.1', () => {
        const address = srv.address();
        const got = typeof address === 'object' && address ? address.port : port;
        srv.close(() => resolve(got));
      });
    });
  try {
    return await tryListen(preferred);
  } catch {
    return tryListen(0);
  }
}
