// Code-family defaults: load combinations, material relations, capacity formulas and the limits
// the checks use. Every value carries its source; rules of thumb say "common practice" and
// recalled values say "from memory" so that a reader knows how far to trust them.
import type { CodeFamily } from './model';
import { StructuralInputError } from './errors';

/**
 * Shown with every result that reaches a person.
 */
export const CAUTION =
  'Preliminary planning results only. The governing design code and local regulations apply; ' +
  'final analysis, design and sealing of the structure belong to a licensed structural engineer.';

/**
 * How a value is known: a standard's clause, a published design handbook's table, common practice
 * (no published source), recalled from memory, derived, or set for the project. No default limit
 * cites a handbook table yet; a value taken from one carries 'handbook' and names the table.
 */
export const SOURCE_KINDS = ['code', 'handbook', 'practice', 'memory', 'derived', 'project'] as const;
export type SourceKind = (typeof SOURCE_KINDS)[number];

export interface Limit {
  value: number;
  unit: string;
  /** standard and clause, or "common practice" */
  source: string;
  kind: SourceKind;
}

export interface Combination {
  id: string;
  dead: number;
  live: number;
  source: string;
}

export const LIMIT_KEYS = [
  'beamSpanCantileverMaxM',
  'beamSpanSimpleMaxM',
  'beamSpanContinuousMaxM',
  'columnSpacingMinM',
  'columnSpacingMaxM',
  'columnMergeDistanceM',
  'pointLoadLongSpanM',
  'pointLoadEndZone',
  'headroomUnderBeamMinM',
  'slabOneWayAspect',
  'slabMinThicknessMm',
  'stairRiserMaxMm',
  'stairRiserMinMm',
  'stairTreadMinMm',
  'stairRisersPerFlightMax',
  'stair2RTMinMm',
  'stair2RTMaxMm',
  'columnSteelRatio',
  'columnSteelRatioMin',
  'columnSteelRatioMax',
  'columnMinSideMm',
  'footingAllowance',
  'footingMinGapM',
  'beamCoverToSteelMm',
  'slabCoverToSteelMm',
  'rebarBeamKgPerM3',
  'rebarColumnKgPerM3',
  'rebarSlabKgPerM3',
  'rebarFootingKgPerM3',
] as const;
export type LimitKey = (typeof LIMIT_KEYS)[number];
export type Limits = Record<LimitKey, Limit>;

export interface CodeDefaults {
  family: CodeFamily;
  title: string;
  combinations: Combination[];
  /** unit weight of reinforced concrete, kN/m³ */
  concreteUnitWeight: Limit;
  limits: Limits;
}

const P = 'common practice';
const practice = (value: number, unit: string, note = ''): Limit => ({
  value,
  unit,
  source: note ? `${P} (${note})` : P,
  kind: 'practice',
});
const code = (value: number, unit: string, source: string): Limit => ({ value, unit, source, kind: 'code' });
const memory = (value: number, unit: string, source: string): Limit => ({
  value,
  unit,
  source: `${source}, from memory`,
  kind: 'memory',
});

function sharedLimits(): Omit<
  Limits,
  | 'stairRiserMaxMm'
  | 'stairRiserMinMm'
  | 'stairTreadMinMm'
  | 'stairRisersPerFlightMax'
  | 'columnSteelRatioMin'
  | 'columnSteelRatioMax'
  | 'columnMinSideMm'
  | 'headroomUnderBeamMinM'
> {
  return {
    beamSpanCantileverMaxM: practice(3, 'm', 'rectangular beams, imposed load up to about 4 kPa'),
    beamSpanSimpleMaxM: practice(6, 'm', 'rectangular beams, imposed load up to about 4 kPa'),
    beamSpanContinuousMaxM: practice(8, 'm', 'rectangular beams, imposed load up to about 4 kPa'),
    columnSpacingMinM: practice(4, 'm', 'economical spacing for residential frames 4–6 m'),
    columnSpacingMaxM: practice(6, 'm', 'economical spacing for residential frames 4–6 m'),
    columnMergeDistanceM: practice(1.5, 'm', 'set per project'),
    pointLoadLongSpanM: practice(5, 'm'),
    pointLoadEndZone: practice(0.2, 'fraction of span'),
    slabOneWayAspect: practice(2, 'long/short span', 'textbook rule'),
    slabMinThicknessMm: practice(125, 'mm'),
    stair2RTMinMm: practice(600, 'mm'),
    stair2RTMaxMm: practice(650, 'mm'),
    columnSteelRatio: practice(0.015, 'fraction of gross area', 'assumed for preliminary sizing'),
    footingAllowance: practice(0.1, 'fraction of column load', 'self-weight of footing and soil over it'),
    footingMinGapM: practice(0.3, 'm', 'clear gap between adjacent footings'),
    beamCoverToSteelMm: practice(50, 'mm', 'overall depth minus effective depth'),
    slabCoverToSteelMm: practice(25, 'mm', 'overall depth minus effective depth'),
    rebarBeamKgPerM3: practice(130, 'kg/m³', 'typical ratio'),
    rebarColumnKgPerM3: practice(180, 'kg/m³', 'typical ratio'),
    rebarSlabKgPerM3: practice(85, 'kg/m³', 'typical ratio'),
    rebarFootingKgPerM3: practice(70, 'kg/m³', 'typical ratio'),
  };
}

