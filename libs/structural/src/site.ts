// Footings against the site: where an isolated footing would cross a property line, the three
// options the trade uses, each sized; where two isolated footings overlap or leave too small a
// gap, a combined footing. Plan coordinates m, loads kN (service), pressures kPa.
import {
  rectangularCombined,
  RectCombined,
  roundUp,
  strapFooting,
  StrapFooting,
  trapezoidalCombined,
  TrapezoidCombined,
} from './footings';
import type { Layout } from './layout';
import type { PlotBoundary, Point } from './model';

export interface FootingSite {
  columnId: string;
  x: number;
  y: number;
  /** column plan dimensions, m */
  bx: number;
  by: number;
  serviceKN: number;
  /** adopted isolated footing side, m */
  sideM: number;
}

export interface BoundaryOptions {
  columnId: string;
  propertyLine: number;
  /** distance from the column centre to the line, m, and how far the isolated pad would cross it */
  distanceToLineM: number;
  crossingM: number;
  interiorColumnId: string | null;
  spacingM: number | null;
  /** option 1: move the column inward along the cross wall until its own pad fits */
  shift: {
    shiftM: number;
    newPosition: Point;
    crossLine: string | null;
    spanBeforeM: number | null;
    spanAfterM: number | null;
  };
  /** option 2: strap to the nearest interior column */
  strap: (StrapFooting & { factoredMomentKNm: number }) | null;
  /** option 3: combined footing with the interior column */
  combinedRectangular: RectCombined | null;
  combinedTrapezoidal: (TrapezoidCombined & { lengthM: number }) | null;
}

export interface OverlapCombined {
  columnIds: [string, string];
  /** clear gap between the two isolated pads, m (negative = overlap) */
  gapM: number;
  spacingM: number;
  lengthM: number;
  widthM: number;
  adoptedWidthM: number;
  /** resultant from the first column, m */
  resultantFromFirstM: number;
}

function inwardNormals(b: PlotBoundary): { a: Point; len: number; t: Point; n: Point }[] {
  const v = b.vertices;
  let area = 0;
  for (let i = 0; i < v.length; i++) {
    const p = v[i],
      q = v[(i + 1) % v.length];
    area += p.x * q.y - q.x * p.y;
  }
  const ccw = area > 0;
  return v.map((p, i) => {
    const q = v[(i + 1) % v.length];
    const dx = q.x - p.x,
      dy = q.y - p.y;
    const len = Math.hypot(dx, dy) || 1;
    const t = { x: dx / len, y: dy / len };
    const n = ccw ? { x: -t.y, y: t.x } : { x: t.y, y: -t.x };
    return { a: p, len, t, n };
  });
}

export interface LineClearance {
  columnId: string;
  propertyLine: number;
  /** distance from the column centre to the line, m, and how far the isolated pad reaches toward it, m */
  distanceToLineM: number;
  reachM: number;
}

/**
 * For every column whose isolated pad faces a property line (its position along the line lies
 * within the segment, give or take half a pad): the distance to the line and the pad's reach
 * toward it, m. The pad crosses the line when the reach exceeds the distance.
 */
export function propertyLineClearances(boundary: PlotBoundary, sites: FootingSite[]): LineClearance[] {
  const segs = inwardNormals(boundary);
  const out: LineClearance[] = [];
  for (const s of sites) {
    for (const k of boundary.propertyLines) {
      const g = segs[k];
      if (!g) continue;
      const rel = { x: s.x - g.a.x, y: s.y - g.a.y };
      const along = rel.x * g.t.x + rel.y * g.t.y;
      if (along < -s.sideM / 2 || along > g.len + s.sideM / 2) continue;
      const d = rel.x * g.n.x + rel.y * g.n.y;
      const reach = (s.sideM / 2) * (Math.abs(g.n.x) + Math.abs(g.n.y));
      out.push({ columnId: s.columnId, propertyLine: k, distanceToLineM: d, reachM: reach });
    }
  }
  return out;
}

/**
 * Options for every column whose isolated pad would cross a property line. loadFactor turns
 * service strap moments into factored ones.
 */
