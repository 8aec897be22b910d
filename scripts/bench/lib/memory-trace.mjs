// Preloaded (node --import) into the API by a bench run with BENCH_MEMORY_TRACE=1: every
// BENCH_MEMORY_TRACE_MS (100 by default) it appends one JSON line to BENCH_MEMORY_TRACE_FILE with
// process.memoryUsage(), the sizes of V8's young and old generations and the time spent in garbage
// collection so far (gcMs), so the bench can say where the process's memory goes in each phase and
// what collecting it costs. Bench-only: production never loads it.
import { appendFileSync, writeFileSync } from 'node:fs';
import { constants, PerformanceObserver } from 'node:perf_hooks';
import { setInterval } from 'node:timers';
import { getHeapSpaceStatistics } from 'node:v8';

const file = process.env.BENCH_MEMORY_TRACE_FILE;
if (file) {
  writeFileSync(file, '');
  const every = Number(process.env.BENCH_MEMORY_TRACE_MS ?? 100);
  // Pause time depends on what else the machine runs; the number of collections much less.
  let gcMs = 0;
  let minorGcs = 0;
  let majorGcs = 0;
  new PerformanceObserver((list) => {
    for (const e of list.getEntries()) {
      gcMs += e.duration;
      const kind = /** @type {{ kind?: number }} */ (e.detail)?.kind;
      if (kind === constants.NODE_PERFORMANCE_GC_MINOR) minorGcs++;
      if (kind === constants.NODE_PERFORMANCE_GC_MAJOR) majorGcs++;
    }
  }).observe({ entryTypes: ['gc'] });
  const sample = (gc = false) => {
    const m = process.memoryUsage();
    const spaces = Object.fromEntries(getHeapSpaceStatistics().map((s) => [s.space_name, s.space_size]));
    const line = {
      t: Date.now(),
      rss: m.rss,
      heapTotal: m.heapTotal,
      heapUsed: m.heapUsed,
      external: m.external,
      arrayBuffers: m.arrayBuffers,
      newSpace: spaces.new_space ?? 0,
      oldSpace: (spaces.old_space ?? 0) + (spaces.code_space ?? 0) + (spaces.large_object_space ?? 0),
      gcMs,
      minorGcs,
      majorGcs,
      ...(gc ? { gc } : {}),
    };
    appendFileSync(file, `${JSON.stringify(line)}\n`);
  };
  sample();
  setInterval(sample, every).unref();
  const collect = globalThis.gc;
  if (typeof collect === 'function') {
    process.on('SIGUSR2', () => {
      collect();
      sample(true);
    });
  }
}