/**
 * Default limits, combinations and material values of a code family. Units as each limit says.
 */
export function codeDefaults(family: CodeFamily): CodeDefaults {
  checkFamily(family);
  const shared = sharedLimits();
  if (family === 'IS456') {
    return {
      family,
      title: 'IS 456:2000 with IS 875 loads',
      combinations: [{ id: '1.5(DL+IL)', dead: 1.5, live: 1.5, source: 'IS 456:2000 Table 18' }],
      concreteUnitWeight: memory(25, 'kN/m³', 'IS 456:2000 cl. 19.2.1'),
      limits: {
        ...shared,
        stairRiserMaxMm: code(190, 'mm', 'National Building Code of India, residential (as quoted)'),
        stairRiserMinMm: practice(100, 'mm'),
        stairTreadMinMm: code(250, 'mm', 'National Building Code of India, residential (as quoted)'),
        stairRisersPerFlightMax: memory(15, 'risers', 'National Building Code of India 2016'),
        columnSteelRatioMin: code(0.008, 'fraction', 'IS 456:2000 cl. 26.5.3.1'),
        columnSteelRatioMax: practice(0.04, 'fraction', 'IS 456 cl. 26.5.3.1 allows 6 %; 4 % keeps laps buildable'),
        columnMinSideMm: practice(230, 'mm'),
        headroomUnderBeamMinM: memory(
          2.2,
          'm',
          'National Building Code of India, headroom (clause not confirmed), used as a guide under beams',
        ),
      },
    };
  }
  if (family === 'ACI318') {
    return {
      family,
      title: 'ACI 318-19 with ASCE 7-22 loads',
      combinations: [
        { id: '1.4D', dead: 1.4, live: 0, source: 'ASCE 7-22 §2.3.1 (as quoted)' },
        { id: '1.2D+1.6L', dead: 1.2, live: 1.6, source: 'ASCE 7-22 §2.3.1 (as quoted)' },
      ],
      concreteUnitWeight: practice(23.6, 'kN/m³', '150 lb/ft³ normalweight reinforced concrete'),
      limits: {
        ...shared,
        stairRiserMaxMm: code(178, 'mm', 'IBC 2015 §1011.5.2'),
        stairRiserMinMm: code(102, 'mm', 'IBC 2015 §1011.5.2'),
        stairTreadMinMm: code(279, 'mm', 'IBC 2015 §1011.5.2'),
        stairRisersPerFlightMax: memory(20, 'risers', 'IBC 2015 §1011.8, 3658 mm rise per flight at 178 mm risers'),
        columnSteelRatioMin: code(0.01, 'fraction', 'ACI 318-19 §10.6.1.1'),
        columnSteelRatioMax: code(0.08, 'fraction', 'ACI 318-19 §10.6.1.1'),
        columnMinSideMm: practice(300, 'mm'),
        // 2032 mm (80 in) is the IBC 2015 §1011.3 headroom over stairways, not a rule for rooms;
        // used as a guide to the clear height under a beam
        headroomUnderBeamMinM: memory(
          2.03,
          'm',
          'IBC 2015 §1011.3 stairway headroom, 80 in (2032 mm), used as a guide under beams',
        ),
      },
    };
  }
  return {
    family,
    title: 'EN 1992-1-1 with EN 1990 and EN 1991-1-1 loads',
    combinations: [
      { id: '6.10a', dead: 1.35, live: 1.5 * 0.7, source: 'EN 1990 eq. 6.10a, ψ0 = 0.7 (categories A, B)' },
      { id: '6.10b', dead: 0.85 * 1.35, live: 1.5, source: 'EN 1990 eq. 6.10b, ξ = 0.85' },
    ],
    concreteUnitWeight: code(25, 'kN/m³', 'EN 1991-1-1 Annex A (24 + 1 for reinforcement, as quoted)'),
    limits: {
      ...shared,
      stairRiserMaxMm: practice(190, 'mm', 'national building regulations govern'),
      stairRiserMinMm: practice(100, 'mm', 'national building regulations govern'),
      stairTreadMinMm: practice(250, 'mm', 'national building regulations govern'),
      stairRisersPerFlightMax: practice(16, 'risers', 'national building regulations govern'),
      columnSteelRatioMin: code(0.002, 'fraction', 'EN 1992-1-1 §9.5.2(2)'),
      columnSteelRatioMax: code(0.04, 'fraction', 'EN 1992-1-1 §9.5.2(3) recommended'),
      columnMinSideMm: practice(250, 'mm'),
      headroomUnderBeamMinM: practice(2.2, 'm', 'national building regulations govern'),
    },
  };
}

