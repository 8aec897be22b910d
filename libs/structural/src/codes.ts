// Code-family defaults: load combinations, material relations, capacity formulas and the limits
// the checks use. Every value carries its source; rules of thumb say "common practice" and
// recalled values say "from memory" so that a reader knows how far to trust them.
import type { CodeFamily } from './model';

/**
 * Shown with every result that reaches a person.
 */
export const CAUTION =
  'Preliminary planning results only. The governing design code and local regulations apply; ' +
  'final analysis, design and sealing of the structure belong to a licensed structural engineer.';

/** How a value is known: a standard, common practice (no published source), recalled from memory, derived, or set for the project. */
export type SourceKind = 'code' | 'practice' | 'memory' | 'derived' | 'project';

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
const practice = (value: number, unit: string, note = ''): Limit => ({ value, unit, source: note ? `${P} (${note})` : P, kind: 'practice' });
const code = (value: number, unit: string, source: string): Limit => ({ value, unit, source, kind: 'code' });
const memory = (value: number, unit: string, source: string): Limit => ({ value, unit, source: `${source}, from memory`, kind: 'memory' });

function sharedLimits(): Omit<Limits, 'stairRiserMaxMm' | 'stairRiserMinMm' | 'stairTreadMinMm' | 'stairRisersPerFlightMax' | 'columnSteelRatioMin' | 'columnSteelRatioMax' | 'columnMinSideMm' | 'headroomUnderBeamMinM'> {
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
        headroomUnderBeamMinM: memory(2.2, 'm', 'National Building Code of India, clear height under a beam'),
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
        headroomUnderBeamMinM: memory(2.03, 'm', 'IBC 2015 §1208.2 projections below ceilings'),
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

/** The defaults with a project's overrides applied (each value in its limit's own unit); overridden limits say so. */
export function resolveLimits(family: CodeFamily, overrides?: Partial<Record<string, number>>): Limits {
  const limits = { ...codeDefaults(family).limits };
  for (const [k, v] of Object.entries(overrides ?? {})) {
    if (typeof v !== 'number' || !(k in limits)) continue;
    const key = k as LimitKey;
    limits[key] = { ...limits[key], value: v, source: `project setting (default ${limits[key].value} ${limits[key].unit}: ${limits[key].source})`, kind: 'project' };
  }
  return limits;
}

/** Modulus of elasticity of concrete, MPa, from the characteristic strength fck (MPa). */
export function concreteModulusMPa(family: CodeFamily, fck: number): { value: number; source: string } {
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
    const src = 'ACI 318-19 Table 9.3.1.1, × (0.4 + fy/700)' + (kind === 'memory' ? ' (continuous cases from memory)' : '');
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
  const lx = lxM * 1000;
  if (family === 'IS456') {
    if (oneWay) {
      const ratio = condition === 'cantilever' ? 7 : condition === 'simple' ? 20 : 26;
      return { requiredMm: lx / ratio + coverMm, measure: 'overall', ratio, source: 'IS 456:2000 cl. 23.2.1 (one-way slab, modification factor taken as 1.0)', kind: 'code' };
    }
    const base = condition === 'simple' ? 35 : 40;
    const ratio = fy > 250 ? base * 0.8 : base;
    // the clause is stated for short spans up to 3.5 m and imposed loads up to 3 kPa
    const scope = lxM > 3.5 ? '; stated for short spans up to 3.5 m, used beyond as a guide' : '';
    return { requiredMm: lx / ratio, measure: 'overall', ratio, source: `IS 456:2000 cl. 24.1 Note 2 (two-way, short span/overall depth, × 0.8 for Fe 415${scope})`, kind: 'code' };
  }
  if (family === 'ACI318') {
    if (oneWay) {
      const base = condition === 'cantilever' ? 10 : condition === 'simple' ? 20 : condition === 'endSpan' ? 24 : 28;
      const mod = 0.4 + fy / 700;
      return { requiredMm: (lx / base) * mod, measure: 'overall', ratio: base / mod, source: 'ACI 318-19 Table 7.3.1.1, × (0.4 + fy/700)', kind: 'code' };
    }
    const beta = lyM / lxM;
    const ln = lyM * 1000; // clear span in the long direction, taken as the centre-line span here
    const h = (ln * (0.8 + fy / 1400)) / (36 + 9 * beta);
    return { requiredMm: Math.max(h, 90), measure: 'overall', ratio: ln / h, source: 'ACI 318-19 Table 8.3.1.2 (two-way slab with stiff beams, αfm > 2), from memory', kind: 'memory' };
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
export function limitingMomentKNm(family: CodeFamily, bMm: number, dMm: number, fck: number, fy: number): { value: number; coefficient: number; source: string; kind: SourceKind } {
  if (family === 'IS456') {
    const k = fy <= 250 ? 0.148 : fy <= 415 ? 0.138 : 0.133;
    return { value: (k * fck * bMm * dMm * dMm) / 1e6, coefficient: k, source: 'IS 456:2000 Annex G-1.1 (Mu,lim = k·fck·b·d²)', kind: 'code' };
  }
  if (family === 'ACI318') {
    // tension-controlled limit: net tensile strain 0.005 gives c/d = 0.003/0.008 = 0.375
    const beta1 = Math.min(0.85, Math.max(0.65, 0.85 - (0.05 * (fck - 28)) / 7));
    const a = beta1 * 0.375;
    const coeff = 0.9 * 0.85 * a * (1 - a / 2);
    return {
      value: (coeff * fck * bMm * dMm * dMm) / 1e6,
      coefficient: coeff,
      source: 'ACI 318-19 §22.2.2 stress block, β1 per Table 22.2.2.4.3, tension-controlled c/d = 0.375, φ = 0.90 (§21.2)',
      kind: 'derived',
    };
  }
  // EN 1992-1-1 §3.1.7 rectangular block (λ = 0.8, η = 1), fcd = 0.85 fck/1.5, x/d ≤ 0.45 (§5.6.3)
  const x = 0.45;
  const coeff = ((0.85 / 1.5) * 0.8 * x * (1 - 0.4 * x));
  return { value: (coeff * fck * bMm * dMm * dMm) / 1e6, coefficient: coeff, source: 'EN 1992-1-1 §3.1.7 and §5.6.3 (x/d ≤ 0.45, αcc = 0.85), derived', kind: 'derived' };
}

/**
 * Design axial capacity of a short tied column, kN. Section b × D mm, steel ratio of the gross
 * area, strengths MPa.
 */
export function columnCapacityKN(family: CodeFamily, bMm: number, dMm: number, fck: number, fy: number, steelRatio: number): { value: number; source: string } {
  const ag = bMm * dMm;
  const as = steelRatio * ag;
  const ac = ag - as;
  if (family === 'IS456') return { value: (0.4 * fck * ac + 0.67 * fy * as) / 1000, source: 'IS 456:2000 cl. 39.3 (Pu = 0.4 fck Ac + 0.67 fy Asc)' };
  if (family === 'ACI318') {
    const po = 0.85 * fck * ac + fy * as;
    return { value: (0.65 * 0.8 * po) / 1000, source: 'ACI 318-19 §22.4.2 (φ·0.80·Po, tied, φ = 0.65)' };
  }
  return { value: ((0.85 / 1.5) * fck * ac + (fy / 1.15) * as) / 1000, source: 'EN 1992-1-1 §3.1.6 and §3.2.7 (NRd = fcd Ac + fyd As, αcc = 0.85)' };
}
