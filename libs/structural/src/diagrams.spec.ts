import { analyseScheme } from './analyse';
import { CAUTION } from './codes';
import { demoScheme, demoSchemeVariant } from './demo';
import { beamLineDiagram } from './diagrams';
import { StructuralInputError } from './errors';
import type { Scheme } from './model';

/** A one-storey rectangular grid with a column at every crossing (IS 456 family, 1.5(DL + IL)). */
function gridScheme(xs: number[], ys: number[], over: Partial<Scheme['basis']> = {}): Scheme {
  return {
    schemaVersion: 1,
    id: 'g',
    name: 'grid',
    basis: {
      codeFamily: 'IS456',
      concreteMPa: 25,
      steelMPa: 415,
      imposedKPa: 3,
      superimposedDeadKPa: 1,
      wallLoadKNPerM: 0,
      bearingPressureKPa: 200,
      foundingDepthM: 1.5,
      storeys: 1,
      storeyHeightM: 3.2,
      beamWidthMm: 250,
      slabThicknessMm: 150,
      rates: { currency: 'XTS', concretePerM3: 100, steelPerKg: 1, formworkPerM2: 10 },
      ...over,
    },
    boundary: {
      vertices: [
        { x: -5, y: -5 },
        { x: 100, y: -5 },
        { x: 100, y: 100 },
        { x: -5, y: 100 },
      ],
      propertyLines: [],
    },
    grid: [
      ...xs.map((x, i) => ({ id: `X${i}`, label: `X${i}`, x, beamDepthMm: 500 })),
      ...ys.map((y, j) => ({ id: `Y${j}`, label: `Y${j}`, y, beamDepthMm: 500 })),
    ],
    columns: xs.flatMap((x, i) =>
      ys.map((y, j) => ({
        id: `C${i}_${j}`,
        label: `C${i}_${j}`,
        x,
        y,
        widthMm: 400,
        depthMm: 400,
        orientationDeg: 0 as const,
      })),
    ),
    secondaryBeams: [],
    stairs: [],
  };
}

/**
 * Two equal 6 m spans along grid X0, carrying a uniform load: the 1.5 m wide bays are one-way
 * slabs (aspect 4), so each long edge carries half the bay (0.75 m), plus the beam's own stem.
 */
const L = 6;
function twoSpans(imposedKPa: number) {
  const s = gridScheme([0, 1.5], [0, L, 2 * L], { imposedKPa });
  const line = analyseScheme(s).beamLines.find((l) => l.gridLineId === 'X0');
  if (!line) throw new Error('no line on X0');
  // loads by hand (statics of the tributary strip): slab 0.15 m × 25 kN/m³ (IS 456 cl. 19.2.1)
  // + 1 kPa finishes over 0.75 m, and the 250 × (500 − 150) mm stem at 25 kN/m³
  const wd = 0.75 * (0.15 * 25 + 1) + 0.25 * (0.5 - 0.15) * 25;
  const wl = 0.75 * imposedKPa;
  return { s, lineId: line.lineId, wd, wl };
}

const peak = (d: ReturnType<typeof beamLineDiagram>, i: number) => {
  const st = d.stations.filter((x) => x.member === i);
  return {
    max: Math.max(...st.map((x) => x.maxMomentKNm)),
    min: Math.min(...st.map((x) => x.minMomentKNm)),
    shear: Math.max(...st.map((x) => Math.max(Math.abs(x.maxShearKN), Math.abs(x.minShearKN)))),
  };
};

