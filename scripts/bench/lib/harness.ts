// What bench:api, bench:upload and bench:register share: the bundled API in a child process of its
// own (so its memory and CPU are its own) on a fresh PostgreSQL cluster with the demo data, other
// services beside it, a signed-in session, the API's memory from /proc, and the exit code.
import { spawn, type ChildProcess } from 'node:child_process';
import { createHmac, randomBytes } from 'node:crypto';
import { closeSync, openSync, readdirSync, readFileSync, readlinkSync } from 'node:fs';
import type { Knex } from 'knex';
import { Cluster } from '../../lib/postgres';
import { databaseStep, freePort, postgresService, startAll, type Service } from '../../lib/services';
import { API_NODE_FLAGS } from '../../lib/api-node-flags';
import { httpOk, log, run, stopChild, waitFor } from '../../lib/proc';
import { createDb } from '../../../apps/server/src/db/db';

export interface BenchContext {
  /** Loopback ports by name: postgres, api and whatever the bench asked for. */
  ports: Record<string, number>;
  databaseUrl: string;
  /** The API's SESSION_SECRET, for signing session cookies (see sessionCookie). */
  secret: string;
  apiUrl: string;
  /** Where the API's output goes (stdout and stderr, as a log collector would take them). */
  apiLog: string;
}

export interface BundledApiBench {
  /** Names the cluster and the API log: tmp/bench-<name>-<pid>.log. */
  name: string;
  /** fsync off and the like (measurements that do not depend on PostgreSQL's durability). */
  fastDatabase: boolean;
  /** Port names besides postgres and api. */
  extraPorts?: string[];
  /** The API's environment (PORT, HOST and SESSION_SECRET are set by the harness). */
  apiEnv: (ctx: BenchContext) => Record<string, string>;
  /** Node flags for the API process (a CPU profile, say). */
  apiFlags?: string[];
  /** Started after the database, before the API (fakes, a reference server). */
  services?: (ctx: BenchContext) => Service[];
  /** Runs before the API starts, with a small pool on the bench database (more data, say). */
  prepare?: (db: Knex, ctx: BenchContext) => Promise<void>;
}

/**
 * Bundles the server (the bench measures it as production runs it), starts PostgreSQL with the
 * demo data, the bench's own services and the API, runs `measure`, stops everything and exits
 * with 0 when `measure` says its targets were met, 1 otherwise or on an error.
 */
export function benchBundledApi(spec: BundledApiBench, measure: (ctx: BenchContext) => Promise<boolean>): void {
  run_(async () => {
    // Ports picked at random in a high range: colleagues' benchmarks run on the same machine, and a
    // common default once let a health check reach someone else's API.
    const ports: Record<string, number> = {};
    for (const name of ['postgres', 'api', ...(spec.extraPorts ?? [])]) ports[name] = await freePort(pick());
    const cluster = new Cluster({
      name: `pg-bench-${spec.name}-${process.pid}`,
      port: ports.postgres,
      fast: spec.fastDatabase,
    });
    const ctx: BenchContext = {
      ports,
      databaseUrl: cluster.url('trabeate_bench'),
      secret: randomBytes(32).toString('hex'),
      apiUrl: `http://127.0.0.1:${ports.api}`,
      apiLog: `tmp/bench-${spec.name}-${process.pid}.log`,
    };
    log('bench', 'bundling the server (npm run build:server)…');
    run('npm', ['run', 'build:server']);
    let stopAll: (() => Promise<void>) | undefined;
    let stopApi: (() => Promise<void>) | undefined;
    try {
      stopAll = await startAll([
        postgresService(cluster),
        databaseStep(cluster, 'trabeate_bench', { seed: true }),
        ...(spec.services?.(ctx) ?? []),
      ]);
      if (spec.prepare) {
        const db = createDb(ctx.databaseUrl, 2);
        try {
          await spec.prepare(db, ctx);
        } finally {
          await db.destroy();
        }
      }
      stopApi = await startAll([
        nodeService(
          'api',
          // The production flags first: a bench's own (an investigation's) come later and win.
          [...API_NODE_FLAGS, ...(spec.apiFlags ?? []), 'dist/server/main.js'],
          {
            ...spec.apiEnv(ctx),
            HOST: '127.0.0.1',
            PORT: String(ports.api),
            SESSION_SECRET: ctx.secret,
          },
          `${ctx.apiUrl}/api/health`,
          ctx.apiLog,
        ),
      ]);
      return await measure(ctx);
    } finally {
      await stopApi?.();
      await stopAll?.();
      cluster.remove();
    }
  });
}

const pick = () => 20_000 + Math.floor(Math.random() * 20_000);

/**
 * A Node process whose output goes to `logFile`, ready when `readyUrl` answers 200 and still alive
 * a moment later (not a process that lost its port to another one answering there).
 */
