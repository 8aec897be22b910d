// The whole derivation for one scheme: layout, loads, beam-line envelopes, sizes, column loads
// storey by storey, footings against the site, checks, quantities and cost.
import type { BeamModel, Support } from './beam';
import { prepareBeam, PreparedBeam } from './beam';
import {
  check,
  Check,
  CheckList,
  PassedRule,
  columnSpacingChecks,
  columnWallChecks,
  pointLoadChecks,
  RULES,
  spanChecks,
  stairChecks,
} from './checks';
import {
  CAUTION,
  codeDefaults,
  columnCapacityKN,
  Combination,
  concreteModulusMPa,
  beamDepthRule,
  Limits,
  resolveLimits,
} from './codes';
import { ArrangementCache, BeamEnvelope, envelopeParts, loadPart, LoadPart, MemberEnvelope } from './envelope';
import { isolatedFooting, IsolatedFooting, roundUp } from './footings';
import { BeamLine, columnPlan, deriveLayout, Layout, SpanKind } from './layout';
import { levelLoads, LevelLoads, PanelLoad, SecondaryLoad, SlabShapes, slabShapes } from './loads';
import type { EngineMemo } from './memo';
import type { CodeFamily, Problem, Scheme } from './model';
import { costOf, Cost, Quantities, QuantityTally } from './quantities';
import {
  boundaryOptions,
  BoundaryOptions,
  FootingSite,
  LineClearance,
  overlappingFootings,
  OverlapCombined,
  propertyLineClearances,
} from './site';
import { beamDepth, BeamSize, columnSizer, slabSizes, SlabSize } from './sizing';
import { validateScheme } from './validate';
import { StructuralInputError } from './errors';

export type LevelKind = 'floor' | 'roof';

export interface BeamLineResult {
  lineId: string;
  gridLineId: string;
  label: string;
  level: LevelKind;
  /** beam section used for stiffness and self-weight, mm */
  widthMm: number;
  depthForSelfWeightMm: number;
  members: (MemberEnvelope & { id: string; lengthM: number; kind: SpanKind })[];
  /** per node: position along the line (m), column, service reactions and largest factored reaction (kN) */
  reactions: { s: number; columnId: string | null; deadKN: number; liveKN: number; maxFactoredKN: number }[];
  patternsTried: number;
}

/** Axial loads of one column, storey by storey: index 0 is storey 1, the lowest. kN. */
export interface ColumnLoads {
  columnId: string;
  deadKN: number[];
  liveKN: number[];
  factoredKN: number[];
  /** service load (D + L) by tributary area, as a cross-check of deadKN + liveKN */
  tributaryKN: number[];
}

/** The section a column needs, storey by storey (index 0 = storey 1), beside the section it has. */
export interface ColumnSizes {
  columnId: string;
  providedMm: [number, number];
  /** capacity of the given section, kN, and the formula with the assumed steel ratio */
  providedCapacityKN: number;
  source: string;
  requiredAreaMm2: number[];
  /** square side needed, rounded up to 25 mm and at least the minimum side, mm */
  requiredSideMm: number[];
  /** factored load / capacity of the given section */
  utilisation: number[];
  /**
   * steel the given section needs for each storey's factored load, as a fraction of the gross
   * area: 0 where the concrete alone carries it, at most 1.5 × the code's maximum (beyond it the
   * section is too small); the code's minimum is not applied here (its check says so)
   */
  steelRatio: number[];
}

export interface SchemeResult {
  caution: string;
  ok: boolean;
  problems: Problem[];
  schemeId: string;
  schemeName: string;
  codeFamily: CodeFamily | null;
  codeTitle: string;
  limits: Limits | null;
  combinations: Combination[];
  /** checks that failed, in full (errors first) */
  checks: Check[];
  /** checks that passed, per rule: how many and the one nearest its limit */
  passed: PassedRule[];
  loads: {
    slabThicknessMm: number;
    levels: {
      kind: LevelKind;
      count: number;
      slabDeadKPa: number;
      liveKPa: number;
      panels: PanelLoad[];
      secondaries: SecondaryLoad[];
    }[];
    columns: ColumnLoads[];
  };
  beamLines: BeamLineResult[];
  sizes: {
    slab: { adoptedMm: number; providedMm: number | null; panels: SlabSize[] };
    beams: BeamSize[];
    columns: ColumnSizes[];
    footings: ({ columnId: string; serviceKN: number; factoredKN: number } & IsolatedFooting)[];
  };
  footings: { boundary: BoundaryOptions[]; combined: OverlapCombined[] };
  quantities: Quantities;
  cost: Cost;
  /** totals that the comparison uses */
  summary: { columns: number; beamSpans: number; beamLengthM: number; longestSpanM: number; deepestBeamMm: number };
}

