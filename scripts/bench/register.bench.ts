// npm run bench:register: the drawing register under load. A project with 2,000 drawings of 5
// revisions each: requests per second and latency of the register's first page, sorted and
// filtered, beside a bare Express route answering in the same run; then a transmittal of 200
// files totalling about 1 GB downloaded as one ZIP through the API (a child process running the
// bundled server, so its memory is its own), beside reading the same objects straight from the
// S3 fake. Targets: API peak RSS under 200 MB; ZIP throughput at least half the direct read.
// BENCH_DRAWINGS, BENCH_ZIP_FILES and BENCH_ZIP_MIB make it smaller; BENCH_EXPLAIN=1 also prints
// the register queries' plans. The API's memory is printed per phase (VmRSS from /proc);
// BENCH_MEMORY_TRACE=1 adds what V8 holds (heap, young generation, buffers) sampled inside the
// API. Exits 1 when a target is missed.
import { randomUUID } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
import { request } from 'node:http';
import autocannon from 'autocannon';
import { s3Service } from '../lib/fake-services';
import { log } from '../lib/proc';
import { createDb } from '../../apps/server/src/db/db';
import { createObjectStore, type ObjectStore } from '../../apps/server/src/storage';
import { DEMO } from '../../seeds/demo';
import { pdfLikeStream } from './lib/generate';
import {
  bareExpressService,
  benchBundledApi,
  cpuSeconds,
  listenerPid,
  rssOf,
  sessionCookie,
  type BenchContext,
} from './lib/harness';

const DRAWINGS = Number(process.env.BENCH_DRAWINGS ?? 2000);
const ZIP_FILES = Number(process.env.BENCH_ZIP_FILES ?? 200);
const ZIP_MIB = Number(process.env.BENCH_ZIP_MIB ?? 1000);
const MiB = 1024 * 1024;
const PROJECT = DEMO.projects.kestrel.id;
// '1': sampled; 'gc': also all garbage collected at the end of each phase (which changes the peak).
const MEMORY_TRACE = ['1', 'gc'].includes(process.env.BENCH_MEMORY_TRACE ?? '');
const TRACE_GC = process.env.BENCH_MEMORY_TRACE === 'gc';
const traceFile = `tmp/bench-register-memory-${process.pid}.jsonl`;

const s3Env = (port: number) => ({
  S3_ENDPOINT: `http://127.0.0.1:${port}`,
  S3_REGION: 'us-east-1',
  S3_BUCKET: 'trabeate',
  S3_ACCESS_KEY_ID: 'S3RVER',
  S3_SECRET_ACCESS_KEY: 'S3RVER',
  S3_FORCE_PATH_STYLE: 'true',
});