describe('beamLineDiagram', () => {
  it("draws peaks equal to the envelope's exact extremes on every line and level of the demo scheme", () => {
    for (const scheme of [demoScheme()]) {
      const r = analyseScheme(scheme);
      expect(r.ok).toBe(true);
      for (const bl of r.beamLines) {
        const d = beamLineDiagram(scheme, bl.lineId, bl.level);
        expect(d.caution).toBe(CAUTION);
        expect(d.label).toBe(bl.label);
        expect(d.members.map((m) => m.id)).toEqual(bl.members.map((m) => m.id));
        bl.members.forEach((m, i) => {
          // the members carry the envelope's own numbers
          expect(d.members[i].maxMomentKNm).toBe(m.maxMomentKNm);
          expect(d.members[i].minMomentKNm).toBe(m.minMomentKNm);
          expect(d.members[i].maxShearKN).toBe(m.maxShearKN);
          // and the sampled diagram reaches them (independent solve of each arrangement)
          const pk = peak(d, i);
          const tol = 1e-6 * Math.max(1, Math.abs(m.maxMomentKNm), Math.abs(m.minMomentKNm));
          expect(Math.abs(pk.max - m.maxMomentKNm)).toBeLessThan(tol);
          expect(Math.abs(pk.min - m.minMomentKNm)).toBeLessThan(tol);
          expect(Math.abs(pk.shear - m.maxShearKN)).toBeLessThan(1e-6 * Math.max(1, m.maxShearKN));
        });
        d.supports.forEach((sp, k) => expect(sp.maxReactionKN).toBe(bl.reactions[k].maxFactoredKN));
        // stations run from the line's start to its end, never backwards
        for (let k = 1; k < d.stations.length; k++) expect(d.stations[k].s).toBeGreaterThanOrEqual(d.stations[k - 1].s);
        const total = bl.members.reduce((a, m) => a + m.lengthM, 0);
        expect(d.stations[0].s).toBe(0);
        expect(d.stations[d.stations.length - 1].s).toBeCloseTo(total, 9);
      }
    }
  });

  it('gives −wL²/8 at the middle support of two equal spans under load on both (AISC Manual Table 3-23, case 29)', () => {
    const { s, lineId, wd, wl } = twoSpans(3);
    const d = beamLineDiagram(s, lineId, 'roof');
    const w = 1.5 * (wd + wl); // IS 456:2000 Table 18, 1.5(DL + IL)
    const mid = d.stations.filter((x) => Math.abs(x.s - L) < 1e-9);
    expect(mid.length).toBeGreaterThanOrEqual(2); // end of span 1 and start of span 2
    for (const x of mid) expect(x.minMomentKNm).toBeCloseTo(-(w * L * L) / 8, 6);
  });

  it("gives the largest sagging with imposed load on one span only from the tables' reactions (AISC Manual Table 3-23, cases 29 and 30)", () => {
    const { s, lineId, wd, wl } = twoSpans(3);
    const d = beamLineDiagram(s, lineId, 'roof');
    // dead load on both spans gives end reaction 3/8 wd L (case 29), imposed on span 1 alone
    // 7/16 wl L (case 30); the largest sagging lies where the shear is zero:
    // M = R² / (2 (wd + wl)) with R = (3/8 wd + 7/16 wl) L, all × 1.5 (IS 456 Table 18)
    const R = ((3 / 8) * wd + (7 / 16) * wl) * L;
    expect(peak(d, 0).max).toBeCloseTo((1.5 * R * R) / (2 * (wd + wl)), 6);
    // below the bound that adds the two tables' peaks at their own positions
    expect(peak(d, 0).max).toBeLessThan(1.5 * ((9 / 128) * wd + (49 / 512) * wl) * L * L);
  });

  it('reads the imposed-only coefficient 49/512 exactly where the live arrangement governs (AISC Table 3-23, case 30)', () => {
    // the difference between the diagram with and without imposed load at 7L/16 is the
    // imposed-load moment of the arrangement that loads span 1 only (dead moments cancel)
    const a = twoSpans(3);
    const b = twoSpans(0);
    const withLive = beamLineDiagram(a.s, a.lineId, 'roof', { pointsPerSpan: 32 });
    const deadOnly = beamLineDiagram(b.s, b.lineId, 'roof', { pointsPerSpan: 32 });
    const x = (7 * L) / 16; // on the 32-point grid
    const m1 = withLive.stations.find((q) => q.member === 0 && Math.abs(q.s - x) < 1e-9)?.maxMomentKNm as number;
    const m0 = deadOnly.stations.find((q) => q.member === 0 && Math.abs(q.s - x) < 1e-9)?.maxMomentKNm as number;
    expect(m1 - m0).toBeCloseTo(1.5 * (49 / 512) * a.wl * L * L, 6);
  });

  it('jumps in shear at each support by the reaction there (statics; reactions 3wL/8, 10wL/8, 3wL/8, AISC Table 3-23 case 29)', () => {
    // no imposed load: one load case, so the envelope is that case's diagram
    const { s, lineId, wd } = twoSpans(0);
    const d = beamLineDiagram(s, lineId, 'roof');
    const w = 1.5 * wd;
    const at = (pos: number) => d.stations.filter((x) => Math.abs(x.s - pos) < 1e-9);
    const [left, right] = at(L);
    expect(right.maxShearKN - left.maxShearKN).toBeCloseTo((10 / 8) * w * L, 6);
    expect(at(0)[0].maxShearKN).toBeCloseTo((3 / 8) * w * L, 6); // from zero just left of the end
    expect(-at(2 * L)[0].maxShearKN).toBeCloseTo((3 / 8) * w * L, 6);
    expect(d.supports.map((x) => x.maxReactionKN)).toEqual([
      expect.closeTo((3 / 8) * w * L, 6),
      expect.closeTo((10 / 8) * w * L, 6),
      expect.closeTo((3 / 8) * w * L, 6),
    ]);
  });

  // Regression: two load parts with breakpoints closer than the merge tolerance (a point load at
  // 2 m beside a slab share breaking at 1.9999999999999991 m) once made the envelope miss the point
  // load on the next piece (85.21 against 81.10 kN·m here). The diagram solves each arrangement
  // from the loads themselves, an independent path to the same peak.
  it("variant line B's long middle span: the scheme envelope's sagging peak equals the solved arrangements", () => {
    const s = demoSchemeVariant();
    const bl = analyseScheme(s).beamLines.find((l) => l.lineId === 'L-B' && l.level === 'floor');
    if (!bl) throw new Error('no line L-B');
    const d = beamLineDiagram(s, bl.lineId, bl.level);
    expect(Math.abs(peak(d, 1).max - bl.members[1].maxMomentKNm)).toBeLessThan(1e-6 * bl.members[1].maxMomentKNm);
  });

  it('refuses an unknown line, a level the scheme lacks and an invalid scheme', () => {
    const s = demoScheme();
    expect(() => beamLineDiagram(s, 'no-such-line', 'floor')).toThrow(StructuralInputError);
    const one = twoSpans(3);
    expect(() => beamLineDiagram(one.s, one.lineId, 'floor')).toThrow(/level must be roof/);
    expect(() => beamLineDiagram({} as Scheme, 'x', 'roof')).toThrow(StructuralInputError);
    expect(() => beamLineDiagram(s, analyseScheme(s).beamLines[0].lineId, 'roof', { pointsPerSpan: 1 })).toThrow(
      StructuralInputError,
    );
  });
});