function emptyResult(scheme: unknown, problems: Problem[]): SchemeResult {
  const s = (typeof scheme === 'object' && scheme !== null ? scheme : {}) as Partial<Scheme>;
  return {
    caution: CAUTION,
    ok: false,
    problems,
    schemeId: typeof s.id === 'string' ? s.id : '',
    schemeName: typeof s.name === 'string' ? s.name : '',
    codeFamily: null,
    codeTitle: '',
    limits: null,
    combinations: [],
    checks: [],
    passed: [],
    loads: { slabThicknessMm: 0, levels: [], columns: [] },
    beamLines: [],
    sizes: { slab: { adoptedMm: 0, providedMm: null, panels: [] }, beams: [], columns: [], footings: [] },
    footings: { boundary: [], combined: [] },
    quantities: { rows: [], totals: { concreteM3: 0, steelKg: 0, formworkM2: 0 }, notes: [] },
    cost: { currency: '', rows: [], total: 0 },
    summary: { columns: 0, beamSpans: 0, beamLengthM: 0, longestSpanM: 0, deepestBeamMm: 0 },
  };
}

function lineModel(l: BeamLine, eiKNm2: number): BeamModel {
  const supports: Support[] = l.nodes.map((n) => (n.columnId === null ? 'free' : 'pin'));
  return { members: l.members.map((m) => ({ lengthM: m.lengthM, eiKNm2 })), supports };
}

/** Tributary plan area (m²) and beam lengths (m) per line around each column, from its neighbours on its beam lines. */
function tributaries(layout: Layout): Map<string, { area: number; lengths: { lineId: string; lengthM: number }[] }> {
  const w = new Map<string, { wx: number; wy: number; lengths: { lineId: string; lengthM: number }[] }>();
  for (const l of layout.lines) {
    l.nodes.forEach((n, i) => {
      if (!n.columnId) return;
      const left = i > 0 ? (l.nodes[i - 1].columnId ? (n.s - l.nodes[i - 1].s) / 2 : n.s - l.nodes[i - 1].s) : 0;
      const right =
        i + 1 < l.nodes.length ? (l.nodes[i + 1].columnId ? (l.nodes[i + 1].s - n.s) / 2 : l.nodes[i + 1].s - n.s) : 0;
      const e = w.get(n.columnId) ?? { wx: 0, wy: 0, lengths: [] };
      if (l.runs === 'x') e.wx = Math.max(e.wx, left + right);
      else e.wy = Math.max(e.wy, left + right);
      e.lengths.push({ lineId: l.id, lengthM: left + right });
      w.set(n.columnId, e);
    });
  }
  const out = new Map<string, { area: number; lengths: { lineId: string; lengthM: number }[] }>();
  for (const [id, e] of w) out.set(id, { area: e.wx * e.wy, lengths: e.lengths });
  return out;
}

/**
 * Analyses a scheme. Units: plan m, sections mm, loads kN, kN/m, kPa, moments kN·m, deflections mm.
 * Invalid input gives ok = false and the problems; the result always carries the caution.
 */
export function analyseScheme(scheme: Scheme, opts: { memo?: EngineMemo } = {}): SchemeResult {
  const problems = validateScheme(scheme);
  if (problems.length) return emptyResult(scheme, problems);
  opts.memo?.begin();
  try {
    return analyseValid(scheme, opts.memo);
  } catch (e) {
    // a helper refusing a derived figure (a span or a load beyond its range) is the scheme's
    // problem, not a crash; anything else is a bug and propagates
    if (e instanceof StructuralInputError)
      return emptyResult(
        scheme,
        e.problems.map((p) => ({
          ...p,
          path: `derived.${p.path}`,
          message: `a figure derived from the scheme is out of range: ${p.message}`,
        })),
      );
    throw e;
  } finally {
    opts.memo?.end();
  }
}

/** Longest beam span between columns the engine plans, m. */
export const MAX_SPAN_M = 30;

/**
 * What every beam line needs before its envelope: the code's figures, the layout, slab and beam
 * depths, each line's prepared beam, the distinct levels with their loads, and the slab's share of
 * each line reduced once. Spans beyond MAX_SPAN_M give their problems instead. Shared by
 * analyseScheme and beamLineDiagram so both see the same beams under the same loads.
 */
