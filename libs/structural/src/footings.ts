// Footing plan sizes from service loads and the allowable bearing pressure, by the usual
// textbook statics: isolated pads, rectangular and trapezoidal combined footings with the
// resultant at the centroid, and strap footings at a property line. Input outside the accepted
// ranges throws StructuralInputError naming the field and the range.
import { StructuralInputError } from './errors';

/** Accepted ranges: service loads kN, pressures kPa, lengths m, allowance fraction. */
export const FOOTING_RANGES = {
  loadKN: [0, 1e6],
  qaKPa: [10, 10000],
  alpha: [0, 1],
  lengthM: [0, 100],
} as const;

function need(values: Record<string, [number | undefined, readonly [number, number], string]>): void {
  const problems = [];
  for (const [field, [v, [lo, hi], unit]] of Object.entries(values)) {
    if (v === undefined) continue;
    if (!(typeof v === 'number' && Number.isFinite(v) && v >= lo && v <= hi))
      problems.push({ path: field, field, message: `must be a number from ${lo} to ${hi} ${unit}`.trim() });
  }
  if (problems.length) throw new StructuralInputError(problems);
}

/** Rounds up to a multiple of step (m), guarding against floating-point noise. */
export function roundUp(v: number, step: number): number {
  // the final rounding keeps 2.4 from printing as 2.4000000000000004
  return Math.round(Math.ceil(v / step - 1e-9) * step * 1e9) / 1e9;
}

export interface IsolatedFooting {
  /** required plan area, m² */
  areaM2: number;
  /** side of the square that gives the area, m */
  sideM: number;
  /** side adopted, rounded up to 0.1 m */
  adoptedSideM: number;
  /** net upward pressure under the factored load, kPa */
  factoredPressureKPa: number;
  /** thickness assumed for quantities, m */
  thicknessM: number;
}

/**
 * Square isolated footing: A = (1 + α)·P/qa with P the service column load (kN), qa the allowable
 * bearing pressure (kPa), α the allowance for footing and soil weight; factoredKN gives the net
 * design pressure (kPa). Thickness is common practice (0.2 × side, at least 0.3 m), to be checked
 * for shear in design.
 */
export function isolatedFooting(serviceKN: number, qaKPa: number, alpha: number, factoredKN: number): IsolatedFooting {
  need({
    serviceKN: [serviceKN, FOOTING_RANGES.loadKN, 'kN'],
    qaKPa: [qaKPa, FOOTING_RANGES.qaKPa, 'kPa'],
    alpha: [alpha, FOOTING_RANGES.alpha, ''],
    factoredKN: [factoredKN, FOOTING_RANGES.loadKN, 'kN'],
  });
  const areaM2 = ((1 + alpha) * serviceKN) / qaKPa;
  const sideM = Math.sqrt(areaM2);
  const adoptedSideM = roundUp(sideM, 0.1);
  return {
    areaM2,
    sideM,
    adoptedSideM,
    // no load, no pad: nothing presses on the soil
    factoredPressureKPa: adoptedSideM > 0 ? factoredKN / (adoptedSideM * adoptedSideM) : 0,
    thicknessM: Math.max(0.3, roundUp(0.2 * adoptedSideM, 0.05)),
  };
}

export interface RectCombined {
  /** resultant of the two column loads from the exterior (first) column, m */
  resultantFromFirstM: number;
  lengthM: number;
  areaM2: number;
  widthM: number;
  adoptedWidthM: number;
  /** projection beyond the second column centre, m */
  projectionPastSecondM: number;
  /** false when the footing would stop short of the second column */
  feasible: boolean;
}

/**
 * Rectangular combined footing with the resultant at its centroid: x̄ = P2·s/(P1 + P2) from the
 * first column, L = 2(x̄ + a) with a the projection behind the first column centre (m),
 * A = (1 + α)(P1 + P2)/qa, B = A/L (adopted up to 0.1 m). Loads kN (service), qa kPa.
 */
export function rectangularCombined(
  p1KN: number,
  p2KN: number,
  spacingM: number,
  projectionM: number,
  qaKPa: number,
  alpha: number,
): RectCombined {
  need({
    p1KN: [p1KN, FOOTING_RANGES.loadKN, 'kN'],
    p2KN: [p2KN, FOOTING_RANGES.loadKN, 'kN'],
    spacingM: [spacingM, [0.1, 100], 'm'],
    projectionM: [projectionM, FOOTING_RANGES.lengthM, 'm'],
    qaKPa: [qaKPa, FOOTING_RANGES.qaKPa, 'kPa'],
    alpha: [alpha, FOOTING_RANGES.alpha, ''],
  });
  if (!(p1KN + p2KN > 0))
    throw new StructuralInputError([
      { path: 'p1KN', field: 'p1KN', message: 'the two column loads must not both be 0' },
    ]);
  const xbar = (p2KN * spacingM) / (p1KN + p2KN);
  const lengthM = 2 * (xbar + projectionM);
  const areaM2 = ((1 + alpha) * (p1KN + p2KN)) / qaKPa;
  const widthM = areaM2 / lengthM;
  const past = lengthM - projectionM - spacingM;
  return {
    resultantFromFirstM: xbar,
    lengthM,
    areaM2,
    widthM,
    adoptedWidthM: roundUp(widthM, 0.1),
    projectionPastSecondM: past,
    feasible: past >= 0,
  };
}

export interface TrapezoidCombined {
  areaM2: number;
  /** distance of the load resultant from the wide end, m */
  resultantFromWideEndM: number;
  /** width at the end by the first column and at the far end, m */
  widthAtFirstM: number;
  widthAtFarM: number;
  /** a trapezoid is possible only when L/3 < x̄ < L/2 */
  feasible: boolean;
}