/**
 * The defaults with a project's overrides applied (each value in its limit's own unit, 0 to
 * 1 000 000); overridden limits say so. Unknown keys are ignored here (validateScheme reports
 * them); a value that is not such a number throws StructuralInputError.
 */
export function resolveLimits(family: CodeFamily, overrides?: Partial<Record<string, number>>): Limits {
  const limits = { ...codeDefaults(family).limits };
  const given = typeof overrides === 'object' && overrides !== null ? Object.entries(overrides) : [];
  const bad = given.filter(
    ([k, v]) => k in limits && v !== undefined && !(typeof v === 'number' && Number.isFinite(v) && v >= 0 && v <= 1e6),
  );
  if (bad.length)
    throw new StructuralInputError(
      bad.map(([k]) => ({
        path: `limitOverrides.${k}`,
        field: k,
        message: "must be a number from 0 to 1000000 in the limit's unit",
      })),
    );
  for (const [k, v] of given) {
    if (typeof v !== 'number' || !(k in limits)) continue;
    const key = k as LimitKey;
    limits[key] = {
      ...limits[key],
      value: v,
      source: `project setting (default ${limits[key].value} ${limits[key].unit}: ${limits[key].source})`,
      kind: 'project',
    };
  }
  return limits;
}

/** Modulus of elasticity of concrete, MPa, from the characteristic strength fck (MPa). */
export function concreteModulusMPa(family: CodeFamily, fck: number): { value: number; source: string } {
  checkFormulaInput(family, { bMm: 1, dMm: 1, fck, fy: 500 });
  if (family === 'IS456') return { value: 5000 * Math.sqrt(fck), source: 'IS 456:2000 cl. 6.2.3.1' };
  if (family === 'ACI318') return { value: 4700 * Math.sqrt(fck), source: 'ACI 318-19 §19.2.2.1' };
  return { value: 22000 * Math.pow((fck + 8) / 10, 0.3), source: 'EN 1992-1-1 Table 3.1 (Ecm)' };
}

// ---- span/depth ----

export type SupportCondition = 'cantilever' | 'simple' | 'endSpan' | 'interior';

export interface DepthRule {
  /** required effective depth (IS, EN) or overall depth (ACI), mm */
  requiredMm: number;
  /** which depth requiredMm is */
  measure: 'effective' | 'overall';
  ratio: number;
  source: string;
  kind: SourceKind;
}

/**
 * Span/depth rule for a beam of span L (m) under the given support condition; fy in MPa.
 * IS 456 cl. 23.2.1 gives span/effective depth (× 10/L beyond 10 m, modification factors taken
 * as 1.0); ACI 318-19 Table 9.3.1.1 gives overall depth; EN 1992-1-1 Table 7.4N span/effective
 * depth for highly stressed members (ρ = 1.5 %).
 */