export function schemeLines(scheme: Scheme) {
  const b = scheme.basis;
  const family = b.codeFamily;
  const defaults = codeDefaults(family);
  const limits = resolveLimits(family, b.limitOverrides);
  const combos = defaults.combinations;
  const gamma = defaults.concreteUnitWeight.value;
  const fck = b.concreteMPa;
  const fy = b.steelMPa;
  const layout = deriveLayout(scheme);
  const N = b.storeys;
  const spanProblems: Problem[] = [];
  for (const l of layout.lines)
    for (const m of l.members)
      if (m.lengthM > MAX_SPAN_M)
        spanProblems.push({
          path: `grid.${l.gridLineId}`,
          elementId: m.id,
          field: 'span',
          message: `beam span ${m.lengthM.toFixed(2)} m is beyond the ${MAX_SPAN_M} m the engine plans (accepted: up to ${MAX_SPAN_M} m between columns)`,
        });
  if (spanProblems.length) return spanProblems;

  // slab
  const slabPanels = slabSizes(
    family,
    layout,
    fy,
    limits.slabOneWayAspect.value,
    limits.slabCoverToSteelMm.value,
    limits.slabMinThicknessMm.value,
  );
  const slabRequired = slabPanels.reduce((m, p) => Math.max(m, p.requiredMm), limits.slabMinThicknessMm.value);
  const slabT = b.slabThicknessMm ?? roundUp(slabRequired, 10);

  // beam depth assumed for stiffness and self-weight: given, or the span/depth depth
  const cover = limits.beamCoverToSteelMm.value;
  const spanDepthOverall = (kind: SpanKind, L: number) => {
    const r = beamDepthRule(family, kind, L, fy);
    return r.measure === 'overall' ? r.requiredMm : r.requiredMm + cover;
  };
  const lineDepth = new Map<string, number>();
  for (const l of layout.lines) {
    const d =
      l.specifiedDepthMm ??
      roundUp(Math.max(slabT + 100, ...l.members.map((m) => spanDepthOverall(m.kind, m.lengthM))), 25);
    lineDepth.set(l.id, d);
  }
  const secDepth = new Map<string, number>();
  const secWidth = new Map<string, number>();
  for (const s of layout.secondaries) {
    secDepth.set(
      s.beam.id,
      s.beam.depthMm ?? roundUp(Math.max(slabT + 100, spanDepthOverall('simple', s.lengthM)), 25),
    );
    secWidth.set(s.beam.id, s.beam.widthMm ?? b.beamWidthMm);
  }
  const E = concreteModulusMPa(family, fck).value * 1000; // kN/m²
  const prepared = new Map<string, PreparedBeam>();
  const models = new Map<string, BeamModel>();
  for (const l of layout.lines) {
    const bm = l.widthMm / 1000;
    const dm = (lineDepth.get(l.id) as number) / 1000;
    const model = lineModel(l, (E * bm * dm * dm * dm) / 12);
    models.set(l.id, model);
    prepared.set(l.id, prepareBeam(model));
  }

  // levels: every floor below the roof is alike; the roof differs (imposed load, no walls above)
  const kinds: { kind: LevelKind; count: number }[] =
    N >= 2
      ? [
          { kind: 'floor', count: N - 1 },
          { kind: 'roof', count: 1 },
        ]
      : [{ kind: 'roof', count: 1 }];
  const shapes = slabShapes(layout, limits.slabOneWayAspect.value);
  const levels = new Map<LevelKind, LevelLoads>();
  for (const k of kinds) {
    levels.set(
      k.kind,
      levelLoads(layout, shapes, {
        kind: k.kind,
        slabThicknessMm: slabT,
        superimposedDeadKPa: b.superimposedDeadKPa,
        liveKPa: k.kind === 'roof' ? (b.roofImposedKPa ?? b.imposedKPa) : b.imposedKPa,
        wallLoadKNPerM: b.wallLoadKNPerM,
        unitWeightKNm3: gamma,
        lineDepthMm: lineDepth,
        secondaryDepthMm: secDepth,
        secondaryWidthMm: secWidth,
      }),
    );
  }
  // the slab's share of each line, reduced once (when first asked for) and scaled per level
  const shapeParts = new Map<string, LoadPart>();
  const shapePart = (lineId: string): LoadPart | undefined => {
    let part = shapeParts.get(lineId);
    const p = prepared.get(lineId);
    if (!part && p?.ok) {
      part = loadPart(p, shapes.lines.get(lineId) ?? []);
      shapeParts.set(lineId, part);
    }
    return part;
  };
  return {
    b,
    family,
    defaults,
    limits,
    combos,
    gamma,
    fck,
    fy,
    layout,
    slabPanels,
    slabT,
    cover,
    lineDepth,
    secDepth,
    secWidth,
    prepared,
    kinds,
    shapes,
    levels,
    shapePart,
  };
}

/** The dead and imposed load parts of one line on one level, as its envelope takes them. */
export function lineParts(
  p: PreparedBeam,
  shape: LoadPart,
  lv: LevelLoads,
  lineId: string,
): { dead: [LoadPart, number][]; live: [LoadPart, number][] } {
  return {
    dead: [
      [shape, lv.slabDeadKPa],
      [loadPart(p, lv.extraDead.get(lineId) ?? []), 1],
    ],
    live: [[shape, lv.liveKPa]],
  };
}

