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
    expect((6 / 3) * (b1 + 2 * b2) / (b1 + b2)).toBeCloseTo(t.resultantFromWideEndM, 9);
  });
  it('strap: e = L1/2 − c1/2, R1 = P1·s/(s − e), R2 = P1 + P2 − R1, strap shear R1 − P1 (pub2 formulas, numbers derived)', () => {
    // 300 mm column flush with the line (d = 0.15), pad 1.5 m long, 600 and 900 kN, 5 m apart
    const s = strapFooting(600, 900, 5, 0.15, 150, 0.1, 1.5);
    expect(s.eccentricityM).toBeCloseTo(0.6, 9);
    expect(s.r1KN).toBeCloseTo((600 * 5) / 4.4, 9);
    expect(s.r2KN).toBeCloseTo(1500 - 3000 / 4.4, 9);
    expect(s.strapShearKN).toBeCloseTo(3000 / 4.4 - 600, 9);
    // moment balance about the interior column: P1·s = R1·(s − e)
    expect(s.r1KN * (5 - s.eccentricityM)).toBeCloseTo(600 * 5, 9);
    // strap moment at zero shear: P1 (x0/2 − d), x0 = P1·L1/R1
    const x0 = (600 * 1.5) / s.r1KN;
    expect(s.strapMomentKNm).toBeCloseTo(600 * (x0 / 2 - 0.15), 9);
    expect(s.exteriorWidthM).toBeCloseTo((1.1 * s.r1KN) / (150 * 1.5), 9);
  });
  it('strap with a chosen pad: the pad width is about twice its length (common practice) and carries R1', () => {
    const s = strapFooting(600, 900, 5, 0.15, 150, 0.1);
    expect(s.exteriorWidthM * s.exteriorLengthM * 150).toBeGreaterThanOrEqual(1.1 * s.r1KN - 1e-6);
    expect(s.exteriorWidthM / s.exteriorLengthM).toBeGreaterThan(1.4);
    expect(s.exteriorWidthM / s.exteriorLengthM).toBeLessThan(2.8);
  });
});
