// Preliminary member sizes: slab thickness from span/depth, beam depth from span/depth and from
// moment capacity (the larger governs), column sections per storey from axial load.
import {
  beamDepthRule,
  columnCapacityKN,
  limitingMomentKNm,
  slabDepthRule,
  SourceKind,
  SupportCondition,
} from './codes';
import { roundUp } from './footings';
import { StructuralInputError } from './errors';
import type { Layout, Panel } from './layout';
import type { CodeFamily } from './model';

export interface SlabSize {
  panelId: string;
  spanning: 'one-way' | 'two-way';
  condition: SupportCondition;
  lxM: number;
  lyM: number;
  requiredMm: number;
  source: string;
  kind: SourceKind;
}

/** Counts neighbouring panels across x and across y for each panel (edges that share a length). */
function neighbourCounts(all: Panel[]): Map<Panel, { x: number; y: number }> {
  // panel edges grouped by the coordinate of the line they lie on
  const vert = new Map<number, Panel[]>();
  const horiz = new Map<number, Panel[]>();
  const key = (v: number) => Math.round(v * 1000);
  const push = (m: Map<number, Panel[]>, k: number, p: Panel) => {
    const l = m.get(k);
    if (l) l.push(p);
    else m.set(k, [p]);
  };
  for (const p of all) {
    push(vert, key(p.x1), p);
    push(vert, key(p.x2), p);
    push(horiz, key(p.y1), p);
    push(horiz, key(p.y2), p);
  }
  const overlaps = (a1: number, a2: number, b1: number, b2: number) => Math.min(a2, b2) - Math.max(a1, b1) > 1e-6;
  // a neighbour across the line at v: on that line, beside p along it, and on the other side of p
  const acrossX = (p: Panel, v: number) => {
    const list = vert.get(key(v));
    if (list)
      for (const q of list)
        if (q !== p && overlaps(p.y1, p.y2, q.y1, q.y2) && (q.x2 <= p.x1 + 1e-6 || q.x1 >= p.x2 - 1e-6)) return 1;
    return 0;
  };
  const acrossY = (p: Panel, v: number) => {
    const list = horiz.get(key(v));
    if (list)
      for (const q of list)
        if (q !== p && overlaps(p.x1, p.x2, q.x1, q.x2) && (q.y2 <= p.y1 + 1e-6 || q.y1 >= p.y2 - 1e-6)) return 1;
    return 0;
  };
  const out = new Map<Panel, { x: number; y: number }>();
  for (const p of all) out.set(p, { x: acrossX(p, p.x1) + acrossX(p, p.x2), y: acrossY(p, p.y1) + acrossY(p, p.y2) });
  return out;
}

/**
 * Required slab thickness (mm) per panel; one-way when long/short > oneWayAspect (the textbook
 * rule "one-way when the long span exceeds twice the short one", reference-values §2). Spans m, fy MPa.
 */
export function slabSizes(
  family: CodeFamily,
  layout: Layout,
  fy: number,
  oneWayAspect: number,
  coverMm: number,
  minMm: number,
): SlabSize[] {
  const counts = neighbourCounts(layout.panels);
  return layout.panels.map((p) => {
    const oneWay = p.ly / p.lx > oneWayAspect;
    const n = counts.get(p) as { x: number; y: number };
    // continuity across the short span: neighbours in the direction the short span runs
    const shortAlongX = p.x2 - p.x1 <= p.y2 - p.y1;
    const k = shortAlongX ? n.x : n.y;
    const condition: SupportCondition = k === 0 ? 'simple' : k === 1 ? 'endSpan' : 'interior';
    const rule = slabDepthRule(family, oneWay, condition, p.lx, p.ly, fy, coverMm);
    return {
      panelId: p.id,
      spanning: oneWay ? 'one-way' : 'two-way',
      condition,
      lxM: p.lx,
      lyM: p.ly,
      requiredMm: Math.max(roundUp(rule.requiredMm, 5), minMm),
      source: rule.source + (rule.requiredMm < minMm ? `; minimum ${minMm} mm (common practice)` : ''),
      kind: rule.kind,
    };
  });
}