function analyseValid(scheme: Scheme, memo: EngineMemo | undefined): SchemeResult {
  const setup = schemeLines(scheme);
  if (Array.isArray(setup)) return emptyResult(scheme, setup);
  const {
    b,
    family,
    defaults,
    limits,
    combos,
    gamma,
    fck,
    fy,
    layout,
    slabPanels,
    slabT,
    cover,
    lineDepth,
    secDepth,
    secWidth,
    prepared,
    kinds,
    levels,
    shapes,
    shapePart,
  } = setup;

  const checks = new CheckList();
  const { beamLines, colR, designMoment } = analyseLevels(
    layout,
    kinds,
    levels,
    prepared,
    shapes,
    shapePart,
    lineDepth,
    combos,
    checks,
    memo,
  );

  // beam sizes
  const beams: BeamSize[] = [];
  for (const l of layout.lines) {
    for (const m of l.members) {
      const M = designMoment.get(m.id) ?? 0;
      const d = beamDepth(family, m.kind, m.lengthM, l.widthMm, M, fck, fy, cover, { alphaCc: b.alphaCc });
      beams.push({
        memberId: m.id,
        lineId: l.id,
        spanM: m.lengthM,
        condition: m.kind,
        widthMm: l.widthMm,
        fromSpanDepthMm: d.fromSpanDepthMm,
        spanDepthSource: d.spanDepthSource,
        spanDepthKind: d.spanDepthKind,
        designMomentKNm: M,
        fromMomentMm: d.fromMomentMm,
        momentSource: d.momentSource,
        momentKind: d.momentKind,
        governs: d.governs,
        adoptedDepthMm: d.adoptedDepthMm,
        providedDepthMm: l.specifiedDepthMm,
      });
    }
  }

  // column loads storey by storey, and by tributary area as a cross-check
  const { columnRows, colSizes, footingRows, sites, uplift } = columnPhase(
    scheme,
    layout,
    levels,
    colR,
    lineDepth,
    slabT,
    gamma,
    combos,
    limits,
  );

  // overall load factor, to quote strap moments factored as well as at service
  let sumFactored = 0;
  let sumService = 0;
  for (const f of footingRows) {
    sumFactored += f.factoredKN;
    sumService += f.serviceKN;
  }
  const ratio = sumService > 0 ? sumFactored / sumService : 1.5;
  const boundary = boundaryOptions(
    scheme.boundary,
    layout,
    sites,
    b.bearingPressureKPa,
    limits.footingAllowance.value,
    ratio,
  );
  const combined = overlappingFootings(
    sites,
    limits.footingMinGapM.value,
    b.bearingPressureKPa,
    limits.footingAllowance.value,
  );

  // checks
  for (const u of uplift)
    checks.push({
      ruleId: RULES.columnUplift,
      severity: 'error',
      status: 'fail',
      elements: [u.columnId],
      message: `column ${u.columnId} is pulled up by ${(-u.serviceKN).toFixed(1)} kN (service) in the lowest storey; its footing must hold it down`,
      value: u.serviceKN,
      limit: 0,
      unit: 'kN',
      sense: 'min',
      source: 'statics',
      sourceKind: 'derived',
    });
  for (const list of [
    spanChecks(layout, limits),
    columnSpacingChecks(scheme, layout, limits),
    columnWallChecks(scheme, layout),
    pointLoadChecks(layout, limits),
    stairChecks(scheme, limits),
  ]) {
    for (const c of list) checks.push(c);
  }
  sizeChecks(
    checks,
    limits,
    b.storeyHeightM,
    b.slabThicknessMm ?? null,
    slabPanels,
    beams,
    colSizes,
    boundary,
    combined,
    { family, fck, fy, alphaCc: b.alphaCc },
    propertyLineClearances(scheme.boundary, sites),
  );

  // quantities
  const { quantities, summary } = schemeQuantities(
    scheme,
    layout,
    slabT,
    beams,
    colSizes,
    footingRows,
    secDepth,
    secWidth,
    limits,
  );
  const cost = costOf(quantities, b.rates);

  const split = checks.result();
  return {
    caution: CAUTION,
    ok: true,
    problems: [],
    schemeId: scheme.id,
    schemeName: scheme.name,
    codeFamily: family,
    codeTitle: defaults.title,
    limits,
    combinations: combos,
    checks: split.failed,
    passed: split.passed,
    loads: {
      slabThicknessMm: slabT,
      levels: kinds.map((k) => {
        const lv = levels.get(k.kind) as LevelLoads;
        return {
          kind: k.kind,
          count: k.count,
          slabDeadKPa: lv.slabDeadKPa,
          liveKPa: lv.liveKPa,
          panels: lv.panels,
          secondaries: lv.secondaries,
        };
      }),
      columns: columnRows,
    },
    beamLines,
    sizes: {
      slab: { adoptedMm: slabT, providedMm: b.slabThicknessMm ?? null, panels: slabPanels },
      beams,
      columns: colSizes,
      footings: footingRows,
    },
    footings: { boundary, combined },
    quantities,
    cost,
    summary,
  };
}

/**
 * Everything one line's envelope on one level is computed from, for EngineMemo: in words, the
 * combinations, its spans (ids, kinds) and supports; in numbers, its span lengths and stiffness,
 * the slab's load shape on it, its other dead loads, and the level's slab and imposed loads.
 * Equal keys, equal envelopes.
 */
function envelopeKey(
  l: BeamLine,
  p: PreparedBeam,
  shapes: SlabShapes,
  lv: LevelLoads,
  combosWords: string,
): { words: string; nums: Float64Array } {
  let words = combosWords;
  for (const m of l.members) words += `|${m.id} ${m.kind}`;
  words += `|${p.model.supports.join(' ')}`;
  const shape = shapes.lines.get(l.id) ?? [];
  const extra = lv.extraDead.get(l.id) ?? [];
  const nums: number[] = [lv.slabDeadKPa, lv.liveKPa];
  for (const m of p.model.members) nums.push(m.lengthM, m.eiKNm2);
  for (const loads of [shape, extra]) {
    nums.push(loads.length);
    for (const q of loads)
      if (q.kind === 'point') nums.push(0, q.member, q.atM, q.forceKN);
      else nums.push(1, q.member, q.fromM, q.toM, q.startKNPerM, q.endKNPerM);
  }
  return { words, nums: Float64Array.from(nums) };
}

