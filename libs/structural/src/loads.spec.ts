// Sources: the two-way slab equivalent loads w·lx/3 and (w·lx/2)(1 − 1/(3β²)) for moment, w·lx/4 and
// (w·lx/2)(1 − 1/(2β)) for shear, as quoted by reinforced-concrete textbooks (reference-values §6,
// pub2); the 45° distribution itself is IS 456:2000 cl. 24.5. The one-way rule (ly/lx > 2) is
// common practice. Totals are checked by statics (derived).
import { twoWayEquivalentLoads, panelEdgeProfiles } from './loads';
import type { Panel } from './layout';

const panel = (w: number, h: number): Panel => ({
  id: 'P',
  x1: 0,
  x2: w,
  y1: 0,
  y2: h,
  lx: Math.min(w, h),
  ly: Math.max(w, h),
  edges: [
    { side: 'south', carrier: { type: 'line', lineId: 's' }, from: 0, to: w },
    { side: 'north', carrier: { type: 'line', lineId: 'n' }, from: 0, to: w },
    { side: 'west', carrier: { type: 'line', lineId: 'w' }, from: 0, to: h },
    { side: 'east', carrier: { type: 'line', lineId: 'e' }, from: 0, to: h },
  ],
});
const area = (p: [number, number][]) =>
  p.slice(1).reduce((a, q, i) => a + ((q[1] + p[i][1]) / 2) * (q[0] - p[i][0]), 0);

describe('two-way slab loads on beams', () => {
  it('equivalent uniform loads for w 10 kPa, lx 4, ly 6: 13.33 and 17.04 (moment), 10.00 and 13.33 (shear) kN/m (derived, reference §6)', () => {
    const e = twoWayEquivalentLoads(10, 4, 6);
    expect(e.shortBeamMomentKNPerM).toBeCloseTo(13.333, 3);
    expect(e.longBeamMomentKNPerM).toBeCloseTo(17.037, 3);
    expect(e.shortBeamShearKNPerM).toBeCloseTo(10.0, 6);
    expect(e.longBeamShearKNPerM).toBeCloseTo(13.333, 3);
  });
  it('the 45° shapes hand the whole panel load to its four beams (statics)', () => {
    const p = panel(6, 4);
    const { twoWay, profiles } = panelEdgeProfiles(p, 2);
    expect(twoWay).toBe(true);
    expect(profiles.reduce((a, pr) => a + area(pr), 0)).toBeCloseTo(24, 9);
    // short edges (west/east, 4 m) carry triangles: lx²/4 each
    expect(area(profiles[2])).toBeCloseTo(4, 9);
  });
  it('the triangle on a short beam gives the textbook equivalent for mid-span moment, w·lx/3 (derived)', () => {
    // mid-span moment of a simply supported beam under a symmetric triangle of peak q: q·L²/12 = w_eq·L²/8
    const lx = 4,
      w = 10;
    const q = (w * lx) / 2;
    expect((q * lx * lx) / 12 / ((lx * lx) / 8)).toBeCloseTo(twoWayEquivalentLoads(w, lx, 6).shortBeamMomentKNPerM, 9);
  });
  it('a panel longer than twice its width spans one way: only the long beams carry it', () => {
    const p = panel(9, 4);
    const { twoWay, profiles } = panelEdgeProfiles(p, 2);
    expect(twoWay).toBe(false);
    expect(profiles[2]).toEqual([]);
    expect(area(profiles[0]) + area(profiles[1])).toBeCloseTo(36, 9);
  });
});

describe('merging the slab loads on a beam', () => {
  it('sums overlapping trapezoids and triangles into one piecewise-linear load with the same statics', async () => {
    const { mergeLinearLoads } = await import('./loads');
    const { memberTerms } = await import('./beam');
    const loads = [
      { kind: 'linear' as const, member: 0, fromM: 0, toM: 2, startKNPerM: 0, endKNPerM: 2 },
      { kind: 'linear' as const, member: 0, fromM: 2, toM: 4, startKNPerM: 2, endKNPerM: 2 },
      { kind: 'linear' as const, member: 0, fromM: 4, toM: 6, startKNPerM: 2, endKNPerM: 0 },
      { kind: 'linear' as const, member: 0, fromM: 0, toM: 1.5, startKNPerM: 0, endKNPerM: 1.5 },
      { kind: 'linear' as const, member: 0, fromM: 1.5, toM: 6, startKNPerM: 1.5, endKNPerM: 0 },
      { kind: 'point' as const, member: 0, atM: 3, forceKN: 7 },
    ];
    const merged = mergeLinearLoads(loads);
    expect(merged.filter((l) => l.kind === 'linear')).toHaveLength(4); // breakpoints 0, 1.5, 2, 4, 6
    const a = memberTerms(6, loads);
    const b = memberTerms(6, merged);
    for (const k of ['fa', 'fb', 'ra', 'rb', 'total'] as const) expect(b[k]).toBeCloseTo(a[k], 12);
  });
});