export function beamDepthRule(family: CodeFamily, condition: SupportCondition, spanM: number, fy: number): DepthRule {
  checkFormulaInput(family, { bMm: 1, dMm: 1, fck: 20, fy });
  checkSpan(condition, { spanM });
  const Lmm = spanM * 1000;
  if (family === 'IS456') {
    let ratio = condition === 'cantilever' ? 7 : condition === 'simple' ? 20 : 26;
    let source = 'IS 456:2000 cl. 23.2.1 (modification factors taken as 1.0)';
    if (condition !== 'cantilever' && spanM > 10) {
      ratio *= 10 / spanM;
      source += ', × 10/span for spans over 10 m (cl. 23.2.1(b))';
    }
    return { requiredMm: Lmm / ratio, measure: 'effective', ratio, source, kind: 'code' };
  }
  if (family === 'ACI318') {
    const base = condition === 'cantilever' ? 8 : condition === 'simple' ? 16 : condition === 'endSpan' ? 18.5 : 21;
    const mod = 0.4 + fy / 700;
    const kind: SourceKind = condition === 'cantilever' || condition === 'simple' ? 'code' : 'memory';
    const src =
      'ACI 318-19 Table 9.3.1.1, × (0.4 + fy/700)' + (kind === 'memory' ? ' (continuous cases from memory)' : '');
    return { requiredMm: (Lmm / base) * mod, measure: 'overall', ratio: base / mod, source: src, kind };
  }
  const ratio = condition === 'cantilever' ? 6 : condition === 'simple' ? 14 : condition === 'endSpan' ? 18 : 20;
  return {
    requiredMm: Lmm / ratio,
    measure: 'effective',
    ratio,
    source: 'EN 1992-1-1 Table 7.4N, highly stressed (ρ = 1.5 %); K factors published, l/d values from memory',
    kind: 'memory',
  };
}

/**
 * Slab thickness rule for a panel with short span lx (m), long span ly (m), one-way or two-way,
 * continuous on `continuousEdges` of its edges; fy in MPa. Returns overall depth, mm, before minimums.
 */
export function slabDepthRule(
  family: CodeFamily,
  oneWay: boolean,
  condition: SupportCondition,
  lxM: number,
  lyM: number,
  fy: number,
  coverMm: number,
): DepthRule {
  checkFormulaInput(family, { bMm: 1, dMm: 1, fck: 20, fy });
  checkSpan(condition, { lxM, lyM, coverMm: coverMm / 1000 });
  const lx = lxM * 1000;
  if (family === 'IS456') {
    if (oneWay) {
      const ratio = condition === 'cantilever' ? 7 : condition === 'simple' ? 20 : 26;
      return {
        requiredMm: lx / ratio + coverMm,
        measure: 'overall',
        ratio,
        source: 'IS 456:2000 cl. 23.2.1 (one-way slab, modification factor taken as 1.0)',
        kind: 'code',
      };
    }
    const base = condition === 'simple' ? 35 : 40;
    // the note gives mild steel (× 1.0) and Fe 415 (× 0.8) only; a lower grade than Fe 415 takes
    // the Fe 415 factor (on the safe side); a higher grade is outside the note, and the factor is
    // scaled by 415/fy, as the service steel stress rises with fy (derived, not in the clause)
    const factor = fy <= 250 ? 1 : fy <= 415 ? 0.8 : (0.8 * 415) / fy;
    const ratio = base * factor;
    // the clause is stated for short spans up to 3.5 m and imposed loads up to 3 kPa
    const scope = lxM > 3.5 ? '; stated for short spans up to 3.5 m, used beyond as a guide' : '';
    const grade =
      fy <= 250
        ? 'mild steel, × 1.0'
        : fy <= 415
          ? `× 0.8 for Fe 415${fy < 415 ? ' (used for Fe ' + fy + ', on the safe side)' : ''}`
          : `Fe ${fy} is outside the note: × 0.8 × 415/${fy} = ${factor.toFixed(3)}, derived`;
    return {
      requiredMm: lx / ratio,
      measure: 'overall',
      ratio,
      source: `IS 456:2000 cl. 24.1 Note 2 (two-way, short span/overall depth, ${grade}${scope})`,
      kind: fy > 415 ? 'derived' : 'code',
    };
  }
  if (family === 'ACI318') {
    if (oneWay) {
      const base = condition === 'cantilever' ? 10 : condition === 'simple' ? 20 : condition === 'endSpan' ? 24 : 28;
      const mod = 0.4 + fy / 700;
      return {
        requiredMm: (lx / base) * mod,
        measure: 'overall',
        ratio: base / mod,
        source: 'ACI 318-19 Table 7.3.1.1, × (0.4 + fy/700)',
        kind: 'code',
      };
    }
    const beta = lyM / lxM;
    const ln = lyM * 1000; // clear span in the long direction, taken as the centre-line span here
    const h = (ln * (0.8 + fy / 1400)) / (36 + 9 * beta);
    return {
      requiredMm: Math.max(h, 90),
      measure: 'overall',
      ratio: ln / h,
      source: 'ACI 318-19 Table 8.3.1.2 (two-way slab with stiff beams, αfm > 2), from memory',
      kind: 'memory',
    };
  }
  const ratio = condition === 'cantilever' ? 8 : condition === 'simple' ? 20 : condition === 'endSpan' ? 26 : 30;
  return {
    requiredMm: lx / ratio + coverMm,
    measure: 'overall',
    ratio,
    source: 'EN 1992-1-1 Table 7.4N, lightly stressed (ρ = 0.5 %), short span; l/d values from memory',
    kind: 'memory',
  };
}