export interface BeamSize {
  memberId: string;
  lineId: string;
  spanM: number;
  condition: SupportCondition;
  widthMm: number;
  /** overall depth from span/depth, mm */
  fromSpanDepthMm: number;
  spanDepthSource: string;
  spanDepthKind: SourceKind;
  /** design moment (largest magnitude of the envelope), kN·m, and the overall depth it needs, mm */
  designMomentKNm: number;
  fromMomentMm: number;
  momentSource: string;
  momentKind: SourceKind;
  governs: 'span/depth' | 'moment';
  /** adopted overall depth, rounded up to 25 mm */
  adoptedDepthMm: number;
  /** depth given in the scheme, if any */
  providedDepthMm: number | null;
}

/**
 * Overall beam depth (mm) for a span (m), width (mm), design moment (kN·m), strengths (MPa), with
 * the source and source kind of each rule. Throws StructuralInputError outside the accepted ranges.
 */
export function beamDepth(
  family: CodeFamily,
  condition: SupportCondition,
  spanM: number,
  widthMm: number,
  designMomentKNm: number,
  fck: number,
  fy: number,
  coverMm: number,
  opts?: { alphaCc?: number },
): Pick<
  BeamSize,
  | 'fromSpanDepthMm'
  | 'spanDepthSource'
  | 'spanDepthKind'
  | 'fromMomentMm'
  | 'momentSource'
  | 'momentKind'
  | 'governs'
  | 'adoptedDepthMm'
> {
  if (!(Number.isFinite(designMomentKNm) && Math.abs(designMomentKNm) <= 1e5))
    throw new StructuralInputError([
      {
        path: 'designMomentKNm',
        field: 'designMomentKNm',
        message: 'must be a number of kN·m up to 100 000 in magnitude',
      },
    ]);
  if (!(Number.isFinite(coverMm) && coverMm >= 0 && coverMm <= 200))
    throw new StructuralInputError([
      { path: 'coverMm', field: 'coverMm', message: 'must be a number of mm from 0 to 200' },
    ]);
  const rule = beamDepthRule(family, condition, spanM, fy);
  const fromSpan = rule.measure === 'overall' ? rule.requiredMm : rule.requiredMm + coverMm;
  const unit = limitingMomentKNm(family, widthMm, 1, fck, fy, opts); // kN·m per mm² of d²
  const d = Math.sqrt(Math.abs(designMomentKNm) / unit.value);
  const fromMoment = d + coverMm;
  const governs = fromMoment > fromSpan ? 'moment' : 'span/depth';
  return {
    fromSpanDepthMm: fromSpan,
    spanDepthSource: rule.source,
    spanDepthKind: rule.kind,
    fromMomentMm: fromMoment,
    momentSource: unit.source,
    momentKind: unit.kind,
    governs,
    adoptedDepthMm: roundUp(Math.max(fromSpan, fromMoment), 25),
  };
}

export interface ColumnStoreySize {
  storey: number;
  factoredKN: number;
  /** gross area needed at the assumed steel ratio, mm² */
  requiredAreaMm2: number;
  /** square side needed, rounded up to 25 mm and at least the minimum side, mm */
  requiredSideMm: number;
  /** capacity of the section given in the scheme, kN, and load/capacity */
  providedCapacityKN: number;
  utilisation: number;
  source: string;
}

const sourceCache = new Map<string, string>();
// capacity of square sections 25 mm apart, per family and material set (EN capacity is not
// proportional to area: the minimum eccentricity depends on the side)
const squareTables = new Map<string, Float64Array>();
const SIDE_STEP = 25;
const SIDE_MAX = 3000;

/**
 * Column section for a factored axial load (kN), strengths MPa, steel ratio of the gross area,
 * minimum side and given section in mm: area (mm²) and square side (mm) needed, the given
 * section's capacity (kN) and its utilisation. Throws StructuralInputError outside the accepted ranges.
 */
export function columnSize(
  family: CodeFamily,
  factoredKN: number,
  fck: number,
  fy: number,
  steelRatio: number,
  minSideMm: number,
  providedMm: [number, number],
  opts?: { alphaCc?: number },
): ColumnStoreySize {
  return columnSizer(family, fck, fy, steelRatio, minSideMm, providedMm, opts)(factoredKN);
}

/**
 * columnSize for one column and material set, storey after storey: what does not depend on the
 * load (the given section's capacity, the source text, the capacity per mm²) is worked once.
 * Same units, results and errors as columnSize.
 */