type ColumnReactions = Map<string, Record<LevelKind, [number, number]>>;

/** Envelope of every beam line on every distinct level; column reactions per level kind (kN). */
function analyseLevels(
  layout: Layout,
  kinds: { kind: LevelKind; count: number }[],
  levels: Map<LevelKind, LevelLoads>,
  prepared: Map<string, PreparedBeam>,
  shapes: SlabShapes,
  shapePart: (lineId: string) => LoadPart | undefined,
  lineDepth: Map<string, number>,
  combos: Combination[],
  checks: CheckList,
  memo: EngineMemo | undefined,
): { beamLines: BeamLineResult[]; colR: ColumnReactions; designMoment: Map<string, number> } {
  const arrangementCache: ArrangementCache = new Map();
  const combosWords = memo ? JSON.stringify(combos) : '';
  const beamLines: BeamLineResult[] = [];
  // column reactions per level kind: dead, live
  const colR: ColumnReactions = new Map();
  const addR = (id: string, kind: LevelKind, d: number, lv: number) => {
    let e = colR.get(id);
    if (!e) {
      e = { floor: [0, 0], roof: [0, 0] };
      colR.set(id, e);
    }
    e[kind][0] += d;
    e[kind][1] += lv;
  };
  const designMoment = new Map<string, number>();
  // largest moment magnitude per member of each line over the level kinds, by member index
  const lineMoment = new Map<string, Float64Array>();
  for (const k of kinds) {
    const lv = levels.get(k.kind) as LevelLoads;
    for (const l of layout.lines) {
      const p = prepared.get(l.id) as PreparedBeam;
      if (!p.ok) {
        checks.push({
          ruleId: 'beam.unstable',
          severity: 'error',
          status: 'fail',
          elements: [l.id],
          message: `beam line ${l.label} is not held up by its columns`,
          value: 0,
          limit: 1,
          unit: '',
          sense: 'min',
          source: 'statics',
          sourceKind: 'derived',
        });
        continue;
      }
      const compute = () => {
        const parts = lineParts(p, shapePart(l.id) as LoadPart, lv, l.id);
        return envelopeParts(p, parts.dead, parts.live, combos, arrangementCache, l.members);
      };
      let env: BeamEnvelope;
      if (memo) {
        const key = envelopeKey(l, p, shapes, lv, combosWords);
        env = memo.envelope(key.words, key.nums, compute);
      } else env = compute();
      l.nodes.forEach((n, i) => {
        if (n.columnId) addR(n.columnId, k.kind, env.deadReactionsKN[i], env.liveReactionsKN[i]);
      });
      let lm = lineMoment.get(l.id);
      if (!lm) {
        lm = new Float64Array(l.members.length);
        lineMoment.set(l.id, lm);
      }
      for (let i = 0; i < env.members.length; i++) {
        const e = env.members[i];
        lm[i] = Math.max(lm[i], Math.abs(e.maxMomentKNm), Math.abs(e.minMomentKNm));
      }
      beamLines.push({
        lineId: l.id,
        gridLineId: l.gridLineId,
        label: l.label,
        level: k.kind,
        widthMm: l.widthMm,
        depthForSelfWeightMm: lineDepth.get(l.id) as number,
        // envelopeParts named each member from l.members
        members: env.members as BeamLineResult['members'],
        reactions: l.nodes.map((n, i) => ({
          s: n.s,
          columnId: n.columnId,
          deadKN: env.deadReactionsKN[i],
          liveKN: env.liveReactionsKN[i],
          maxFactoredKN: env.maxFactoredReactionsKN[i],
        })),
        patternsTried: env.patternsTried,
      });
    }
  }

  for (const l of layout.lines) {
    const lm = lineMoment.get(l.id);
    // (two lines may share a span id: keep the larger, as one map over all lines would)
    if (lm) l.members.forEach((m, i) => designMoment.set(m.id, Math.max(designMoment.get(m.id) ?? 0, lm[i])));
  }
  return { beamLines, colR, designMoment };
}