// ---- capacities ----

/**
 * Design moment capacity of a singly reinforced rectangular section at the limit the code family
 * allows without compression steel, kN·m. b and d in mm, strengths in MPa.
 */
export function limitingMomentKNm(
  family: CodeFamily,
  bMm: number,
  dMm: number,
  fck: number,
  fy: number,
  opts?: { alphaCc?: number },
): { value: number; coefficient: number; source: string; kind: SourceKind } {
  checkFormulaInput(family, { bMm, dMm, fck, fy }, opts);
  if (family === 'IS456') {
    const k = fy <= 250 ? 0.148 : fy <= 415 ? 0.138 : 0.133;
    return {
      value: (k * fck * bMm * dMm * dMm) / 1e6,
      coefficient: k,
      source: 'IS 456:2000 Annex G-1.1 (Mu,lim = k·fck·b·d²)',
      kind: 'code',
    };
  }
  if (family === 'ACI318') {
    // ACI 318-19 Table 21.2.2: tension-controlled when εt ≥ εty + 0.003, εty = fy/Es (Es = 200 GPa,
    // §20.2.2.2); with εcu = 0.003 (§22.2.2.1) that gives c/d = 0.003/(0.006 + fy/Es)
    const beta1 = Math.min(0.85, Math.max(0.65, 0.85 - (0.05 * (fck - 28)) / 7));
    const cd = 0.003 / (0.006 + fy / 200000);
    const a = beta1 * cd;
    const coeff = 0.9 * 0.85 * a * (1 - a / 2);
    return {
      value: (coeff * fck * bMm * dMm * dMm) / 1e6,
      coefficient: coeff,
      source: `ACI 318-19 §22.2.2 stress block, β1 per Table 22.2.2.4.3, tension-controlled εt ≥ εty + 0.003 (Table 21.2.2): c/d = ${cd.toFixed(4)}, φ = 0.90`,
      kind: 'derived',
    };
  }
  // EN 1992-1-1 §3.1.7 rectangular block (λ = 0.8, η = 1), fcd = αcc fck/1.5, x/d ≤ 0.45 (§5.6.3)
  const acc = alphaCcOf(opts);
  const x = 0.45;
  const coeff = (acc / 1.5) * 0.8 * x * (1 - 0.4 * x);
  return {
    value: (coeff * fck * bMm * dMm * dMm) / 1e6,
    coefficient: coeff,
    source: `EN 1992-1-1 §3.1.7 and §5.6.3 (x/d ≤ 0.45, ${alphaCcText(acc)}), derived`,
    kind: 'derived',
  };
}

/** αcc of EN 1992-1-1 §3.1.6(1): recommended 1.0; a national annex may choose another value (0.8 to 1.0). */
export const EN_ALPHA_CC_DEFAULT = 1.0;
function alphaCcOf(opts?: { alphaCc?: number }): number {
  return opts?.alphaCc ?? EN_ALPHA_CC_DEFAULT;
}
function alphaCcText(acc: number): string {
  return acc === EN_ALPHA_CC_DEFAULT
    ? 'αcc = 1.0, the recommended value of §3.1.6(1)'
    : `αcc = ${acc} (project setting; recommended 1.0)`;
}

/**
 * Design axial capacity of a short tied column, kN. Section b × D mm, steel ratio of the gross
 * area, strengths MPa. EN 1992-1-1: at the minimum eccentricity e0 = max(h/30, 20 mm) of §6.1(4)
 * about the weaker axis (or opts.eccentricityMm), by strain compatibility with the
 * parabola-rectangle diagram of §3.1.7 and the strain limits of Table 3.1 (so the steel stress is
 * capped by Es·εc2, about 400 MPa, in pure compression, §6.1(5)); bars half at each face, 50 mm
 * (at most 0.2 h) from it (common practice).
 */
