// One long beam line through envelopeBeam, run in a process of its own so that its time and
// peak memory are its own. Prints one JSON line. Run by engine.bench.ts; by hand:
//   npx tsx libs/structural/bench/long-line.ts 10000
import { BeamLoad, continuousBeam, envelopeBeam, codeDefaults, uniformLoad, pointLoad } from '../src/index';

const spans = Number(process.argv[2] ?? 10000);
const rssBefore = process.memoryUsage().rss;
// unequal spans (3.5 to 7 m), dead load on every span, imposed load uniform, partial and point
const lengths = Array.from({ length: spans }, (_, i) => 3.5 + ((i * 37) % 8) * 0.5);
const model = continuousBeam({ spansM: lengths, eiKNm2: (30e6 * 0.3 * 0.6 ** 3) / 12, rightCantileverM: 1.5 });
const dead: BeamLoad[] = model.members.map((m, i) => uniformLoad(i, 18, m.lengthM));
const live: BeamLoad[] = [];
model.members.forEach((m, i) => {
  if (i % 3 === 0) live.push(uniformLoad(i, 9, m.lengthM));
  else if (i % 3 === 1)
    live.push({
      kind: 'linear',
      member: i,
      fromM: 0.2 * m.lengthM,
      toM: 0.7 * m.lengthM,
      startKNPerM: 6,
      endKNPerM: 14,
    });
  else live.push(pointLoad(i, 0.8 * m.lengthM, 60));
});
const combos = codeDefaults('EN1992').combinations;
// as for the scheme: the engine runs again and again while a layout is edited, so the code is
// compiled before timing; warm up on a short line (its own loads), then time the long one once
const short = continuousBeam({
  spansM: lengths.slice(0, 500),
  eiKNm2: (30e6 * 0.3 * 0.6 ** 3) / 12,
  rightCantileverM: 1.5,
});
for (let w = 0; w < 5; w++)
  envelopeBeam(
    short,
    dead.filter((l) => l.member < 501),
    live.filter((l) => l.member < 501),
    combos,
  );
const c0 = process.cpuUsage();
const t0 = performance.now();
const env = envelopeBeam(model, dead, live, combos);
const ms = performance.now() - t0;
const cpu = process.cpuUsage(c0);
if (!env.ok) {
  console.error(JSON.stringify(env.problems.slice(0, 3)));
  process.exit(1);
}
const peakMB = process.resourceUsage().maxRSS / 1024; // maxRSS is in KiB
console.log(
  JSON.stringify({
    spans,
    ms,
    cpuMs: (cpu.user + cpu.system) / 1000,
    peakMB,
    baseMB: rssBefore / 2 ** 20,
    patterns: env.patternsTried,
    sample: env.members[spans >> 1].maxMomentKNm,
  }),
);