export function boundaryOptions(
  boundary: PlotBoundary,
  layout: Layout,
  sites: FootingSite[],
  qaKPa: number,
  alpha: number,
  loadFactor: number,
): BoundaryOptions[] {
  const segs = inwardNormals(boundary);
  const byId = new Map(sites.map((s) => [s.columnId, s]));
  const out: BoundaryOptions[] = [];
  for (const s of sites) {
    for (const k of boundary.propertyLines) {
      const g = segs[k];
      if (!g) continue;
      const rel = { x: s.x - g.a.x, y: s.y - g.a.y };
      const along = rel.x * g.t.x + rel.y * g.t.y;
      const d = rel.x * g.n.x + rel.y * g.n.y;
      const reach = (s.sideM / 2) * (Math.abs(g.n.x) + Math.abs(g.n.y));
      if (along < -s.sideM / 2 || along > g.len + s.sideM / 2 || d >= reach - 1e-9) continue;
      // the cross wall: the beam line through the column running most nearly along the inward normal
      const runs: 'x' | 'y' = Math.abs(g.n.x) >= Math.abs(g.n.y) ? 'x' : 'y';
      const dir = runs === 'x' ? Math.sign(g.n.x) : Math.sign(g.n.y);
      const line = layout.lines.find((l) => l.runs === runs && l.nodes.some((n) => n.columnId === s.columnId));
      let interior: FootingSite | undefined;
      let spacing: number | null = null;
      if (line) {
        const i = line.nodes.findIndex((n) => n.columnId === s.columnId);
        const nb = line.nodes[i + dir];
        if (nb && nb.columnId) {
          interior = byId.get(nb.columnId);
          spacing = Math.abs(nb.s - line.nodes[i].s);
        }
      }
      const shiftM = roundUp(reach - d, 0.05);
      const shift = {
        shiftM,
        newPosition: { x: s.x + g.n.x * shiftM, y: s.y + g.n.y * shiftM },
        crossLine: line?.gridLineId ?? null,
        spanBeforeM: spacing,
        spanAfterM: spacing === null ? null : spacing - shiftM,
      };
      let strap: BoundaryOptions['strap'] = null;
      let rect: RectCombined | null = null;
      let trap: BoundaryOptions['combinedTrapezoidal'] = null;
      if (interior && spacing !== null) {
        const st = strapFooting(s.serviceKN, interior.serviceKN, spacing, d, qaKPa, alpha);
        strap = { ...st, factoredMomentKNm: st.strapMomentKNm * loadFactor };
        rect = rectangularCombined(s.serviceKN, interior.serviceKN, spacing, d, qaKPa, alpha);
        const c2 = runs === 'x' ? interior.bx : interior.by;
        const L = d + spacing + c2 / 2;
        trap = { ...trapezoidalCombined(s.serviceKN, interior.serviceKN, spacing, d, L, qaKPa, alpha), lengthM: L };
      }
      out.push({
        columnId: s.columnId,
        propertyLine: k,
        distanceToLineM: d,
        crossingM: reach - d,
        interiorColumnId: interior?.columnId ?? null,
        spacingM: spacing,
        shift,
        strap,
        combinedRectangular: rect,
        combinedTrapezoidal: trap,
      });
    }
  }
  return out;
}

/** Pairs of isolated pads that overlap or leave less than minGapM between them, with a combined footing for each. */
export function overlappingFootings(
  sites: FootingSite[],
  minGapM: number,
  qaKPa: number,
  alpha: number,
): OverlapCombined[] {
  const out: OverlapCombined[] = [];
  const ss = [...sites].sort((a, b) => a.x - b.x);
  const maxSide = ss.reduce((m, s) => Math.max(m, s.sideM), 0);
  for (let i = 0; i < ss.length; i++) {
    const a = ss[i];
    for (let j = i + 1; j < ss.length && ss[j].x - a.x < maxSide + minGapM; j++) {
      const b = ss[j];
      const half = (a.sideM + b.sideM) / 2;
      const gap = Math.max(Math.abs(b.x - a.x) - half, Math.abs(b.y - a.y) - half);
      if (gap >= minGapM) continue;
      const s = Math.sqrt((b.x - a.x) ** 2 + (b.y - a.y) ** 2);
      const xbar = (b.serviceKN * s) / (a.serviceKN + b.serviceKN);
      const halfL = Math.max(xbar + a.sideM / 2, s - xbar + b.sideM / 2);
      const lengthM = roundUp(2 * halfL, 0.1);
      const r = rectangularCombined(a.serviceKN, b.serviceKN, s, lengthM / 2 - xbar, qaKPa, alpha);
      out.push({
        columnIds: [a.columnId, b.columnId],
        gapM: gap,
        spacingM: s,
        lengthM,
        widthM: r.widthM,
        adoptedWidthM: r.adoptedWidthM,
        resultantFromFirstM: xbar,
      });
    }
  }
  return out;
}
