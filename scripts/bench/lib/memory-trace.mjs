// Preloaded (node --import) into the API by a bench run with BENCH_MEMORY_TRACE=1: every
// BENCH_MEMORY_TRACE_MS (100 by default) it appends one JSON line to BENCH_MEMORY_TRACE_FILE with
// process.memoryUsage() and the sizes of V8's young and old generations, so the bench can say
// where the process's memory goes in each phase. Bench-only: production never loads it.
import { appendFileSync, writeFileSync } from 'node:fs';
import { setInterval } from 'node:timers';
import { getHeapSpaceStatistics } from 'node:v8';

const file = process.env.BENCH_MEMORY_TRACE_FILE;
if (file) {
  writeFileSync(file, '');
  const every = Number(process.env.BENCH_MEMORY_TRACE_MS ?? 100);
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
