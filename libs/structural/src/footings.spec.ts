import { isolatedFooting, rectangularCombined, strapFooting, trapezoidalCombined } from './footings';

// Vectors from reference-values §7 (derived from the standard textbook statics).
describe('footing plan sizes', () => {
  it('isolated: P 1000 kN, qa 200 kPa, α 0.10: A 5.50 m², side 2.345 m, adopt 2.4 m, factored 260.4 kPa', () => {
    const f = isolatedFooting(1000, 200, 0.1, 1500);
    expect(f.areaM2).toBeCloseTo(5.5, 9);
    expect(f.sideM).toBeCloseTo(2.345, 3);
    expect(f.adoptedSideM).toBeCloseTo(2.4, 9);
    expect(f.factoredPressureKPa).toBeCloseTo(260.4, 1);
  });
  it('rectangular combined: P1 600, P2 900, s 4.0, a 0.15, qa 150: x̄ 2.40, L 5.10, A 11.00, B 2.157 → 2.2, 0.95 m past the interior column', () => {
    const r = rectangularCombined(600, 900, 4, 0.15, 150, 0.1);
    expect(r.resultantFromFirstM).toBeCloseTo(2.4, 9);
    expect(r.lengthM).toBeCloseTo(5.1, 9);
    expect(r.areaM2).toBeCloseTo(11.0, 9);
    expect(r.widthM).toBeCloseTo(2.157, 3);
    expect(r.adoptedWidthM).toBeCloseTo(2.2, 9);
    expect(r.projectionPastSecondM).toBeCloseTo(0.95, 9);
    expect(r.feasible).toBe(true);
  });
  it('trapezoidal combined: qa 250, L 6.00, 2300 and 2100 kN, 5.525 m apart, 15 %: A 20.24, widths 3.755 and 2.992 m', () => {
    const t = trapezoidalCombined(2300, 2100, 5.525, 0.25, 6.0, 250, 0.15);
    expect(t.areaM2).toBeCloseTo(20.24, 9);
    expect(t.widthAtFirstM + t.widthAtFarM).toBeCloseTo(6.747, 3);
    expect(t.widthAtFirstM).toBeCloseTo(3.755, 3);
    expect(t.widthAtFarM).toBeCloseTo(2.992, 3);
    expect(t.feasible).toBe(true);
    // resultant at the centroid of the trapezoid (derived)
    const { widthAtFirstM: b1, widthAtFarM: b2 } = t;
    expect(((6 / 3) * (b1 + 2 * b2)) / (b1 + b2)).toBeCloseTo(t.resultantFromWideEndM, 9);
  });
  it('strap, worked by hand statics (derived): 600 kN column 0.15 m from the line, 1.5 m pad, 900 kN interior column 5 m away', () => {
    const s = strapFooting(600, 900, 5, 0.15, 150, 0.1, 1.5);
    // The pad's soil reaction R1 acts at its centre, 1.5/2 = 0.75 m from the line, so 0.60 m
    // inside the exterior column: e = 0.75 − 0.15 = 0.60 m.
    expect(s.eccentricityM).toBeCloseTo(0.6, 9);
    // Moments about the interior column (strap and pads rigid): R1 × (5 − 0.60) = 600 × 5 → R1 = 3000/4.4 = 681.818 kN
    expect(s.r1KN).toBeCloseTo(681.818, 3);
    // Vertical equilibrium: R2 = 600 + 900 − 681.818 = 818.182 kN
    expect(s.r2KN).toBeCloseTo(818.182, 3);
    // Shear in the strap between the pads: R1 − P1 = 81.818 kN
    expect(s.strapShearKN).toBeCloseTo(81.818, 3);
    // Largest moment, where the shear is zero under the pad: q = 681.818/1.5 = 454.545 kN/m,
    // x0 = 600/454.545 = 1.320 m from the line; M = 454.545 × 1.320²/2 − 600 × (1.320 − 0.15) = 396.0 − 702.0 = −306.0 kN·m
    expect(s.strapMomentKNm).toBeCloseTo(306.0, 1);
    // Pad width for the bearing pressure with 10 % allowance: 1.1 × 681.818 / (150 × 1.5) = 3.333 m
    expect(s.exteriorWidthM).toBeCloseTo(3.333, 3);
    expect(s.feasible).toBe(true);
  });
  it('strap whose eccentricity reaches the column spacing is flagged infeasible, with finite numbers', () => {
    // pad 1.5 m long, column 0.15 m from the line: e = 0.60 m, but the interior column is only 0.5 m away
    const s = strapFooting(600, 900, 0.5, 0.15, 150, 0.1, 1.5);
    expect(s.feasible).toBe(false);
    for (const v of Object.values(s)) if (typeof v === 'number') expect(Number.isFinite(v)).toBe(true);
  });
  it('refuses a zero bearing pressure, a negative load and a non-number, naming the field and the range', async () => {
    const { StructuralInputError } = await import('./errors');
    expect(() => isolatedFooting(1000, 0, 0.1, 1500)).toThrow(StructuralInputError);
    expect(() => isolatedFooting(-5, 200, 0.1, 1500)).toThrow(/serviceKN: must be a number from 0 to 1000000 kN/);
    expect(() => rectangularCombined(600, NaN, 4, 0.15, 150, 0.1)).toThrow(/p2KN/);
    expect(() => trapezoidalCombined(2300, 2100, 5.525, 0.25, 6, 1e-12, 0.15)).toThrow(/qaKPa/);
  });
  it('strap with a chosen pad: the pad width is about twice its length (common practice) and carries R1', () => {
    const s = strapFooting(600, 900, 5, 0.15, 150, 0.1);
    expect(s.exteriorWidthM * s.exteriorLengthM * 150).toBeGreaterThanOrEqual(1.1 * s.r1KN - 1e-6);
    expect(s.exteriorWidthM / s.exteriorLengthM).toBeGreaterThan(1.4);
    expect(s.exteriorWidthM / s.exteriorLengthM).toBeLessThan(2.8);
  });
});
