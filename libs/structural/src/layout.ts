// The framing derived from a scheme: beam lines along grid lines between columns, the slab
// panels that the beams enclose, and where secondary beams land. Plan coordinates in m.
import type { Column, GridLine, Scheme, SecondaryBeam } from './model';

export const ON_LINE_TOL_M = 0.02;

export type SpanKind = 'cantilever' | 'simple' | 'endSpan' | 'interior';

export interface LineNode {
  /** position along the line, m */
  s: number;
  columnId: string | null;
}

export interface LineMember {
  index: number;
  /** id of the beam span, e.g. "B-1/A-B" */
  id: string;
  startS: number;
  endS: number;
  lengthM: number;
  kind: SpanKind;
}

export interface BeamLine {
  id: string;
  gridLineId: string;
  label: string;
  /** 'x': the line runs along x (a grid line given by y); 'y': it runs along y */
  runs: 'x' | 'y';
  /** the fixed plan coordinate of the line, m */
  at: number;
  nodes: LineNode[];
  members: LineMember[];
  widthMm: number;
  specifiedDepthMm: number | null;
  wallThicknessMm: number;
}

export interface PanelEdge {
  side: 'south' | 'north' | 'west' | 'east';
  carrier: { type: 'line'; lineId: string } | { type: 'secondary'; id: string };
  /** edge extent along its carrier, m (plan coordinates along the edge direction) */
  from: number;
  to: number;
}

export interface Panel {
  id: string;
  x1: number;
  x2: number;
  y1: number;
  y2: number;
  lx: number;
  ly: number;
  edges: PanelEdge[];
}

export interface SecondaryFrame {
  beam: SecondaryBeam;
  runs: 'x' | 'y';
  at: number;
  from: number;
  to: number;
  lengthM: number;
  /** beam lines carrying its start and end, with the position along each line */
  supports: { lineId: string; s: number }[];
}

export interface Layout {
  lines: BeamLine[];
  lineById: Map<string, BeamLine>;
  panels: Panel[];
  secondaries: SecondaryFrame[];
  /** columns that are on no grid line carrying beams */
  looseColumns: string[];
}

const near = (a: number, b: number) => Math.abs(a - b) <= ON_LINE_TOL_M;

export function columnOnLine(c: Column, g: GridLine): boolean {
  return g.x !== undefined ? near(c.x, g.x) : g.y !== undefined ? near(c.y, g.y) : false;
}

/** Plan dimensions of a column, m: along x and along y. */
export function columnPlan(c: Column): { bx: number; by: number } {
  return c.orientationDeg === 90
    ? { bx: c.depthMm / 1000, by: c.widthMm / 1000 }
    : { bx: c.widthMm / 1000, by: c.depthMm / 1000 };
}

function sortedLabels(grid: GridLine[], axis: 'x' | 'y'): GridLine[] {
  return grid.filter((g) => g[axis] !== undefined).sort((a, b) => (a[axis] as number) - (b[axis] as number));
}