export function columnCapacityKN(
  family: CodeFamily,
  bMm: number,
  dMm: number,
  fck: number,
  fy: number,
  steelRatio: number,
  opts?: { alphaCc?: number; eccentricityMm?: number },
): { value: number; source: string } {
  checkFormulaInput(family, { bMm, dMm, fck, fy }, opts);
  if (!(Number.isFinite(steelRatio) && steelRatio >= 0 && steelRatio <= 0.1))
    throw new StructuralInputError([
      { path: 'steelRatio', field: 'steelRatio', message: 'must be a fraction of the gross area from 0 to 0.1' },
    ]);
  const ag = bMm * dMm;
  const as = steelRatio * ag;
  const ac = ag - as;
  if (family === 'IS456')
    return {
      value: (0.4 * fck * ac + 0.67 * fy * as) / 1000,
      source: 'IS 456:2000 cl. 39.3 (Pu = 0.4 fck Ac + 0.67 fy Asc)',
    };
  if (family === 'ACI318') {
    const po = 0.85 * fck * ac + fy * as;
    return { value: (0.65 * 0.8 * po) / 1000, source: 'ACI 318-19 §22.4.2 (φ·0.80·Po, tied, φ = 0.65)' };
  }
  const acc = alphaCcOf(opts);
  const h = Math.min(bMm, dMm);
  const b = Math.max(bMm, dMm);
  const emin = Math.max(h / 30, 20);
  const e0 = opts?.eccentricityMm ?? emin;
  const n = enSectionAxial(b, h, fck, fy, as, acc, e0);
  const ecc =
    opts?.eccentricityMm === undefined ? `e0 = max(h/30, 20 mm) = ${emin.toFixed(1)} mm (§6.1(4))` : `e = ${e0} mm`;
  return {
    value: n / 1000,
    source: `EN 1992-1-1 §3.1.7 and §6.1 (strain compatibility at ${ecc}, steel stress ≤ Es·εc2 in compression, ${alphaCcText(acc)})`,
  };
}

/**
 * Axial resistance (N) of a symmetric rectangular section b × h (mm) with As (mm²) half at each
 * face, under an axial load at eccentricity e (mm) about the h direction: the strain plane is
 * found by bisection on the neutral-axis depth (pivots of EN 1992-1-1 Fig. 6.1).
 */
function enSectionAxial(b: number, h: number, fck: number, fyk: number, as: number, acc: number, e: number): number {
  const fcd = (acc * fck) / 1.5;
  const fyd = fyk / 1.15;
  const Es = 200000;
  // EN 1992-1-1 Table 3.1 (parabola-rectangle)
  const ec2 = fck <= 50 ? 0.002 : (2.0 + 0.085 * Math.pow(fck - 50, 0.53)) / 1000;
  const ecu2 = fck <= 50 ? 0.0035 : (2.6 + 35 * Math.pow((90 - fck) / 100, 4)) / 1000;
  const nExp = fck <= 50 ? 2 : 1.4 + 23.4 * Math.pow((90 - fck) / 100, 4);
  const sc = (eps: number) => (eps <= 0 ? 0 : eps >= ec2 ? fcd : fcd * (1 - Math.pow(1 - eps / ec2, nExp)));
  const ss = (eps: number) => Math.max(-fyd, Math.min(fyd, Es * eps));
  const dp = Math.min(50, 0.2 * h);
  const yp = (1 - ec2 / ecu2) * h;
  const strips = 100;
  const dy = h / strips;
  // axial force N and moment M about mid-depth for neutral-axis depth x (mm from the compressed face)
  const state = (x: number): [number, number] => {
    const eps = (y: number) => (x <= h ? (ecu2 * (x - y)) / x : (ec2 * (x - y)) / (x - yp));
    let N = 0,
      M = 0;
    for (let k = 0; k < strips; k++) {
      const y = (k + 0.5) * dy;
      const f = sc(eps(y)) * b * dy;
      N += f;
      M += f * (h / 2 - y);
    }
    for (const y of [dp, h - dp]) {
      const ey = eps(y);
      // the bar displaces the concrete it stands in
      const f = (as / 2) * (ss(ey) - sc(ey));
      N += f;
      M += f * (h / 2 - y);
    }
    return [N, M];
  };
  if (e <= 0) return state(1e6 * h)[0];
  // e = M/N falls as x grows: bisection on log x between a shallow and an all-but-uniform plane
  // start from the shallowest plane with net compression (N rises with x; near N = 0+, M/N is large)
  let lo = Math.log(0.01 * h);
  const hi0 = Math.log(1e6 * h);
  while (lo < hi0 && !(state(Math.exp(lo))[0] > 0)) lo += 0.05;
  let hi = hi0;
  const [n0, m0] = state(Math.exp(lo));
  if (!(n0 > 0) || m0 / n0 < e) return Math.max(0, n0);
  for (let it = 0; it < 60; it++) {
    const mid = (lo + hi) / 2;
    const [N, M] = state(Math.exp(mid));
    if (N > 0 && M / N > e) lo = mid;
    else hi = mid;
  }
  return state(Math.exp(lo))[0];
}

