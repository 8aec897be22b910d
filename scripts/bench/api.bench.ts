// npm run bench:api: the bundled API with production settings, under autocannon (100 connections),
// beside a bare Express route measured in the same run (before and after the API, averaged). A firm with 500 more projects and their
// stages; a principal's session written as the session store keeps it, so every request goes
// through the real middleware (logging, security headers, session, caller, access guard, CSRF
// where used). Prints requests/s, p50, p99 and the ratio to bare Express; targets: /api/me >= 50 %,
// the projects list >= 30 %, and no session-table write during the reads. BENCH_SECONDS changes
// the length of each measurement; BENCH_EXPLAIN=1 prints the list query's plan; BENCH_ONLY measures only the targets whose name contains it.
// Exits 1 when a target is missed.
import { statSync } from 'node:fs';
import { loadavg } from 'node:os';
import autocannon from 'autocannon';
import { createDb } from '../../apps/server/src/db/db';
import { DEMO } from '../../seeds/demo';
import { addBenchProjects } from './lib/bench-firm';
import { bareExpressService, benchBundledApi, cpuSeconds, listenerPid } from './lib/harness';
import { explainQueries } from './lib/explain';
import { sessionCookie } from './lib/session-cookie';

const SECONDS = Number(process.env.BENCH_SECONDS ?? 10);
const CONNECTIONS = 100;
const LOAD_BEFORE = loadavg()
  .map((l) => l.toFixed(2))
  .join(' ');

interface Figures {
  rps: number;
  p50: number;
  p99: number;
  non2xx: number;
  errors: number;
  /** CPU per request (ms) of the server process, and of PostgreSQL's processes. */
  cpuMs: number;
  dbCpuMs: number;
}

/** The processes whose CPU a measurement counts: the server's, and PostgreSQL's postmaster. */
interface Watched {
  server: number;
  postgres?: number;
}

async function measure(url: string, watched: Watched, cookie?: string): Promise<Figures> {
  const opts = { url, connections: CONNECTIONS, headers: cookie ? { cookie } : {} };
  await autocannon({ ...opts, duration: 2 }); // warm-up: JIT, pool connections, PostgreSQL caches
  const cpu0 = cpuSeconds(watched.server);
  const db0 = watched.postgres ? cpuSeconds(watched.postgres, true) : 0;
  const r = await autocannon({ ...opts, duration: SECONDS });
  const perRequest = (seconds: number) => (r.requests.total ? (seconds * 1000) / r.requests.total : 0);
  return {
    rps: r.requests.average,
    p50: r.latency.p50,
    p99: r.latency.p99,
    non2xx: r.non2xx,
    errors: r.errors + r.timeouts,
    cpuMs: perRequest(cpuSeconds(watched.server) - cpu0),
    dbCpuMs: watched.postgres ? perRequest(cpuSeconds(watched.postgres, true) - db0) : 0,
  };
}

let busyProject = '';

