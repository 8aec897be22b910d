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