function checkFamily(family: unknown): void {
  if (family !== 'IS456' && family !== 'ACI318' && family !== 'EN1992')
    throw new StructuralInputError([
      { path: 'family', field: 'family', message: 'must be one of IS456, ACI318, EN1992' },
    ]);
}

/** Spans from 0.1 to 100 m (cover given in m here: 0 to 0.2), and a known support condition. */
function checkSpan(condition: unknown, v: Record<string, number>): void {
  const problems: { path: string; field: string; message: string }[] = [];
  if (!['cantilever', 'simple', 'endSpan', 'interior'].includes(condition as string))
    problems.push({
      path: 'condition',
      field: 'condition',
      message: 'must be cantilever, simple, endSpan or interior',
    });
  for (const [field, x] of Object.entries(v)) {
    const [lo, hi] = field === 'coverMm' ? [0, 0.2] : [0.1, 100];
    if (!(Number.isFinite(x) && x >= lo && x <= hi))
      problems.push({
        path: field,
        field,
        message:
          field === 'coverMm'
            ? 'must be a number of mm from 0 to 200'
            : `must be a number of metres from ${lo} to ${hi}`,
      });
  }
  if (problems.length) throw new StructuralInputError(problems);
}

/** Refuses a family or strengths the formulas do not cover (one documented error type). */
function checkFormulaInput(
  family: unknown,
  v: { bMm: number; dMm: number; fck: number; fy: number },
  opts?: { alphaCc?: number; eccentricityMm?: number },
): void {
  // the usual case, without allocating: sizing calls these formulas tens of thousands of times
  if (
    (family === 'IS456' || family === 'ACI318' || family === 'EN1992') &&
    v.bMm >= 1 &&
    v.bMm <= 5000 &&
    v.dMm >= 1 &&
    v.dMm <= 5000 &&
    v.fck >= 10 &&
    v.fck <= 120 &&
    v.fy >= 200 &&
    v.fy <= 700 &&
    (opts?.alphaCc === undefined || (opts.alphaCc >= 0.8 && opts.alphaCc <= 1)) &&
    (opts?.eccentricityMm === undefined || (opts.eccentricityMm >= 0 && opts.eccentricityMm <= 5000))
  )
    return;
  const problems: { path: string; field: string; message: string }[] = [];
  if (family !== 'IS456' && family !== 'ACI318' && family !== 'EN1992')
    problems.push({ path: 'family', field: 'family', message: 'must be one of IS456, ACI318, EN1992' });
  for (const [field, lo, hi] of [
    ['bMm', 1, 5000],
    ['dMm', 1, 5000],
    ['fck', 10, 120],
    ['fy', 200, 700],
  ] as const) {
    const x = v[field];
    if (!(Number.isFinite(x) && x >= lo && x <= hi))
      problems.push({ path: field, field, message: `must be a number from ${lo} to ${hi}` });
  }
  if (opts?.alphaCc !== undefined && !(opts.alphaCc >= 0.8 && opts.alphaCc <= 1))
    problems.push({ path: 'alphaCc', field: 'alphaCc', message: 'must be from 0.8 to 1.0 (EN 1992-1-1 §3.1.6(1))' });
  if (opts?.eccentricityMm !== undefined && !(opts.eccentricityMm >= 0 && opts.eccentricityMm <= 5000))
    problems.push({
      path: 'eccentricityMm',
      field: 'eccentricityMm',
      message: 'must be a number of mm from 0 to 5000',
    });
  if (problems.length) throw new StructuralInputError(problems);
}