benchBundledApi(
  {
    name: 'api',
    fastDatabase: false,
    extraPorts: ['bare'],
    // BENCH_PROFILE=1 writes a CPU profile of the API (open it in Chrome's DevTools) to tmp/.
    // BENCH_API_FLAGS adds V8/Node flags to the API process (to try a setting before production takes it).
    apiFlags: [
      ...(process.env.BENCH_PROFILE ? ['--cpu-prof', '--cpu-prof-dir=tmp/bench-profiles'] : []),
      ...(process.env.BENCH_API_FLAGS?.split(' ').filter(Boolean) ?? []),
    ],
    apiEnv: (ctx) => ({
      NODE_ENV: 'production',
      DATABASE_URL: ctx.databaseUrl,
      LOG_LEVEL: 'info',
      PUBLIC_URL: ctx.apiUrl,
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
      ...(process.env.DATABASE_POOL_MAX ? { DATABASE_POOL_MAX: process.env.DATABASE_POOL_MAX } : {}),
    }),
    services: (ctx) => [bareExpressService(ctx.ports.bare)],
    prepare: async (db) => {
      busyProject = await addBenchProjects(db, 500, 400);
      await db.raw('analyze');
    },
  },
  async (ctx) => {
    const db = createDb(ctx.databaseUrl, 2);
    try {
      // The session cookie and the XSRF-TOKEN cookie /api/me issues, both sent back as a browser does.
      const { cookie } = await sessionCookie(ctx.apiUrl, db, ctx.secret, DEMO.users.principal);
      const base = ctx.apiUrl;
      const list = `${base}/api/projects?page=3&pageSize=25&sort=updatedAt&direction=desc&status=active&q=corrow`;
      const targets: Array<[string, string, number | null]> = [
        // For reading the others: the public health check, no session.
        ['/api/health (no session)', `${base}/api/health`, null],
        ['/api/me', `${base}/api/me`, 0.5],
        ['projects list (page 3 of 25, sorted, filtered)', list, 0.3],
        ['project page data (/full)', `${base}/api/projects/${busyProject}/full`, null],
        ['activity log (50 of 400)', `${base}/api/projects/${busyProject}/activity`, null],
      ];
      if (process.env.BENCH_EXPLAIN) {
        const { listProjects } = await import('../../apps/server/src/projects/projects.repository');
        const { loadCallerRow } = await import('../../apps/server/src/auth/caller.repository');
        const { toCaller } = await import('../../apps/server/src/auth/session');
        const { projectListQuerySchema } = await import('@trabeate/contracts');
        const caller = toCaller((await loadCallerRow(db, DEMO.users.principal.id))!);
        const filters = projectListQuerySchema.parse(Object.fromEntries(new URL(list).searchParams));
        await explainQueries(db, 'Projects list query plans', [
          ['projects list (page 3 of 25, sorted, filtered)', () => listProjects(db, caller, filters)],
        ]);
      }
      for (const [, url] of targets) {
        const res = await fetch(url, { headers: { cookie } });
        if (res.status !== 200) throw new Error(`${url} answered ${res.status}: ${(await res.text()).slice(0, 200)}`);
      }

      // The bench's own session insert must be in the statistics before they are read (backends
      // publish theirs about once a second, later on a busy machine), or it counts as a read's write.
      await new Promise((r) => setTimeout(r, 2000));
      const writesBefore = await sessionWrites(db);
      const api = { server: listenerPid(ctx.ports.api), postgres: listenerPid(ctx.ports.postgres) };
      // Bare Express is measured before and after the API's routes and the two are averaged, so a
      // change in other work on the machine during the run weighs on both sides of each ratio.
      const bare = { url: `http://127.0.0.1:${ctx.ports.bare}/bare`, pid: listenerPid(ctx.ports.bare) };
      const bareBefore = await measure(bare.url, { server: bare.pid });
      const results: Array<[string, Figures, number | null]> = [];
      // BENCH_ONLY=me (a part of a target's name) measures only the targets named, e.g. for a profile.
      const only = process.env.BENCH_ONLY;
      for (const [name, url, target] of targets) {
        if (only && !name.includes(only)) continue;
        results.push([name, await measure(url, api, cookie), target]);
      }
      const bareAfter = await measure(bare.url, { server: bare.pid });
      const reference = meanOf(bareBefore, bareAfter);
      await new Promise((r) => setTimeout(r, 1500)); // PostgreSQL publishes table statistics about once a second
      const sessionRowWrites = (await sessionWrites(db)) - writesBefore;

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
      row('bare Express route (mean of before and after)', reference, '');
      console.log(
        `    bare before ${bareBefore.rps.toFixed(0)} req/s, after ${bareAfter.rps.toFixed(0)} req/s (the spread is the machine's)`,
      );
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
      // Less sensitive to other work on the machine than requests/s: what each request cost.
      console.log(
        '  CPU per request (ms)                              server  PostgreSQL  bare / (server + PostgreSQL)',
      );
      const cpuRow = (name: string, f: Figures) =>
        console.log(
          `  ${name.padEnd(48)} ${f.cpuMs.toFixed(3).padStart(7)}  ${f.dbCpuMs.toFixed(3).padStart(10)}  ${f === reference || f.cpuMs + f.dbCpuMs === 0 ? '' : `${((reference.cpuMs / (f.cpuMs + f.dbCpuMs)) * 100).toFixed(0).padStart(3)} %`}`,
        );
      cpuRow('bare Express route', reference);
      for (const [name, f] of results) cpuRow(name, f);
      console.log(`  session rows written during the reads  ${sessionRowWrites} (target 0)`);
      console.log(
        `  API log written                         ${(statSync(ctx.apiLog).size / 1e6).toFixed(1)} MB (${ctx.apiLog})`,
      );
      ok &&= sessionRowWrites === 0;
      console.log(ok ? '  result  targets met' : '  result  TARGET MISSED');
      return ok;
    } finally {
      await db.destroy();
    }
  },
);

/** The mean of two measurements of the same route. */
function meanOf(a: Figures, b: Figures): Figures {
  const mean = (x: number, y: number) => (x + y) / 2;
  return {
    rps: mean(a.rps, b.rps),
    p50: mean(a.p50, b.p50),
    p99: mean(a.p99, b.p99),
    non2xx: a.non2xx + b.non2xx,
    errors: a.errors + b.errors,
    cpuMs: mean(a.cpuMs, b.cpuMs),
    dbCpuMs: mean(a.dbCpuMs, b.dbCpuMs),
  };
}

/** Inserts and updates of the session table so far, from PostgreSQL's table statistics. */
async function sessionWrites(db: ReturnType<typeof createDb>): Promise<number> {
  await db.raw('select pg_stat_clear_snapshot()');
  const { rows } = await db.raw(
    `select n_tup_ins + n_tup_upd + n_tup_del as n from pg_stat_user_tables where relname = 'sessions'`,
  );
  return Number(rows[0].n);
}