/**
 * Trapezoidal combined footing of given length L (m), the first column's centre a (m) from the
 * end, columns s (m) apart: A = (1 + α)(P1 + P2)/qa; b1 + b2 = 2A/L; centroid from the wide end
 * x_c = (L/3)(b1 + 2b2)/(b1 + b2) placed under the resultant. Loads kN, qa kPa.
 */
export function trapezoidalCombined(
  p1KN: number,
  p2KN: number,
  spacingM: number,
  firstFromEndM: number,
  lengthM: number,
  qaKPa: number,
  alpha: number,
): TrapezoidCombined {
  need({
    p1KN: [p1KN, FOOTING_RANGES.loadKN, 'kN'],
    p2KN: [p2KN, FOOTING_RANGES.loadKN, 'kN'],
    spacingM: [spacingM, [0.1, 100], 'm'],
    firstFromEndM: [firstFromEndM, FOOTING_RANGES.lengthM, 'm'],
    lengthM: [lengthM, [0.1, 100], 'm'],
    qaKPa: [qaKPa, FOOTING_RANGES.qaKPa, 'kPa'],
    alpha: [alpha, FOOTING_RANGES.alpha, ''],
  });
  if (!(p1KN + p2KN > 0))
    throw new StructuralInputError([
      { path: 'p1KN', field: 'p1KN', message: 'the two column loads must not both be 0' },
    ]);
  const areaM2 = ((1 + alpha) * (p1KN + p2KN)) / qaKPa;
  const xc = firstFromEndM + (p2KN * spacingM) / (p1KN + p2KN);
  const sum = (2 * areaM2) / lengthM;
  const b2 = (3 * xc * sum) / lengthM - sum;
  const b1 = sum - b2;
  return {
    areaM2,
    resultantFromWideEndM: xc,
    widthAtFirstM: b1,
    widthAtFarM: b2,
    feasible: xc > lengthM / 3 && xc < lengthM / 2,
  };
}

export interface StrapFooting {
  /** pad length perpendicular to the line and width along it, m */
  exteriorLengthM: number;
  exteriorWidthM: number;
  /** eccentricity of the soil reaction from the exterior column, m */
  eccentricityM: number;
  /** soil reactions under the exterior and interior pads, kN (service) */
  r1KN: number;
  r2KN: number;
  /** interior pad side, m (sized for P2 without the strap's relief, common practice) */
  interiorSideM: number;
  /** largest strap moment (hogging) and strap shear, service, kN·m and kN */
  strapMomentKNm: number;
  strapShearKN: number;
  /**
   * false when the pad's eccentricity reaches the column spacing (the statics then give a
   * reaction that pulls the interior column up): the strap cannot work and the figures are not for use
   */
  feasible: boolean;
}

/**
 * Strap footing: exterior pad of length L1 (m) against the line with the column centre d (m)
 * from the line: e = L1/2 − d; R1 = P1·s/(s − e); R2 = P1 + P2 − R1; strap shear R1 − P1;
 * strap moment at zero shear, P1(x0/2 − d) with x0 = P1·L1/R1. When L1 is not given it is chosen
 * so that the pad width is about twice its length (common practice). Loads kN, qa kPa.
 */
export function strapFooting(
  p1KN: number,
  p2KN: number,
  spacingM: number,
  edgeDistanceM: number,
  qaKPa: number,
  alpha: number,
  exteriorLengthM?: number,
): StrapFooting {
  need({
    p1KN: [p1KN, [0.001, FOOTING_RANGES.loadKN[1]], 'kN'],
    p2KN: [p2KN, FOOTING_RANGES.loadKN, 'kN'],
    spacingM: [spacingM, [0.1, 100], 'm'],
    edgeDistanceM: [edgeDistanceM, [0, 50], 'm'],
    qaKPa: [qaKPa, FOOTING_RANGES.qaKPa, 'kPa'],
    alpha: [alpha, FOOTING_RANGES.alpha, ''],
    exteriorLengthM: [exteriorLengthM, [0.1, 50], 'm'],
  });
  const solve = (l1: number) => {
    const e = l1 / 2 - edgeDistanceM;
    // beyond e = s the lever arm s − e vanishes or turns: no finite exterior reaction
    const arm = Math.max(spacingM - e, 1e-6 * spacingM);
    const r1 = (p1KN * spacingM) / arm;
    return { e, r1, width: ((1 + alpha) * r1) / (qaKPa * l1) };
  };
  let l1 = exteriorLengthM ?? Math.max(2 * edgeDistanceM + 0.3, 1);
  if (exteriorLengthM === undefined) {
    for (let it = 0; it < 50; it++) {
      const { width } = solve(l1);
      const next = Math.sqrt((l1 * width) / 2);
      if (Math.abs(next - l1) < 1e-6) break;
      l1 = next;
    }
    l1 = Math.max(roundUp(l1, 0.1), 2 * edgeDistanceM);
  }
  const { e, r1, width } = solve(l1);
  const r2 = p1KN + p2KN - r1;
  const x0 = (p1KN * l1) / r1;
  return {
    exteriorLengthM: l1,
    exteriorWidthM: exteriorLengthM === undefined ? roundUp(width, 0.1) : width,
    eccentricityM: e,
    r1KN: r1,
    r2KN: r2,
    interiorSideM: roundUp(Math.sqrt(((1 + alpha) * p2KN) / qaKPa), 0.1),
    strapMomentKNm: p1KN * (x0 / 2 - edgeDistanceM),
    strapShearKN: r1 - p1KN,
    // the interior reaction must stay a downward soil pressure, and the lever arm positive
    feasible: e < spacingM && r2 >= 0,
  };
}
