// Preliminary member sizes: slab thickness from span/depth, beam depth from span/depth and from
// moment capacity (the larger governs), column sections per storey from axial load.
import { beamDepthRule, columnCapacityKN, limitingMomentKNm, slabDepthRule, SourceKind, SupportCondition } from './codes';
import { roundUp } from './footings';
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
  const out = new Map<Panel, { x: number; y: number }>();
  for (const p of all) {
    let x = 0, y = 0;
    for (const xv of [p.x1, p.x2]) if ((vert.get(key(xv)) ?? []).some((q) => q !== p && overlaps(p.y1, p.y2, q.y1, q.y2) && (q.x2 <= p.x1 + 1e-6 || q.x1 >= p.x2 - 1e-6))) x++;
    for (const yv of [p.y1, p.y2]) if ((horiz.get(key(yv)) ?? []).some((q) => q !== p && overlaps(p.x1, p.x2, q.x1, q.x2) && (q.y2 <= p.y1 + 1e-6 || q.y1 >= p.y2 - 1e-6))) y++;
    out.set(p, { x, y });
  }
  return out;
}

/**
 * Required slab thickness (mm) per panel; one-way when long/short ≥ oneWayAspect. Spans m, fy MPa.
 */
export function slabSizes(family: CodeFamily, layout: Layout, fy: number, oneWayAspect: number, coverMm: number, minMm: number): SlabSize[] {
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
  /** design moment (largest magnitude of the envelope), kN·m, and the overall depth it needs, mm */
  designMomentKNm: number;
  fromMomentMm: number;
  momentSource: string;
  governs: 'span/depth' | 'moment';
  /** adopted overall depth, rounded up to 25 mm */
  adoptedDepthMm: number;
  /** depth given in the scheme, if any */
  providedDepthMm: number | null;
}

/** Overall beam depth (mm) for a span (m), width (mm), design moment (kN·m), strengths (MPa). */
export function beamDepth(
  family: CodeFamily,
  condition: SupportCondition,
  spanM: number,
  widthMm: number,
  designMomentKNm: number,
  fck: number,
  fy: number,
  coverMm: number,
): Pick<BeamSize, 'fromSpanDepthMm' | 'spanDepthSource' | 'fromMomentMm' | 'momentSource' | 'governs' | 'adoptedDepthMm'> {
  const rule = beamDepthRule(family, condition, spanM, fy);
  const fromSpan = rule.measure === 'overall' ? rule.requiredMm : rule.requiredMm + coverMm;
  const unit = limitingMomentKNm(family, widthMm, 1, fck, fy); // kN·m per mm² of d²
  const d = Math.sqrt(Math.abs(designMomentKNm) / unit.value);
  const fromMoment = d + coverMm;
  const governs = fromMoment > fromSpan ? 'moment' : 'span/depth';
  return {
    fromSpanDepthMm: fromSpan,
    spanDepthSource: rule.source,
    fromMomentMm: fromMoment,
    momentSource: unit.source,
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

/**
 * Column section for a factored axial load (kN), strengths MPa, steel ratio of the gross area,
 * minimum side and given section in mm: area (mm²) and square side (mm) needed, the given
 * section's capacity (kN) and its utilisation.
 */
export function columnSize(family: CodeFamily, factoredKN: number, fck: number, fy: number, steelRatio: number, minSideMm: number, providedMm: [number, number]): ColumnStoreySize {
  const perMm2 = columnCapacityKN(family, 1, 1, fck, fy, steelRatio);
  const key = `${family}${steelRatio}`;
  let source = sourceCache.get(key);
  if (source === undefined) {
    source = `${perMm2.source}, steel ${(steelRatio * 100).toFixed(1)} % of gross area assumed`;
    sourceCache.set(key, source);
  }
  const requiredAreaMm2 = factoredKN / perMm2.value;
  const side = Math.max(roundUp(Math.sqrt(requiredAreaMm2), 25), minSideMm);
  const provided = columnCapacityKN(family, providedMm[0], providedMm[1], fck, fy, steelRatio).value;
  return {
    storey: 0,
    factoredKN,
    requiredAreaMm2,
    requiredSideMm: side,
    providedCapacityKN: provided,
    utilisation: factoredKN / provided,
    source,
  };
}