/** Checks on the sizes the engine derived: slab, beam depth and headroom, column steel and capacity, footings. */
function sizeChecks(
  checks: CheckList,
  limits: Limits,
  storeyHeightM: number,
  givenSlabMm: number | null,
  slabPanels: SlabSize[],
  beams: BeamSize[],
  colSizes: ColumnSizes[],
  boundary: BoundaryOptions[],
  combined: OverlapCombined[],
  mat: { family: CodeFamily; fck: number; fy: number; alphaCc?: number },
  clearances: LineClearance[],
): void {
  // a derived slab meets its own requirement by construction: only a given thickness is checked
  if (givenSlabMm !== null) {
    for (const p of slabPanels) {
      const lim = { value: p.requiredMm, unit: 'mm', source: p.source, kind: p.kind };
      checks.push(
        check(
          RULES.slabThickness,
          'error',
          [p.panelId],
          () =>
            `slab ${p.panelId} (${p.spanning}, ${p.lxM.toFixed(2)} × ${p.lyM.toFixed(2)} m): ${givenSlabMm} mm against ${p.requiredMm} mm needed`,
          givenSlabMm,
          lim,
          'min',
        ),
      );
    }
  }
  const headroom = limits.headroomUnderBeamMinM;
  for (const bs of beams) {
    const depth = bs.providedDepthMm ?? bs.adoptedDepthMm;
    if (bs.providedDepthMm !== null) {
      const moment = bs.governs === 'moment';
      const lim = {
        value: bs.adoptedDepthMm,
        unit: 'mm',
        source: moment ? bs.momentSource : bs.spanDepthSource,
        kind: moment ? bs.momentKind : bs.spanDepthKind,
      };
      checks.push(
        check(
          RULES.beamDepth,
          'error',
          [bs.memberId],
          () =>
            `${bs.memberId}: ${bs.providedDepthMm} mm deep against ${bs.adoptedDepthMm} mm needed (${bs.governs} governs)`,
          bs.providedDepthMm,
          lim,
          'min',
        ),
      );
    }
    const clear = storeyHeightM - depth / 1000;
    checks.push(
      check(
        RULES.beamHeadroom,
        'warning',
        [bs.memberId],
        () => `${bs.memberId}: ${clear.toFixed(2)} m clear under a ${depth} mm beam`,
        clear,
        headroom,
        'min',
      ),
    );
  }
  // the steel the given section needs for the lowest storey's load, against the code's maximum
  const maxRatio = limits.columnSteelRatioMax;
  for (const cs of colSizes) {
    const pu = cs.utilisation[0] * cs.providedCapacityKN;
    const need = cs.steelRatio[0];
    const shown =
      need > maxRatio.value ? `more than ${(maxRatio.value * 100).toFixed(1)} %` : `${(need * 100).toFixed(2)} %`;
    const floor =
      need < limits.columnSteelRatioMin.value
        ? ` (the minimum ${(limits.columnSteelRatioMin.value * 100).toFixed(1)} % governs)`
        : '';
    checks.push(
      check(
        RULES.columnSteel,
        'error',
        [cs.columnId],
        () =>
          `column ${cs.columnId} (${cs.providedMm[0]} × ${cs.providedMm[1]} mm) needs ${shown} steel for ${pu.toFixed(0)} kN in the lowest storey${floor}`,
        need,
        maxRatio,
        'max',
      ),
    );
  }
  for (const cs of colSizes) {
    const pu = cs.utilisation[0] * cs.providedCapacityKN;
    // IS 456 cl. 39.3 and ACI §22.4.2 are formulas of the code; the EN value is worked from its clauses
    const lim = {
      value: cs.providedCapacityKN,
      unit: 'kN',
      source: cs.source,
      kind: mat.family === 'EN1992' ? ('derived' as const) : ('code' as const),
    };
    checks.push(
      check(
        RULES.columnCapacity,
        'error',
        [cs.columnId],
        () =>
          `column ${cs.columnId} (${cs.providedMm[0]} × ${cs.providedMm[1]} mm) carries ${pu.toFixed(0)} kN in the lowest storey against ${cs.providedCapacityKN.toFixed(0)} kN; ${cs.requiredSideMm[0]} mm square would do`,
        pu,
        lim,
        'max',
      ),
    );
  }
  // every column near a property line: how far its isolated pad reaches toward the line against
  // the distance to the line (passes when the pad stays inside the plot)
  const options = new Map(boundary.map((x) => [`${x.columnId}\u0000${x.propertyLine}`, x]));
  for (const c of clearances) {
    const lim = {
      value: c.distanceToLineM,
      unit: 'm',
      source: `distance to property line ${c.propertyLine} (scheme)`,
      kind: 'project' as const,
    };
    const o = options.get(`${c.columnId}\u0000${c.propertyLine}`);
    checks.push(
      check(
        RULES.footingLine,
        'warning',
        [c.columnId],
        () =>
          o
            ? `the isolated footing of ${c.columnId} would cross property line ${c.propertyLine} by ${o.crossingM.toFixed(2)} m; see the footing options`
            : `the isolated footing of ${c.columnId} reaches ${c.reachM.toFixed(2)} m toward property line ${c.propertyLine}, ${c.distanceToLineM.toFixed(2)} m away`,
        c.reachM,
        lim,
        'max',
      ),
    );
  }
  for (const o of combined) {
    checks.push(
      check(
        RULES.footingOverlap,
        'warning',
        [...o.columnIds],
        () =>
          `the footings of ${o.columnIds.join(' and ')} ${o.gapM < 0 ? 'overlap' : 'leave ' + o.gapM.toFixed(2) + ' m'}; a combined footing ${o.lengthM.toFixed(1)} × ${o.adoptedWidthM.toFixed(1)} m serves both`,
        o.gapM,
        limits.footingMinGapM,
        'min',
      ),
    );
  }
}

/**
 * Steel ratio (fraction of the gross area) a column section (mm) needs for an axial load (kN),
 * by bisection on the family's capacity formula; above `cap` returns a value just over cap.
 */
