// npm run bench:api: the bundled API with production settings, under autocannon (100 connections),
// beside a bare Express route measured in the same run. A firm with 500 more projects and their
// stages; a principal's session written as the session store keeps it, so every request goes
// through the real middleware (logging, helmet, session, caller, access guard, CSRF where used).
// Prints requests/s, p50, p99 and the ratio to bare Express; targets: /api/me >= 50 %, the
// projects list >= 30 %, and no session-table write during the reads. BENCH_SECONDS changes the
// length of each measurement. Exits 1 when a target is missed.
import { spawn, type ChildProcess } from 'node:child_process';
import { createHmac, randomBytes } from 'node:crypto';
import { closeSync, openSync, statSync } from 'node:fs';
import { loadavg } from 'node:os';
import autocannon from 'autocannon';
import { Cluster } from '../lib/postgres';
import { databaseStep, freePort, postgresService, startAll, type Service } from '../lib/services';
import { httpOk, log, run, stopChild, waitFor } from '../lib/proc';
import { createDb } from '../../apps/server/src/db/db';
import { DEMO } from '../../seeds/demo';
import { addBenchProjects } from './lib/bench-firm';

const SECONDS = Number(process.env.BENCH_SECONDS ?? 10);
const CONNECTIONS = 100;
const SECRET = randomBytes(32).toString('hex');

interface Figures {
  rps: number;
  p50: number;
  p99: number;
  non2xx: number;
  errors: number;
}

/** A child process whose output goes to a file, as a deployment's log collector would take it. */
function childService(name: string, args: string[], env: Record<string, string>, port: number, logFile: string) {
  let child: ChildProcess | undefined;
  const service: Service = {
    name,
    start: async () => {
      const fd = openSync(logFile, 'w');
      child = spawn(process.execPath, args, { env: { ...process.env, ...env }, stdio: ['ignore', fd, fd] });
      closeSync(fd);
    },
    ready: async () => {
      await waitFor(name, async () => {
        if (child?.exitCode !== null && child?.exitCode !== undefined) throw new Error(`${name} exited`);
        return httpOk(`http://127.0.0.1:${port}${name === 'api' ? '/api/health' : '/bare'}`);
      });
      // Still alive a moment later: not a process that lost the port to another one answering there.
      await new Promise((r) => setTimeout(r, 1000));
      if (child?.exitCode !== null) throw new Error(`${name} exited (port ${port} taken?); see ${logFile}`);
    },
    stop: async () => {
      if (child) await stopChild(child);
    },
  };
  return service;
}

async function measure(url: string, cookie?: string): Promise<Figures> {
  const opts = { url, connections: CONNECTIONS, headers: cookie ? { cookie } : {} };
  await autocannon({ ...opts, duration: 2 }); // warm-up: JIT, pool connections, PostgreSQL caches
  const r = await autocannon({ ...opts, duration: SECONDS });
  return {
    rps: r.requests.average,
    p50: r.latency.p50,
    p99: r.latency.p99,
    non2xx: r.non2xx,
    errors: r.errors + r.timeouts,
  };
}