export function columnSizer(
  family: CodeFamily,
  fck: number,
  fy: number,
  steelRatio: number,
  minSideMm: number,
  providedMm: [number, number],
  opts?: { alphaCc?: number },
): (factoredKN: number) => ColumnStoreySize {
  const fixedProblems: { path: string; field: string; message: string }[] = [];
  if (!(Number.isFinite(minSideMm) && minSideMm >= 0 && minSideMm <= SIDE_MAX))
    fixedProblems.push({
      path: 'minSideMm',
      field: 'minSideMm',
      message: `must be a number of mm from 0 to ${SIDE_MAX}`,
    });
  if (!Array.isArray(providedMm) || providedMm.length !== 2)
    fixedProblems.push({ path: 'providedMm', field: 'providedMm', message: 'must be [width, depth] in mm' });
  let fixed: ColumnFixed | null = null;
  return (factoredKN: number): ColumnStoreySize => {
    const loadBad = !(Number.isFinite(factoredKN) && factoredKN >= 0 && factoredKN <= 1e6);
    if (loadBad || fixedProblems.length)
      throw new StructuralInputError([
        ...(loadBad
          ? [{ path: 'factoredKN', field: 'factoredKN', message: 'must be a number of kN from 0 to 1 000 000' }]
          : []),
        ...fixedProblems,
      ]);
    fixed ??= columnFixed(family, fck, fy, steelRatio, providedMm, opts);
    const { key, provided, source, perMm2 } = fixed;
    let requiredAreaMm2: number;
    let side: number;
    if (family !== 'EN1992') {
      requiredAreaMm2 = factoredKN / perMm2;
      side = Math.max(roundUp(Math.sqrt(requiredAreaMm2), SIDE_STEP), minSideMm);
    } else {
      let t = squareTables.get(key);
      if (!t) {
        t = new Float64Array(SIDE_MAX / SIDE_STEP + 1);
        for (let k = 1; k < t.length; k++)
          t[k] = columnCapacityKN(family, k * SIDE_STEP, k * SIDE_STEP, fck, fy, steelRatio, opts).value;
        squareTables.set(key, t);
      }
      let k = 1;
      while (k < t.length - 1 && t[k] < factoredKN) k++;
      // side between the two tabulated squares, by linear interpolation of capacity
      const s0 = (k - 1) * SIDE_STEP,
        c0 = t[k - 1],
        c1 = t[k];
      const exact = c1 > c0 ? s0 + SIDE_STEP * Math.min(1, Math.max(0, (factoredKN - c0) / (c1 - c0))) : k * SIDE_STEP;
      requiredAreaMm2 = exact * exact;
      side = Math.max(k * SIDE_STEP, minSideMm);
    }
    return {
      storey: 0,
      factoredKN,
      requiredAreaMm2,
      requiredSideMm: side,
      providedCapacityKN: provided.value,
      utilisation: factoredKN / provided.value,
      source,
    };
  };
}

interface ColumnFixed {
  key: string;
  provided: { value: number; source: string };
  source: string;
  perMm2: number;
}

/** The load-independent part of columnSize (see columnSizer). */
function columnFixed(
  family: CodeFamily,
  fck: number,
  fy: number,
  steelRatio: number,
  providedMm: [number, number],
  opts?: { alphaCc?: number },
): ColumnFixed {
  const key = `${family}|${fck}|${fy}|${steelRatio}|${opts?.alphaCc ?? ''}`;
  const provided = columnCapacityKN(family, providedMm[0], providedMm[1], fck, fy, steelRatio, opts);
  let source = sourceCache.get(key);
  if (source === undefined) {
    const generic =
      family === 'EN1992'
        ? provided.source.replace(/e0 = max\(h\/30, 20 mm\) = [0-9.]+ mm/, 'e0 = max(h/30, 20 mm)')
        : provided.source;
    source = `${generic}, steel ${(steelRatio * 100).toFixed(1)} % of gross area assumed`;
    sourceCache.set(key, source);
  }
  const perMm2 = family !== 'EN1992' ? columnCapacityKN(family, 1, 1, fck, fy, steelRatio).value : 0;
  return { key, provided, source, perMm2 };
}