function requiredSteelRatio(
  mat: { family: CodeFamily; fck: number; fy: number; alphaCc?: number },
  sec: [number, number],
  loadKN: number,
  cap: number,
): number {
  const cap2 = Math.min(0.1, cap * 1.5);
  const capacity = (r: number) =>
    columnCapacityKN(mat.family, sec[0], sec[1], mat.fck, mat.fy, r, { alphaCc: mat.alphaCc }).value;
  if (mat.family !== 'EN1992') {
    // IS 456 cl. 39.3 and ACI §22.4.2 are linear in the steel area: solve directly
    const c0 = capacity(0);
    const c1 = capacity(1e-3);
    const r = c1 > c0 ? ((loadKN - c0) / (c1 - c0)) * 1e-3 : cap2;
    return Math.min(cap2, Math.max(0, r));
  }
  if (capacity(0) >= loadKN) return 0;
  if (capacity(cap2) < loadKN) return cap2;
  let lo = 0,
    hi = cap2;
  for (let it = 0; it < 40; it++) {
    const mid = (lo + hi) / 2;
    if (capacity(mid) >= loadKN) hi = mid;
    else lo = mid;
  }
  return hi;
}

/** Quantities by member type (m³, kg, m²) and the summary figures the comparison uses. */
function schemeQuantities(
  scheme: Scheme,
  layout: Layout,
  slabT: number,
  beams: BeamSize[],
  colSizes: ColumnSizes[],
  footingRows: SchemeResult['sizes']['footings'],
  secDepth: Map<string, number>,
  secWidth: Map<string, number>,
  limits: Limits,
): { quantities: Quantities; summary: SchemeResult['summary'] } {
  const b = scheme.basis;
  const N = b.storeys;
  const tally = new QuantityTally();
  const t = slabT / 1000;
  const panelArea = layout.panels.reduce((a, p) => a + (p.x2 - p.x1) * (p.y2 - p.y1), 0);
  tally.add('slabs', panelArea * t * N, panelArea * N);
  const depthOf = new Map(beams.map((x) => [x.memberId, (x.providedDepthMm ?? x.adoptedDepthMm) / 1000]));
  let beamLength = 0;
  let longest = 0;
  let deepest = 0;
  let spans = 0;
  for (const l of layout.lines) {
    for (const m of l.members) {
      const D = depthOf.get(m.id) as number;
      const web = Math.max(D - t, 0);
      tally.add('beams', (l.widthMm / 1000) * web * m.lengthM * N, (l.widthMm / 1000 + 2 * web) * m.lengthM * N);
      beamLength += m.lengthM;
      longest = Math.max(longest, m.lengthM);
      deepest = Math.max(deepest, D * 1000);
      spans++;
    }
  }
  for (const s of layout.secondaries) {
    const D = (secDepth.get(s.beam.id) as number) / 1000;
    const B = (secWidth.get(s.beam.id) as number) / 1000;
    tally.add('beams', B * Math.max(D - t, 0) * s.lengthM * N, (B + 2 * Math.max(D - t, 0)) * s.lengthM * N);
    beamLength += s.lengthM;
  }
  for (const cs of colSizes) {
    for (let k = 0; k < cs.utilisation.length; k++) {
      const ok = cs.utilisation[k] <= 1;
      const w = (ok ? cs.providedMm[0] : cs.requiredSideMm[k]) / 1000;
      const d = (ok ? cs.providedMm[1] : cs.requiredSideMm[k]) / 1000;
      tally.add('columns', w * d * b.storeyHeightM, 2 * (w + d) * b.storeyHeightM);
    }
  }
  for (const f of footingRows)
    tally.add('footings', f.adoptedSideM ** 2 * f.thicknessM, 4 * f.adoptedSideM * f.thicknessM);
  for (const f of scheme.stairs) {
    const R = f.riserMm / 1000,
      T = f.treadMm / 1000;
    const incl = f.risers * Math.sqrt(R * R + T * T);
    tally.add(
      'stairs',
      f.widthM * (incl * 0.15 + (f.risers * R * T) / 2) * N,
      f.widthM * incl * N + f.risers * R * f.widthM * N,
    );
  }
  const quantities = tally.finish(limits, [
    'Reinforcement from typical kg/m³ ratios per member type (common practice), not a bar schedule.',
    'Beam lengths are centre-line lengths; beam concrete below the slab only; stairs with a 150 mm waist (common practice).',
    'Footings are priced as isolated pads; the boundary and combined options are listed for choice.',
  ]);
  return {
    quantities,
    summary: {
      columns: scheme.columns.length,
      beamSpans: spans,
      beamLengthM: beamLength,
      longestSpanM: longest,
      deepestBeamMm: deepest,
    },
  };
}