benchBundledApi(
  {
    name: 'register',
    fastDatabase: true,
    extraPorts: ['s3', 'bare'],
    apiFlags: [
      ...(MEMORY_TRACE ? ['--import', './scripts/bench/lib/memory-trace.mjs'] : []),
      ...(TRACE_GC ? ['--expose-gc'] : []),
      // Node flags for an investigation (BENCH_API_FLAGS='--cpu-prof --cpu-prof-dir=tmp/prof', say).
      ...(process.env.BENCH_API_FLAGS?.split(' ').filter(Boolean) ?? []),
    ],
    apiEnv: (ctx) => ({
      NODE_ENV: 'test',
      DATABASE_URL: ctx.databaseUrl,
      LOG_LEVEL: 'warn',
      PUBLIC_URL: ctx.apiUrl,
      ...s3Env(ctx.ports.s3),
      SMTP_HOST: '127.0.0.1',
      SMTP_PORT: '9',
      ...(MEMORY_TRACE ? { BENCH_MEMORY_TRACE_FILE: traceFile } : {}),
    }),
    services: (ctx) => [s3Service({ port: ctx.ports.s3 }), bareExpressService(ctx.ports.bare, { items: [], total: 0 })],
  },
  async (ctx) => {
    const store = createObjectStore({
      endpoint: s3Env(ctx.ports.s3).S3_ENDPOINT,
      region: 'us-east-1',
      bucket: 'trabeate',
      credentials: { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' },
      forcePathStyle: true,
    });
    try {
      await store.ensureBucket();
      const apiPid = listenerPid(ctx.ports.api);
      const phases = phaseRecorder(apiPid);
      await phases.end('started (health check only)');
      const db = createDb(ctx.databaseUrl, 2);

      // 1. The register: DRAWINGS drawings, 5 revisions each (4 superseded, the 5th in some state).
      let t0 = performance.now();
      await db.raw(
        `insert into drawings (id, firm_id, project_id, number, title, stage_key, sheet_size, scale, created_by)
         select gen_random_uuid(), ?, ?, 'B-' || lpad(g::text, 5, '0'), 'Bench sheet ' || g,
           (array['column_layout','beam_framing','slab_panels','stairs','foundations'])[1 + g % 5],
           (array['A0','A1','A2','A3','A4'])[1 + g % 5], '1:100', ?
         from generate_series(1, ?) g`,
        [DEMO.firm.id, PROJECT, DEMO.users.engineerA.id, DRAWINGS],
      );
      await db.raw(
        `insert into drawing_revisions (drawing_id, project_id, seq, series, code, suitability, purpose, revision_date, state, drawn_by, issued_at)
         select d.id, d.project_id, s, 'preliminary', 'P0' || s, (array['S1','S2','S3','S4'])[1 + (s + length(d.number)) % 4],
           'information', date '2026-01-01' + (s * 7 + (substr(d.number, 3)::int % 60)),
           case when s < 5 then 'superseded' else (array['issued','approved','checked','draft'])[1 + substr(d.number, 3)::int % 4] end,
           ?, case when s < 5 then now() else null end
         from drawings d cross join generate_series(1, 5) s where d.number like 'B-%'`,
        [DEMO.users.engineerA.id],
      );
      await db.raw('analyze');
      log(
        'bench',
        `register of ${DRAWINGS} drawings x 5 revisions made in ${((performance.now() - t0) / 1000).toFixed(1)} s`,
      );

      if (process.env.BENCH_EXPLAIN) await explainRegister(db);

      const auth = await signedInCookies(ctx, db, DEMO.users.principal);
      const registerPath = `/api/projects/${PROJECT}/drawings?sort=date&direction=desc&stageKey=beam_framing&state=issued&page=1&pageSize=25`;
      const check = await fetch(`${ctx.apiUrl}${registerPath}`, { headers: { cookie: auth.cookie } });
      const firstBody = await check.text();
      const first = JSON.parse(firstBody) as { total: number; items: unknown[] };
      if (check.status !== 200 || first.items.length === 0) throw new Error(`register answered ${check.status}`);
      await phases.end('signed in, one register page');
      // Each run also takes the API's CPU time per request: what a request costs the server (and
      // its garbage collector), which other work on the machine changes much less than req/s.
      const load = async (url: string, headers: Record<string, string> = {}) => {
        const cpu0 = cpuSeconds(apiPid);
        const result = await autocannon({ url, connections: 10, duration: 10, headers });
        const served = result.requests.total;
        return Object.assign(result, { apiCpuMs: served ? ((cpuSeconds(apiPid) - cpu0) * 1000) / served : 0 });
      };
      const bareResult = await autocannon({
        url: `http://127.0.0.1:${ctx.ports.bare}/bare`,
        connections: 10,
        duration: 10,
      });
      await phases.end('bare route load (API idle)');
      const registerResult = await load(`${ctx.apiUrl}${registerPath}`, { cookie: auth.cookie });
      await phases.end('register first page, 10 connections');
      // The page a register opens on: every drawing, by number, no filter.
      const defaultPath = `/api/projects/${PROJECT}/drawings?page=1&pageSize=25`;
      const defaultResult = await load(`${ctx.apiUrl}${defaultPath}`, { cookie: auth.cookie });
      await phases.end('register by number, 10 connections');

      // 2. A transmittal of ZIP_FILES files totalling ZIP_MIB MiB, stored in the S3 fake.
      const fileBytes = Math.floor((ZIP_MIB * MiB) / ZIP_FILES);
      t0 = performance.now();
      const transmittalId = await makeTransmittal(db, store, fileBytes);
      log(
        'bench',
        `${ZIP_FILES} files of ${(fileBytes / MiB).toFixed(1)} MiB stored in ${((performance.now() - t0) / 1000).toFixed(1)} s`,
      );
      const keys: string[] = (
        await db('revision_files as f')
          .join('transmittal_items as i', 'i.revision_id', 'f.revision_id')
          .where('i.transmittal_id', transmittalId)
          .select('f.object_key')
      ).map((r: { object_key: string }) => r.object_key);
      await db.destroy();

      t0 = performance.now();
      let directBytes = 0;
      for (const key of keys) {
        const o = await store.getStream(key);
        for await (const c of o.body) directBytes += (c as Buffer).length;
      }
      const directSeconds = (performance.now() - t0) / 1000;
      await phases.end('files stored, direct read (API idle)');

      const before = rssOf(apiPid).rss;
      let sampled = before;
      const sampler = setInterval(() => (sampled = Math.max(sampled, rssOf(apiPid).rss)), 50);
      t0 = performance.now();
      const zip = await download(
        ctx.ports.api,
        `/api/projects/${PROJECT}/transmittals/${transmittalId}/zip`,
        auth.cookie,
      );
      const zipSeconds = (performance.now() - t0) / 1000;
      clearInterval(sampler);
      await phases.end('ZIP download');
      const peakMb = rssOf(apiPid).hwm / 1e6;
      if (zip.status !== 200) throw new Error(`the ZIP answered ${zip.status}`);
      const ratio = zip.bytes / zipSeconds / (directBytes / directSeconds);

      const lat = (r: autocannon.Result & { apiCpuMs?: number }) =>
        `${r.requests.average.toFixed(0)} req/s, latency p50 ${r.latency.p50} ms, p99 ${r.latency.p99} ms, errors ${r.errors + r.non2xx}` +
        (r.apiCpuMs === undefined ? '' : `, API CPU ${r.apiCpuMs.toFixed(2)} ms/request`);
      console.log('\nRegister benchmark');
      console.log(
        `  register             ${DRAWINGS} drawings x 5 revisions; first page: ${first.items.length} of ${first.total} (beam framing, issued, newest date first), reply ${(Buffer.byteLength(firstBody) / 1024).toFixed(1)} KiB`,
      );
      console.log(`  bare Express route   ${lat(bareResult)}`);
      console.log(`  register first page  ${lat(registerResult)}`);
      console.log(`  register by number   ${lat(defaultResult)} (no filter, default sort)`);
      console.log(
        `  ZIP                  ${ZIP_FILES} files, ${(zip.bytes / MiB).toFixed(0)} MiB (Content-Length ${zip.contentLength})`,
      );
      console.log(`  direct from S3 fake  ${(directBytes / MiB / directSeconds).toFixed(1)} MiB/s`);
      console.log(
        `  ZIP through the API  ${(zip.bytes / MiB / zipSeconds).toFixed(1)} MiB/s (${(ratio * 100).toFixed(0)} % of direct; target >= 50 %)`,
      );
      console.log(
        `  API peak RSS         ${peakMb.toFixed(1)} MB (VmHWM; sampled ${(sampled / 1e6).toFixed(1)} MB, ${(before / 1e6).toFixed(1)} MB before; target < 200 MB)`,
      );
      phases.print(MEMORY_TRACE ? traceFile : undefined);
      const ok = peakMb < 200 && ratio >= 0.5 && zip.bytes >= directBytes;
      console.log(ok ? '  result               targets met' : '  result               TARGET MISSED');
      return ok;
    } finally {
      store.close();
    }
  },
);

/**
 * BENCH_EXPLAIN=1: the plans and timings (EXPLAIN ANALYZE) of the register's queries at bench
 * size, as the repository builds them: the firm's first page (filtered, and the default order),
 * the client's, and one drawing's revision history with its files.
 */
async function explainRegister(db: import('knex').Knex): Promise<void> {
  const repo = await import('../../apps/server/src/drawings/drawings.repository');
  const { drawingListQuerySchema } = await import('@trabeate/contracts');
  const captured: Array<{ sql: string; bindings: unknown[] }> = [];
  const onQuery = (q: { sql: string; bindings?: unknown[] }) =>
    captured.push({ sql: q.sql, bindings: q.bindings ?? [] });
  const drawingId = (await db('drawings').where({ project_id: PROJECT, number: 'B-00042' }).first('id')).id as string;
  const cases: Array<[string, () => Promise<unknown>]> = [
    [
      'firm, beam framing, issued, newest date first',
      () =>
        repo.listRegister(
          db,
          PROJECT,
          false,
          drawingListQuerySchema.parse({ sort: 'date', direction: 'desc', stageKey: 'beam_framing', state: 'issued' }),
        ),
    ],
    ['firm, default order', () => repo.listRegister(db, PROJECT, false, drawingListQuerySchema.parse({}))],
    ['client, default order', () => repo.listRegister(db, PROJECT, true, drawingListQuerySchema.parse({}))],
    ['one drawing’s revisions', () => repo.revisionsOf(db, drawingId, false)],
  ];
  console.log('\nRegister query plans (EXPLAIN ANALYZE)');
  for (const [name, call] of cases) {
    captured.length = 0;
    db.on('query', onQuery);
    await call();
    db.removeListener('query', onQuery);
    for (const q of captured) {
      // The event carries PostgreSQL's numbered placeholders, in order; knex.raw takes "?".
      const sql = q.sql.replace(/\$\d+/g, '?');
      const plan = await db.raw(
        `explain (analyze, buffers) ${sql}`,
        q.bindings as readonly import('knex').Knex.Value[],
      );
      console.log(`\n-- ${name}`);
      for (const row of plan.rows as Array<{ 'QUERY PLAN': string }>) console.log(row['QUERY PLAN']);
    }
  }
}

/** ZIP_FILES issued revisions, each with one stored file, carried by one transmittal. */
async function makeTransmittal(db: import('knex').Knex, store: ObjectStore, fileBytes: number): Promise<string> {
  const transmittalId = randomUUID();
  await db('transmittals').insert({
    id: transmittalId,
    firm_id: DEMO.firm.id,
    project_id: PROJECT,
    number: 9000,
    purpose: 'information',
    issued_by: DEMO.users.principal.id,
    links_expire_at: new Date(Date.now() + 86_400_000),
  });
  for (let i = 1; i <= ZIP_FILES; i++) {
    const [drawing] = await db('drawings')
      .insert({
        firm_id: DEMO.firm.id,
        project_id: PROJECT,
        number: `Z-${String(i).padStart(4, '0')}`,
        title: `Bundle sheet ${i}`,
        stage_key: 'slab_panels',
        sheet_size: 'A1',
        scale: '1:50',
      })
      .returning('id');
    const [revision] = await db('drawing_revisions')
      .insert({
        drawing_id: drawing.id,
        project_id: PROJECT,
        seq: 1,
        series: 'preliminary',
        code: 'P01',
        suitability: 'S2',
        purpose: 'information',
        revision_date: '2026-12-01',
        drawn_by: DEMO.users.engineerA.id,
      })
      .returning('id');
    const fileId = randomUUID();
    const key = `drawings/${PROJECT}/${revision.id}/${fileId}`;
    await store.putStream(key, pdfLikeStream(fileBytes, i), { contentType: 'application/pdf' });
    await db('revision_files').insert({
      id: fileId,
      revision_id: revision.id,
      project_id: PROJECT,
      role: 'pdf',
      file_name: `Z-${i}.pdf`,
      object_key: key,
      size_bytes: fileBytes,
      sha256: '0'.repeat(64),
      content_type: 'application/pdf',
      uploaded_by: DEMO.users.engineerA.id,
    });
    await db('drawing_revisions').where({ id: revision.id }).update({ state: 'issued', issued_at: new Date() });
    await db('transmittal_items').insert({ transmittal_id: transmittalId, revision_id: revision.id, position: i });
  }
  return transmittalId;
}

interface Phase {
  name: string;
  from: number;
  to: number;
  rss: number;
  hwm: number;
}

/**
 * The API's memory at the end of each phase of the run (VmRSS, and VmHWM: the peak so far), and
 * with a trace file (BENCH_MEMORY_TRACE=1) the highest of each figure V8 reports within the phase.
 */
function phaseRecorder(pid: number) {
  const phases: Phase[] = [];
  let from = Date.now();
  const mb = (n: number | undefined) => (n === undefined ? '-' : (n / 1e6).toFixed(1)).padStart(7);
  return {
    async end(name: string) {
      const { rss, hwm } = rssOf(pid);
      phases.push({ name, from, to: Date.now(), rss, hwm });
      if (TRACE_GC) {
        process.kill(pid, 'SIGUSR2');
        await new Promise((r) => setTimeout(r, 500));
      }
      from = Date.now();
    },
    print(traceFile?: string) {
      type Figure =
        'rss' | 'heapTotal' | 'heapUsed' | 'external' | 'arrayBuffers' | 'newSpace' | 'gcMs' | 'minorGcs' | 'majorGcs';
      type Sample = Record<Figure | 't', number> & { gc?: boolean };
      const samples: Sample[] =
        traceFile && existsSync(traceFile)
          ? readFileSync(traceFile, 'utf8')
              .split('\n')
              .filter(Boolean)
              .map((l) => JSON.parse(l) as Sample)
          : [];
      console.log(
        '\nAPI memory by phase, MB (VmRSS at the end of the phase, VmHWM so far; traced: highest in phase; GC: pause time and collections in the phase)',
      );
      const traced = samples.length > 0;
      console.log(
        `  ${'phase'.padEnd(40)} ${'VmRSS'.padStart(7)} ${'VmHWM'.padStart(7)}` +
          (traced
            ? ` ${'rss'.padStart(7)} ${'heapTot'.padStart(7)} ${'heapUsed'.padStart(7)} ${'young'.padStart(7)} ${'extern'.padStart(7)} ${'arrBuf'.padStart(7)} ${'GC ms'.padStart(7)} ${'minor'.padStart(6)} ${'major'.padStart(6)} samples`
            : ''),
      );
      for (const p of phases) {
        const inPhase = samples.filter((s) => s.t >= p.from && s.t <= p.to && !s.gc);
        const afterGc = samples.find((s) => s.gc && s.t >= p.to);
        const top = (k: Figure) => (inPhase.length ? Math.max(...inPhase.map((s) => s[k])) : undefined);
        // Time in garbage collection during the phase: the running total at its end less at its start.
        const at = (t: number, k: Figure) => samples.filter((s) => s.t <= t).at(-1)?.[k] ?? 0;
        const during = (k: Figure, width: number) => (at(p.to, k) - at(p.from, k)).toFixed(0).padStart(width);
        const gcMs = `${during('gcMs', 7)} ${during('minorGcs', 6)} ${during('majorGcs', 6)}`;
        console.log(
          `  ${p.name.padEnd(40)} ${mb(p.rss)} ${mb(p.hwm)}` +
            (traced
              ? ` ${mb(top('rss'))} ${mb(top('heapTotal'))} ${mb(top('heapUsed'))} ${mb(top('newSpace'))} ${mb(top('external'))} ${mb(top('arrayBuffers'))} ${gcMs} ${String(inPhase.length).padStart(7)}` +
                (afterGc
                  ? ` kept after full GC: heapUsed ${mb(afterGc.heapUsed).trim()}, arrBuf ${mb(afterGc.arrayBuffers).trim()}`
                  : '')
              : ''),
        );
      }
      if (traced) console.log(`  (samples in ${traceFile}; young = V8's new space, both semi-spaces)`);
    },
  };
}

/** Reads a response to the end, counting bytes and holding none. */
function download(port: number, path: string, cookie: string) {
  return new Promise<{ status: number; bytes: number; contentLength: string | undefined }>((resolve, reject) => {
    const req = request({ host: '127.0.0.1', port, path, headers: { cookie }, agent: false }, (res) => {
      let bytes = 0;
      res.on('data', (c: Buffer) => (bytes += c.length));
      res.on('end', () =>
        resolve({ status: res.statusCode ?? 0, bytes, contentLength: res.headers['content-length'] }),
      );
      res.on('error', reject);
    });
    req.on('error', reject);
    req.end();
  });
}

/** A session row as the store keeps it and its signed cookie (the bench has no identity provider). */
async function signedInCookies(
  ctx: BenchContext,
  db: import('knex').Knex,
  u: { id: string; email: string; name: string },
): Promise<{ cookie: string }> {
  const cookie = await sessionCookie(db, ctx.secret, u);
  const me = await fetch(`${ctx.apiUrl}/api/me`, { headers: { cookie } });
  if (me.status !== 200) throw new Error(`GET /api/me answered ${me.status}`);
  return { cookie };
}
