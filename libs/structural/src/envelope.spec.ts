import { analyseBeam, BeamLoad, continuousBeam, uniformLoad } from './beam';
import type { Combination } from './codes';
import { envelopeBeam, loadPatterns } from './envelope';

const combo: Combination[] = [{ id: 'test', dead: 1.5, live: 1.5, source: 'IS 456:2000 Table 18' }];

describe('envelope with patterned imposed load', () => {
  it('three equal spans: the patterns reach the same extremes as every one of the 2³ arrangements (influence-line argument, derived)', () => {
    const L = 5;
    const model = continuousBeam({ spansM: [L, L, L], eiKNm2: 30000 });
    const dead = [0, 1, 2].map((i) => uniformLoad(i, 12, L));
    const live = [0, 1, 2].map((i) => uniformLoad(i, 8, L));
    const env = envelopeBeam(model, dead, live, combo, { samplesPerMember: 20 });
    let best = [-Infinity, -Infinity, -Infinity];
    let worst = [Infinity, Infinity, Infinity];
    for (let mask = 0; mask < 8; mask++) {
      const loads: BeamLoad[] = [
        ...dead.map((d) => ({ ...d, startKNPerM: 1.5 * 12, endKNPerM: 1.5 * 12 })),
        ...live.filter((_, i) => mask & (1 << i)).map((d) => ({ ...d, startKNPerM: 1.5 * 8, endKNPerM: 1.5 * 8 })),
      ];
      const r = analyseBeam(model, loads, { samplesPerMember: 20 });
      best = best.map((b, i) => Math.max(b, r.members[i].maxMoment.valueKNm));
      worst = worst.map((w, i) => Math.min(w, r.members[i].minMoment.valueKNm));
    }
    env.members.forEach((m, i) => {
      expect(m.maxMomentKNm).toBeCloseTo(best[i], 1);
      expect(m.minMomentKNm).toBeCloseTo(worst[i], 6);
    });
  });

  it('the exact IS 456 Table 12 context: end-span sagging with imposed load on alternate spans exceeds the all-spans value', () => {
    const L = 4;
    const model = continuousBeam({ spansM: [L, L, L, L], eiKNm2: 1 });
    const dead = [0, 1, 2, 3].map((i) => uniformLoad(i, 10, L));
    const live = [0, 1, 2, 3].map((i) => uniformLoad(i, 10, L));
    const env = envelopeBeam(model, dead, live, combo);
    expect(env.members[0].maxPattern).toMatch(/alternate spans \(odd\)/);
    // first interior support: adjacent spans loaded
    expect(env.members[0].minPattern).toMatch(/adjacent spans at support 1/);
  });

  it('service reactions of the all-spans case match a single analysis (two spans, 10 kN/m: 15, 50, 15 kN)', () => {
    const model = continuousBeam({ spansM: [4, 4], eiKNm2: 1000 });
    const env = envelopeBeam(model, [uniformLoad(0, 10, 4), uniformLoad(1, 10, 4)], [], combo);
    [15, 50, 15].forEach((v, i) => expect(env.deadReactionsKN[i]).toBeCloseTo(v, 9));
  });

  it('patterns: all, none, two alternates and one adjacent pair per interior support', () => {
    const p = loadPatterns(continuousBeam({ spansM: [4, 4, 4, 4] }));
    expect(p.map((x) => x.label)).toHaveLength(2 + 2 + 3);
    expect(p.find((x) => x.label === 'adjacent spans at support 2')?.members).toEqual([false, true, true, false]);
    expect(p.find((x) => x.label === 'adjacent spans at support 1')?.members).toEqual([true, true, false, true]);
  });
});

describe('envelope from load parts', () => {
  it('a shared imposed-load shape, scaled per level and cached between levels, gives the same envelope as the loads themselves', async () => {
    const { envelopeParts, loadPart } = await import('./envelope');
    const { prepareBeam } = await import('./beam');
    const model = continuousBeam({ spansM: [4, 6, 5, 3], eiKNm2: 25000, rightCantileverM: 1.5 });
    const shape: BeamLoad[] = [
      { kind: 'linear', member: 0, fromM: 0, toM: 2, startKNPerM: 0, endKNPerM: 2 },
      { kind: 'linear', member: 0, fromM: 2, toM: 4, startKNPerM: 2, endKNPerM: 0 },
      { kind: 'linear', member: 1, fromM: 0, toM: 6, startKNPerM: 2.5, endKNPerM: 2.5 },
      { kind: 'point', member: 2, atM: 2, forceKN: 6 },
      { kind: 'linear', member: 4, fromM: 0, toM: 1.5, startKNPerM: 1, endKNPerM: 1 },
    ];
    const extra = [0, 1, 2, 3].map((i) => uniformLoad(i, 4, model.members[i].lengthM));
    const scale = (ls: BeamLoad[], f: number): BeamLoad[] => ls.map((l) => (l.kind === 'point' ? { ...l, forceKN: l.forceKN * f } : { ...l, startKNPerM: l.startKNPerM * f, endKNPerM: l.endKNPerM * f }));
    const p = prepareBeam(model);
    const sp = loadPart(p, shape);
    const cache = new Map();
    const combos: Combination[] = [{ id: 'a', dead: 1.4, live: 0, source: 'x' }, { id: 'b', dead: 1.2, live: 1.6, source: 'x' }];
    for (const [sd, l] of [[5, 3], [4, 1.5]]) {
      const viaParts = envelopeParts(p, [[sp, sd], [loadPart(p, extra), 1]], [[sp, l]], combos, cache);
      const direct = envelopeBeam(model, [...scale(shape, sd), ...extra], scale(shape, l), combos);
      viaParts.members.forEach((m, i) => {
        expect(m.maxMomentKNm).toBeCloseTo(direct.members[i].maxMomentKNm, 9);
        expect(m.minMomentKNm).toBeCloseTo(direct.members[i].minMomentKNm, 9);
        expect(m.maxShearKN).toBeCloseTo(direct.members[i].maxShearKN, 9);
        expect(m.serviceDeflectionMm).toBeCloseTo(direct.members[i].serviceDeflectionMm, 9);
      });
      viaParts.maxFactoredReactionsKN.forEach((r, n) => expect(r).toBeCloseTo(direct.maxFactoredReactionsKN[n], 9));
    }
    expect(cache.size).toBe(1);
  });
});

describe('load parts', () => {
  it('full-length uniform loads in closed form agree with the general path (a tiny partial load forces it)', async () => {
    const { loadPart } = await import('./envelope');
    const { prepareBeam } = await import('./beam');
    const model = continuousBeam({ spansM: [4.5, 6], eiKNm2: 40000, rightCantileverM: 2 });
    const p = prepareBeam(model);
    const uniform = [0, 1, 2].map((i) => uniformLoad(i, 7, model.members[i].lengthM));
    const fast = loadPart(p, uniform);
    // the same loads split in two pieces per member go through the general path
    const split: BeamLoad[] = uniform.flatMap((u) => [
      { ...u, toM: u.toM / 3 },
      { ...u, fromM: u.toM / 3 },
    ]);
    const general = loadPart(p, split);
    for (const k of ['terms', 'm0', 'v0', 'defl'] as const) fast[k].forEach((v, i) => expect(v).toBeCloseTo(general[k][i], 9));
  });
});