/** Column loads per storey (kN), column sections, isolated footings, and the footing sites. */
function columnPhase(
  scheme: Scheme,
  layout: Layout,
  levels: Map<LevelKind, LevelLoads>,
  colR: ColumnReactions,
  lineDepth: Map<string, number>,
  slabT: number,
  gamma: number,
  combos: Combination[],
  limits: Limits,
): {
  columnRows: ColumnLoads[];
  colSizes: ColumnSizes[];
  footingRows: SchemeResult['sizes']['footings'];
  sites: FootingSite[];
  uplift: { columnId: string; serviceKN: number }[];
} {
  const b = scheme.basis;
  const N = b.storeys;
  const family = b.codeFamily;
  const fck = b.concreteMPa;
  const fy = b.steelMPa;
  const trib = tributaries(layout);
  const factored = (d: number, lv: number) => {
    let m = 0;
    for (const c of combos) m = Math.max(m, c.dead * d + c.live * lv);
    return m;
  };
  const columnRows: ColumnLoads[] = [];
  const colSizes: ColumnSizes[] = [];
  const footingRows: SchemeResult['sizes']['footings'] = [];
  const sites: FootingSite[] = [];
  const uplift: { columnId: string; serviceKN: number }[] = [];
  const steel = limits.columnSteelRatio.value;
  const floorLv = levels.get('floor');
  const roofLv = levels.get('roof') as LevelLoads;
  // beam self-weight and wall per metre of each line, per level kind, for the tributary cross-check
  const lineLineLoad = new Map<string, [number, number]>();
  for (const l of layout.lines) {
    const beamSw = (l.widthMm / 1000) * Math.max(((lineDepth.get(l.id) as number) - slabT) / 1000, 0) * gamma;
    lineLineLoad.set(l.id, [beamSw + (l.wallThicknessMm > 0 ? b.wallLoadKNPerM : 0), beamSw]);
  }
  const noLoad: [number, number] = [0, 0];
  const zeroR = { floor: noLoad, roof: noLoad };
  const minSide = limits.columnMinSideMm.value;
  const mat = { family, fck, fy, alphaCc: b.alphaCc };
  const maxSteel = limits.columnSteelRatioMax.value;
  for (const c of scheme.columns) {
    const r = colR.get(c.id) ?? zeroR;
    const sw = (c.widthMm / 1000) * (c.depthMm / 1000) * b.storeyHeightM * gamma;
    const t = trib.get(c.id);
    let tribFloor = 0;
    let tribRoof = 0;
    if (t) {
      if (floorLv) tribFloor = t.area * (floorLv.slabDeadKPa + floorLv.liveKPa);
      tribRoof = t.area * (roofLv.slabDeadKPa + roofLv.liveKPa);
      for (const seg of t.lengths) {
        const w = lineLineLoad.get(seg.lineId) as [number, number];
        tribFloor += seg.lengthM * w[0];
        tribRoof += seg.lengthM * w[1];
      }
      if (!floorLv) tribFloor = 0;
    }
    const provided: [number, number] = [c.widthMm, c.depthMm];
    const row: ColumnLoads = { columnId: c.id, deadKN: [], liveKN: [], factoredKN: [], tributaryKN: [] };
    const sizes: ColumnSizes = {
      columnId: c.id,
      providedMm: provided,
      providedCapacityKN: 0,
      source: '',
      requiredAreaMm2: [],
      requiredSideMm: [],
      utilisation: [],
      steelRatio: [],
    };
    const sizeFor = columnSizer(family, fck, fy, steel, minSide, provided, { alphaCc: b.alphaCc });
    for (let s = 1; s <= N; s++) {
      const floorsAbove = N - s; // floor levels s..N-1
      const dead = floorsAbove * r.floor[0] + r.roof[0] + (N - s + 1) * sw;
      const live = floorsAbove * r.floor[1] + r.roof[1];
      const pu = factored(dead, live);
      row.deadKN.push(dead);
      row.liveKN.push(live);
      row.factoredKN.push(pu);
      row.tributaryKN.push(floorsAbove * tribFloor + tribRoof + (N - s + 1) * sw);
      const size = sizeFor(pu);
      sizes.providedCapacityKN = size.providedCapacityKN;
      sizes.source = size.source;
      sizes.requiredAreaMm2.push(size.requiredAreaMm2);
      sizes.requiredSideMm.push(size.requiredSideMm);
      sizes.utilisation.push(size.utilisation);
      sizes.steelRatio.push(requiredSteelRatio(mat, provided, pu, maxSteel));
    }
    columnRows.push(row);
    colSizes.push(sizes);
    const base = { deadKN: row.deadKN[0], liveKN: row.liveKN[0], factoredKN: row.factoredKN[0] };
    const service = base.deadKN + base.liveKN;
    // a column in net tension (uplift, e.g. beside a short end span) needs a footing that holds it
    // down; the pad is sized for compression only and the uplift is reported by a check
    if (service < 0) uplift.push({ columnId: c.id, serviceKN: service });
    const f = isolatedFooting(
      Math.max(service, 0),
      b.bearingPressureKPa,
      limits.footingAllowance.value,
      Math.max(base.factoredKN, 0),
    );
    footingRows.push({
      columnId: c.id,
      serviceKN: service,
      factoredKN: base.factoredKN,
      areaM2: f.areaM2,
      sideM: f.sideM,
      adoptedSideM: f.adoptedSideM,
      factoredPressureKPa: f.factoredPressureKPa,
      thicknessM: f.thicknessM,
    });
    const plan = columnPlan(c);
    sites.push({ columnId: c.id, x: c.x, y: c.y, bx: plan.bx, by: plan.by, serviceKN: service, sideM: f.adoptedSideM });
  }
  return { columnRows, colSizes, footingRows, sites, uplift };
}
