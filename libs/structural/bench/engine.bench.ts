// Benchmark: a generated scheme of 900 columns on a 30 × 30 grid, 10 storeys. Times the full
// check and analysis (median of several runs) and, beside it, a plain dense-matrix solve of the
// same beam lines with the same number of load arrangements, then prints both and their ratio.
// Run: npm run bench:engine
import { analyseScheme } from '../src/index';
import { generatedScheme } from './generated';
import { assembleDense, BeamModel, memberTerms, prepareBeam, solvePacked, Support } from '../src/beam';
import { solveDense } from '../src/banded';
import { deriveLayout } from '../src/layout';
import { loadPatterns } from '../src/envelope';
import { cpus, loadavg } from 'node:os';
import { execFileSync } from 'node:child_process';
import { join } from 'node:path';

const RUNS = 11;
// the engine runs again and again while a layout is edited; let the JIT settle before timing
const WARMUP = 5;

const median = (v: number[]) => [...v].sort((a, b) => a - b)[Math.floor(v.length / 2)];

function time(fn: () => void): number[] {
  for (let w = 0; w < WARMUP; w++) fn();
  const out: number[] = [];
  for (let r = 0; r < RUNS; r++) {
    const t0 = performance.now();
    fn();
    out.push(performance.now() - t0);
  }
  return out;
}

const scheme = generatedScheme();
let result = analyseScheme(scheme);
if (!result.ok) {
  console.error(result.problems.slice(0, 5));
  process.exit(1);
}
const full = time(() => {
  result = analyseScheme(scheme);
});

// the same beam lines as stiffness systems, with the same number of right-hand sides per line
const layout = deriveLayout(scheme);
const systems = layout.lines.map((l) => {
  const model: BeamModel = {
    members: l.members.map((m) => ({ lengthM: m.lengthM, eiKNm2: (30000 * 1000 * 0.3 * 0.5 ** 3) / 12 })),
    supports: l.nodes.map((n): Support => (n.columnId ? 'pin' : 'free')),
  };
  const terms = model.members.map((m) =>
    memberTerms(m.lengthM, [{ kind: 'linear', member: 0, fromM: 0, toM: m.lengthM, startKNPerM: 30, endKNPerM: 30 }]),
  );
  // as the engine does: imposed load on odd and on even spans per unit (shared by the combinations
  // and both level kinds), plus dead and imposed service solves on each level kind; the
  // adjacent-span arrangements come from their running extremes, without solves of their own
  const rhs = (loadPatterns(model).length > 3 ? 2 : 0) + 2 * 2;
  return { model, terms, rhs };
});
const banded = time(() => {
  for (const s of systems) {
    // as the engine does: factorise once, then one forward and back substitution per right-hand side
    const p = prepareBeam(s.model);
    const nm = s.model.members.length;
    const T = new Float64Array(4 * nm);
    s.terms.forEach((t, i) => T.set([t.fa, t.fb, t.ra, t.rb], 4 * i));
    const rhs = new Float64Array(p.nEq),
      u = new Float64Array(2 * (nm + 1)),
      em = new Float64Array(2 * nm);
    for (let k = 0; k < s.rhs; k++) solvePacked(p, T, rhs, u, em);
  }
});
const dense = time(() => {
  for (const s of systems) {
    // the plain way: assemble the full matrix and eliminate for each arrangement
    for (let k = 0; k < s.rhs; k++) {
      const { n, a, rhs } = assembleDense(s.model, s.terms);
      solveDense(n, a, rhs);
    }
  }
});

const fullMs = median(full);
const denseMs = median(dense);
const bandMs = median(banded);
const dofs = systems.reduce((a, s) => a + 2 * s.model.supports.length, 0);
console.log(
  `Trabeate engine benchmark: ${scheme.columns.length} columns, ${scheme.basis.storeys} storeys, ${layout.lines.length} beam lines, ${layout.panels.length} slab panels, ${scheme.secondaryBeams.length} secondary beams`,
);
console.log(
  `  checks: ${result.checks.length} failing, ${result.passed.reduce((a, p) => a + p.count, 0)} passing; column loads: ${result.loads.columns.length} columns × ${scheme.basis.storeys} storeys; beam-line analyses: ${result.beamLines.length}`,
);
console.log(`  machine load average (1 min) at the end: ${loadavg()[0].toFixed(2)} on ${cpus().length} cores`);
console.log(
  `  full check and analysis (analyseScheme), median of ${RUNS} after ${WARMUP} warm-up runs: ${fullMs.toFixed(1)} ms  [min ${Math.min(...full).toFixed(1)}, max ${Math.max(...full).toFixed(1)}]`,
);
console.log(
  `  stiffness solves only, banded LDLᵀ (${dofs} DOFs over all lines, ${systems.reduce((a, s) => a + s.rhs, 0)} right-hand sides): ${bandMs.toFixed(1)} ms`,
);
console.log(
  `  same solves with a plain dense matrix (assemble + Gaussian elimination each time): ${denseMs.toFixed(1)} ms`,
);
console.log(
  `  ratio full run / dense solve: ${(fullMs / denseMs).toFixed(2)}; dense / banded solves: ${(denseMs / bandMs).toFixed(1)}`,
);
console.log(`  target: full run under 100 ms median — ${fullMs < 100 ? 'met' : 'NOT met'}`);

// One long line, each in a fresh process so that the time and the peak memory are its own.
// Wall-clock time depends on how busy the machine is; CPU time is printed beside it.
for (const spans of [10000, 20000]) {
  const runs: { ms: number; cpuMs: number; peakMB: number; baseMB: number }[] = [];
  for (let r = 0; r < 3; r++) {
    const out = execFileSync(process.execPath, [...process.execArgv, join(__dirname, 'long-line.ts'), String(spans)], {
      encoding: 'utf8',
    });
    runs.push(JSON.parse(out.trim().split('\n').pop() as string));
  }
  const ms = median(runs.map((x) => x.ms));
  const cpu = median(runs.map((x) => x.cpuMs));
  const peak = Math.max(...runs.map((x) => x.peakMB));
  const base = median(runs.map((x) => x.baseMB));
  console.log(
    `  envelope of one ${spans}-span line (envelopeBeam, every arrangement over every span), median of 3 fresh processes, each after 5 warm-up runs on a 500-span line: ${ms.toFixed(0)} ms wall, ${cpu.toFixed(0)} ms CPU; peak memory ${peak.toFixed(0)} MB (process before the call ${base.toFixed(0)} MB)`,
  );
  if (spans === 10000)
    console.log(
      `  target: 10,000 spans under 1 s and 200 MB — time ${ms < 1000 ? 'met' : 'NOT met'} (CPU ${cpu < 1000 ? 'met' : 'NOT met'}), memory ${peak < 200 ? 'met' : 'NOT met'}`,
    );
}
console.log(
  `  machine load average (1 min) after the long lines: ${loadavg()[0].toFixed(2)} on ${cpus().length} cores`,
);