async function main(): Promise<number> {
  // Ports picked at random in a high range: colleagues' benchmarks run on the same machine, and a
  // common default once let a health check reach someone else's API.
  const pick = () => 20_000 + Math.floor(Math.random() * 20_000);
  const ports = { postgres: await freePort(pick()), api: await freePort(pick()), bare: await freePort(pick()) };
  const cluster = new Cluster({ name: `pg-bench-api-${process.pid}`, port: ports.postgres, fast: false });
  const databaseUrl = cluster.url('trabeate_bench');
  const apiLog = `tmp/bench-api-${process.pid}.log`;
  log('bench', 'bundling the server (npm run build:server)…');
  run('npm', ['run', 'build:server']);
  const api = childService(
    'api',
    [
      '--enable-source-maps',
      // BENCH_PROFILE=1 writes a CPU profile of the API (open it in Chrome's DevTools) to tmp/.
      ...(process.env.BENCH_PROFILE ? ['--cpu-prof', '--cpu-prof-dir=tmp/bench-profiles'] : []),
      'dist/server/main.js',
    ],
    {
      NODE_ENV: 'production',
      HOST: '127.0.0.1',
      PORT: String(ports.api),
      DATABASE_URL: databaseUrl,
      LOG_LEVEL: 'info',
      SESSION_SECRET: SECRET,
      PUBLIC_URL: `http://127.0.0.1:${ports.api}`,
      // Required in production; nothing in the bench signs in, uploads or mails.
      OIDC_ISSUER: 'https://sign-in.bench.invalid',
      OIDC_CLIENT_ID: 'bench',
      OIDC_CLIENT_SECRET: 'bench-client-secret',
      S3_BUCKET: 'trabeate-bench',
      S3_REGION: 'us-east-1',
      S3_ENDPOINT: 'http://127.0.0.1:9',
      S3_FORCE_PATH_STYLE: 'true',
      S3_ACCESS_KEY_ID: 'bench',
      S3_SECRET_ACCESS_KEY: 'bench',
      SMTP_HOST: '127.0.0.1',
      SMTP_PORT: '9',
    },
    ports.api,
    apiLog,
  );
  const bare = childService(
    'bare',
    ['--import', 'tsx', 'scripts/bench/lib/bare-express.ts', String(ports.bare)],
    {},
    ports.bare,
    '/dev/null',
  );
  let stopAll: (() => Promise<void>) | undefined;
  try {
    stopAll = await startAll([postgresService(cluster), databaseStep(cluster, 'trabeate_bench', { seed: true }), bare]);
    const db = createDb(databaseUrl, 2);
    const busyProject = await addBenchProjects(db, 500, 400);
    await db.raw('analyze');
    const stopApi = await startAll([api]);
    const cookie = await principalSession(db);
    const base = `http://127.0.0.1:${ports.api}`;
    const list = `${base}/api/projects?page=3&pageSize=25&sort=updatedAt&direction=desc&status=active&q=corrow`;
    const targets: Array<[string, string, number | null]> = [
      // For reading the others: the public health check, one trivial query and no session.
      ['/api/health (no session, one query)', `${base}/api/health`, null],
      ['/api/me', `${base}/api/me`, 0.5],
      ['projects list (page 3 of 25, sorted, filtered)', list, 0.3],
      ['project page data (/full)', `${base}/api/projects/${busyProject}/full`, null],
      ['activity log (50 of 400)', `${base}/api/projects/${busyProject}/activity`, null],
    ];
    for (const [, url] of targets) {
      const res = await fetch(url, { headers: { cookie } });
      if (res.status !== 200) throw new Error(`${url} answered ${res.status}: ${(await res.text()).slice(0, 200)}`);
    }

    const writesBefore = await sessionWrites(db);
    const reference = await measure(`http://127.0.0.1:${ports.bare}/bare`);
    const results: Array<[string, Figures, number | null]> = [];
    for (const [name, url, target] of targets) results.push([name, await measure(url, cookie), target]);
    await new Promise((r) => setTimeout(r, 1500)); // PostgreSQL publishes table statistics about once a second
    const writesAfter = await sessionWrites(db);
    const sessionRowWrites = writesAfter - writesBefore;

    console.log(`\nAPI benchmark (${CONNECTIONS} connections, ${SECONDS} s each after a 2 s warm-up)`);
    console.log(
      `  load average before/after  ${LOAD_BEFORE} / ${loadavg()
        .map((l) => l.toFixed(2))
        .join(' ')}`,
    );
    const row = (name: string, f: Figures, ratio: string) =>
      console.log(
        `  ${name.padEnd(48)} ${f.rps.toFixed(0).padStart(6)} req/s  p50 ${String(f.p50).padStart(4)} ms  p99 ${String(f.p99).padStart(4)} ms  ${ratio}${f.non2xx || f.errors ? `  (${f.non2xx} non-2xx, ${f.errors} errors)` : ''}`,
      );
    row('bare Express route', reference, '');
    let ok = reference.non2xx === 0;
    for (const [name, f, target] of results) {
      const ratio = f.rps / reference.rps;
      const met = target === null || ratio >= target;
      ok &&= met && f.non2xx === 0 && f.errors === 0;
      row(
        name,
        f,
        `${(ratio * 100).toFixed(0).padStart(3)} % of bare${target === null ? '' : ` (target >= ${target * 100} %${met ? '' : ', MISSED'})`}`,
      );
    }
    console.log(`  session rows written during the reads  ${sessionRowWrites} (target 0)`);
    console.log(`  API log written                         ${(statSync(apiLog).size / 1e6).toFixed(1)} MB (${apiLog})`);
    ok &&= sessionRowWrites === 0;
    console.log(ok ? '  result  targets met' : '  result  TARGET MISSED');
    await db.destroy();
    await stopApi();
    return ok ? 0 : 1;
  } finally {
    await stopAll?.();
    cluster.remove();
  }
}

const LOAD_BEFORE = loadavg()
  .map((l) => l.toFixed(2))
  .join(' ');

/** Inserts and updates of the session table so far, from PostgreSQL's table statistics. */
async function sessionWrites(db: ReturnType<typeof createDb>): Promise<number> {
  await db.raw('select pg_stat_clear_snapshot()');
  const { rows } = await db.raw(
    `select n_tup_ins + n_tup_upd + n_tup_del as n from pg_stat_user_tables where relname = 'sessions'`,
  );
  return Number(rows[0].n);
}

/**
 * The principal's session, written the way the session store keeps it, with the signed cookie
 * express-session expects. (The bench has no identity provider; tests cover the real sign-in.)
 */
async function principalSession(db: ReturnType<typeof createDb>): Promise<string> {
  const sid = randomBytes(24).toString('base64url');
  const expires = new Date(Date.now() + 3_600_000);
  const u = DEMO.users.principal;
  await db('sessions').insert({
    sid,
    sess: JSON.stringify({
      cookie: { originalMaxAge: 3_600_000, expires: expires.toISOString(), httpOnly: true, path: '/', sameSite: 'lax' },
      auth: {
        userId: u.id,
        issuer: 'bench',
        subject: 'bench',
        email: u.email,
        name: u.name,
        signedInAt: Date.now(),
        idToken: '',
      },
    }),
    expire: expires,
  });
  const signed = `s:${sid}.${createHmac('sha256', SECRET).update(sid).digest('base64').replace(/=+$/, '')}`;
  return `trabeate.sid=${encodeURIComponent(signed)}`;
}

main().then(
  (code) => process.exit(code),
  (err) => {
    console.error(err);
    process.exit(1);
  },
);