export function deriveLayout(scheme: Scheme): Layout {
  const lines: BeamLine[] = [];
  const onSomeLine = new Set<string>();
  const xLines = sortedLabels(scheme.grid, 'x');
  const yLines = sortedLabels(scheme.grid, 'y');
  // label of the crossing grid line at a position, for readable span ids
  // (the lines are sorted by coordinate: start the scan a little before the first that can be
  // near s, found by bisection, and stop a little after the last; the first near one is the answer)
  const crossLabel = (runs: 'x' | 'y', s: number): string => {
    const cross = runs === 'x' ? xLines : yLines;
    const at = (g: GridLine) => (runs === 'x' ? g.x : g.y) as number;
    let lo = 0;
    let hi = cross.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (at(cross[mid]) < s - 2 * ON_LINE_TOL_M) lo = mid + 1;
      else hi = mid;
    }
    for (let i = lo; i < cross.length && at(cross[i]) <= s + 2 * ON_LINE_TOL_M; i++)
      if (near(at(cross[i]), s)) return cross[i].label;
    return s.toFixed(2);
  };
  // columns sorted on each plan axis, so that each grid line finds its own by binary search
  const byX = [...scheme.columns].sort((a, b) => a.x - b.x);
  const byY = [...scheme.columns].sort((a, b) => a.y - b.y);
  const onLine = (sorted: Column[], axis: 'x' | 'y', at: number): Column[] => {
    let lo = 0;
    let hi = sorted.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (sorted[mid][axis] < at - ON_LINE_TOL_M) lo = mid + 1;
      else hi = mid;
    }
    const out: Column[] = [];
    for (let i = lo; i < sorted.length && sorted[i][axis] <= at + ON_LINE_TOL_M; i++) out.push(sorted[i]);
    return out;
  };

  for (const g of scheme.grid) {
    const runs: 'x' | 'y' = g.y !== undefined ? 'x' : 'y';
    const at = (g.y ?? g.x) as number;
    const cols = (g.x !== undefined ? onLine(byX, 'x', g.x) : onLine(byY, 'y', at))
      .map((c) => ({ s: runs === 'x' ? c.x : c.y, columnId: c.id as string | null }))
      .sort((a, b) => a.s - b.s);
    if (cols.length < 2) continue;
    for (const c of cols) onSomeLine.add(c.columnId as string);
    const nodes: LineNode[] = [];
    if (g.overhangStartM && g.overhangStartM > 0) nodes.push({ s: cols[0].s - g.overhangStartM, columnId: null });
    nodes.push(...cols);
    if (g.overhangEndM && g.overhangEndM > 0)
      nodes.push({ s: cols[cols.length - 1].s + g.overhangEndM, columnId: null });
    const nSpans = cols.length - 1;
    const members: LineMember[] = [];
    let spanNo = 0;
    for (let i = 0; i + 1 < nodes.length; i++) {
      const a = nodes[i];
      const b = nodes[i + 1];
      let kind: SpanKind;
      if (a.columnId === null || b.columnId === null) kind = 'cantilever';
      else {
        spanNo++;
        kind = nSpans === 1 ? 'simple' : spanNo === 1 || spanNo === nSpans ? 'endSpan' : 'interior';
      }
      members.push({
        index: i,
        id: `B-${g.label}/${a.columnId === null ? 'end' : crossLabel(runs, a.s)}-${b.columnId === null ? 'end' : crossLabel(runs, b.s)}`,
        startS: a.s,
        endS: b.s,
        lengthM: b.s - a.s,
        kind,
      });
    }
    lines.push({
      id: `L-${g.id}`,
      gridLineId: g.id,
      label: g.label,
      runs,
      at,
      nodes,
      members,
      widthMm: g.beamWidthMm ?? scheme.basis.beamWidthMm,
      specifiedDepthMm: g.beamDepthMm ?? null,
      wallThicknessMm: g.wallThicknessMm ?? 0,
    });
  }
  const lineById = new Map(lines.map((l) => [l.id, l]));

  const covers = (l: BeamLine, runs: 'x' | 'y', at: number, from: number, to: number) =>
    l.runs === runs &&
    near(l.at, at) &&
    l.nodes[0].s <= from + ON_LINE_TOL_M &&
    l.nodes[l.nodes.length - 1].s >= to - ON_LINE_TOL_M;
  // bays look lines up by their exact grid coordinate; anything else scans with the tolerance
  // (keyed by the number itself: no number-to-string conversion on every look-up)
  const exact = { x: new Map<number, BeamLine[]>(), y: new Map<number, BeamLine[]>() };
  for (const l of lines) {
    const list = exact[l.runs].get(l.at);
    if (list) list.push(l);
    else exact[l.runs].set(l.at, [l]);
  }
  const lineCovers = (runs: 'x' | 'y', at: number, from: number, to: number): BeamLine | undefined => {
    const list = exact[runs].get(at);
    if (list) for (const l of list) if (covers(l, runs, at, from, to)) return l;
    for (const l of lines) if (covers(l, runs, at, from, to)) return l;
    return undefined;
  };

  // secondary beams: must be axis-parallel with both ends on perpendicular beam lines
  const secondaries: SecondaryFrame[] = [];
  for (const sb of scheme.secondaryBeams) {
    const runs: 'x' | 'y' = near(sb.start.y, sb.end.y) ? 'x' : 'y';
    const at = runs === 'x' ? sb.start.y : sb.start.x;
    const a = runs === 'x' ? sb.start.x : sb.start.y;
    const b = runs === 'x' ? sb.end.x : sb.end.y;
    const from = Math.min(a, b);
    const to = Math.max(a, b);
    const cross: 'x' | 'y' = runs === 'x' ? 'y' : 'x';
    const supports: { lineId: string; s: number }[] = [];
    for (const end of [from, to]) {
      const l = lineCovers(cross, end, at, at);
      if (l) supports.push({ lineId: l.id, s: at });
    }
    secondaries.push({ beam: sb, runs, at, from, to, lengthM: to - from, supports });
  }

  // panels: grid bays enclosed by beams, split by secondary beams that cross the whole bay
  const panels: Panel[] = [];
  const full = secondaries.filter((s) => s.supports.length === 2);
  // the full secondaries of each direction in order of position (stable: ties keep scheme order),
  // so that each bay finds the ones across it by binary search
  const byAt = (runs: 'x' | 'y') => full.filter((s) => s.runs === runs).sort((p, q) => p.at - q.at);
  const fullY = byAt('y');
  const fullX = byAt('x');
  const across = (sorted: SecondaryFrame[], lo: number, hi: number, from: number, to: number): SecondaryFrame[] => {
    // first with at > lo
    let a = 0;
    let b = sorted.length;
    while (a < b) {
      const mid = (a + b) >> 1;
      if (sorted[mid].at > lo) b = mid;
      else a = mid + 1;
    }
    const out: SecondaryFrame[] = [];
    for (let i = a; i < sorted.length && sorted[i].at < hi; i++) {
      const s = sorted[i];
      if (near(s.from, from) && near(s.to, to)) out.push(s);
    }
    return out;
  };
  // one carrier object per beam line, shared by the panel edges it carries
  const carriers = new Map<string, PanelEdge['carrier']>();
  const carrierOf = (l: BeamLine): PanelEdge['carrier'] => {
    let c = carriers.get(l.id);
    if (!c) {
      c = { type: 'line', lineId: l.id };
      carriers.set(l.id, c);
    }
    return c;
  };
  const secondaryCarrier = (s: SecondaryFrame): PanelEdge['carrier'] => ({ type: 'secondary', id: s.beam.id });
  for (let i = 0; i + 1 < xLines.length; i++) {
    for (let j = 0; j + 1 < yLines.length; j++) {
      const x1 = xLines[i].x as number;
      const x2 = xLines[i + 1].x as number;
      const y1 = yLines[j].y as number;
      const y2 = yLines[j + 1].y as number;
      const south = lineCovers('x', y1, x1, x2);
      const north = lineCovers('x', y2, x1, x2);
      const west = lineCovers('y', x1, y1, y2);
      const east = lineCovers('y', x2, y1, y2);
      if (!south || !north || !west || !east) continue;
      // cuts by secondary beams running along y (constant x) or along x (constant y) across the bay
      const cutsX = across(fullY, x1 + ON_LINE_TOL_M, x2 - ON_LINE_TOL_M, y1, y2);
      const cutsY = across(fullX, y1 + ON_LINE_TOL_M, y2 - ON_LINE_TOL_M, x1, x2);
      const xs = [
        { v: x1, c: carrierOf(west) },
        ...cutsX.map((s) => ({ v: s.at, c: secondaryCarrier(s) })),
        { v: x2, c: carrierOf(east) },
      ];
      const ys = [
        { v: y1, c: carrierOf(south) },
        ...cutsY.map((s) => ({ v: s.at, c: secondaryCarrier(s) })),
        { v: y2, c: carrierOf(north) },
      ];
      let k = 0;
      for (let a = 0; a + 1 < xs.length; a++) {
        for (let b = 0; b + 1 < ys.length; b++) {
          const px1 = xs[a].v,
            px2 = xs[a + 1].v,
            py1 = ys[b].v,
            py2 = ys[b + 1].v;
          const dx = px2 - px1;
          const dy = py2 - py1;
          const suffix = xs.length + ys.length > 4 ? `.${++k}` : '';
          panels.push({
            id: `S-${xLines[i].label}${xLines[i + 1].label}/${yLines[j].label}${yLines[j + 1].label}${suffix}`,
            x1: px1,
            x2: px2,
            y1: py1,
            y2: py2,
            lx: Math.min(dx, dy),
            ly: Math.max(dx, dy),
            edges: [
              { side: 'south', carrier: ys[b].c, from: px1, to: px2 },
              { side: 'north', carrier: ys[b + 1].c, from: px1, to: px2 },
              { side: 'west', carrier: xs[a].c, from: py1, to: py2 },
              { side: 'east', carrier: xs[a + 1].c, from: py1, to: py2 },
            ],
          });
        }
      }
    }
  }
  const looseColumns = scheme.columns.filter((c) => !onSomeLine.has(c.id)).map((c) => c.id);
  return { lines, lineById, panels, secondaries, looseColumns };
}