export function nodeService(
  name: string,
  args: string[],
  env: Record<string, string>,
  readyUrl: string,
  logFile = '/dev/null',
): Service {
  let child: ChildProcess | undefined;
  return {
    name,
    start: async () => {
      const fd = openSync(logFile, 'w');
      // It stops when the bench does, however the bench ends.
      child = spawn(process.execPath, ['--import', './scripts/lib/exit-with-parent.mjs', ...args], {
        env: { ...process.env, ...env },
        stdio: ['ignore', fd, fd, 'ipc'],
      });
      closeSync(fd);
    },
    ready: async () => {
      // Two minutes: on a machine busy with other work the bundled API has taken over 30 s to start.
      await waitFor(
        name,
        async () => {
          if (child?.exitCode !== null && child?.exitCode !== undefined) throw new Error(`${name} exited`);
          return httpOk(readyUrl);
        },
        120_000,
      );
      await new Promise((r) => setTimeout(r, 1000));
      if (child?.exitCode !== null) throw new Error(`${name} exited (port taken?); see ${logFile}`);
    },
    stop: async () => {
      if (child) await stopChild(child);
    },
  };
}

/** The reference for the request benches: one Express route in a process of its own, nothing else. */
export function bareExpressService(port: number, body: unknown = { ok: true }): Service {
  return nodeService(
    'bare',
    ['--import', 'tsx', 'scripts/bench/lib/bare-express.ts', String(port), JSON.stringify(body)],
    {},
    `http://127.0.0.1:${port}/bare`,
  );
}

/**
 * A session for `user`, written the way the session store keeps it, and the signed cookie
 * express-session expects. (The benches have no identity provider; tests cover the real sign-in.)
 */
export async function sessionCookie(
  db: Knex,
  secret: string,
  user: { id: string; email: string; name: string },
): Promise<string> {
  const sid = randomBytes(24).toString('base64url');
  const expires = new Date(Date.now() + 3_600_000);
  await db('sessions').insert({
    sid,
    sess: JSON.stringify({
      cookie: { originalMaxAge: 3_600_000, expires: expires.toISOString(), httpOnly: true, path: '/', sameSite: 'lax' },
      auth: {
        userId: user.id,
        issuer: 'bench',
        subject: 'bench',
        email: user.email,
        name: user.name,
        signedInAt: Date.now(),
        idToken: '',
      },
    }),
    expire: expires,
  });
  const signed = `s:${sid}.${createHmac('sha256', secret).update(sid).digest('base64').replace(/=+$/, '')}`;
  return `trabeate.sid=${encodeURIComponent(signed)}`;
}

/** The pid of the process listening on a loopback port (found through /proc, Linux only). */
export function listenerPid(port: number): number {
  const hexPort = port.toString(16).toUpperCase().padStart(4, '0');
  const inode = readFileSync('/proc/net/tcp', 'utf8')
    .split('\n')
    .map((l) => l.trim().split(/\s+/))
    .find((f) => f[1]?.endsWith(`:${hexPort}`) && f[3] === '0A')?.[9];
  if (!inode) throw new Error('cannot find the API socket');
  for (const pid of readdirSync('/proc').filter((d) => /^\d+$/.test(d))) {
    try {
      for (const fd of readdirSync(`/proc/${pid}/fd`)) {
        if (readlinkSync(`/proc/${pid}/fd/${fd}`) === `socket:[${inode}]`) return Number(pid);
      }
    } catch {
      // a process we may not look into, or one that ended
    }
  }
  throw new Error('cannot find the API process');
}

/** Resident memory now and its peak so far (VmHWM), in bytes. */
export function rssOf(pid: number): { rss: number; hwm: number } {
  const status = readFileSync(`/proc/${pid}/status`, 'utf8');
  const kb = (name: string) => Number(new RegExp(`${name}:\\s+(\\d+) kB`).exec(status)?.[1] ?? 0) * 1024;
  return { rss: kb('VmRSS'), hwm: kb('VmHWM') };
}

function run_(main: () => Promise<boolean>): void {
  main().then(
    (ok) => process.exit(ok ? 0 : 1),
    (err) => {
      console.error(err);
      process.exit(1);
    },
  );
}

let ticks: number | undefined;

/**
 * CPU time (user + system, seconds) used so far by a process and, with `withChildren`, by its
 * direct children (PostgreSQL's backends under the postmaster, say). On a shared machine the
 * requests per second of a run depend on what else runs; the CPU each request costs much less.
 */
export function cpuSeconds(pid: number, withChildren = false): number {
  ticks ??= Number(run('getconf', ['CLK_TCK']).trim()) || 100;
  const perSecond = ticks;
  const of = (p: number | string): { cpu: number; ppid: number } | undefined => {
    try {
      const stat = readFileSync(`/proc/${p}/stat`, 'utf8');
      // The fields after the command name, which is in parentheses and may contain spaces.
      const f = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
      return { ppid: Number(f[1]), cpu: (Number(f[11]) + Number(f[12])) / perSecond };
    } catch {
      return undefined; // ended meanwhile
    }
  };
  let total = of(pid)?.cpu ?? 0;
  if (withChildren) {
    for (const p of readdirSync('/proc').filter((d) => /^\d+$/.test(d))) {
      const s = of(p);
      if (s && s.ppid === pid) total += s.cpu;
    }
  }
  return total;
}
