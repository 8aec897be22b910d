import type { SchemeDocument } from '@trabeate/contracts';

// Plan geometry for drawing: where each element the engine names sits, in plan metres.

export interface Pt {
  x: number;
  y: number;
}
export interface Seg {
  id: string;
  a: Pt;
  b: Pt;
}

export interface PlanGeometry {
  /** plan extents with a margin for grid labels, m */
  box: { minX: number; minY: number; width: number; height: number };
  /** grid lines drawn across the plan, with the label at their start */
  grid: { id: string; label: string; axis: 'x' | 'y'; a: Pt; b: Pt }[];
  /** primary beam spans along grid lines, between neighbouring columns, with the engine's member ids */
  beams: (Seg & { lineId: string })[];
  secondaries: Seg[];
  /** boundary segments; `property` marks property lines */
  boundary: (Seg & { property: boolean })[];
  /** position of any element the engine may name, by id */
  at: Map<string, Pt>;
}

const ON_LINE = 0.01; // m: a column within 10 mm of a grid line stands on it
const MARGIN = 2.5; // m around the plot, room for grid bubbles

/** Works out what to draw and where each named element is. */
export function planGeometry(doc: SchemeDocument): PlanGeometry {
  const xs = [...doc.boundary.vertices.map((v) => v.x), ...doc.columns.map((c) => c.x)];
  const ys = [...doc.boundary.vertices.map((v) => v.y), ...doc.columns.map((c) => c.y)];
  for (const g of doc.grid) {
    if (g.x !== undefined) xs.push(g.x);
    if (g.y !== undefined) ys.push(g.y);
  }
  const minX = Math.min(...xs) - MARGIN;
  const maxX = Math.max(...xs) + MARGIN;
  const minY = Math.min(...ys) - MARGIN;
  const maxY = Math.max(...ys) + MARGIN;
  const at = new Map<string, Pt>();
  for (const c of doc.columns) at.set(c.id, { x: c.x, y: c.y });

  const grid: PlanGeometry['grid'] = [];
  const beams: PlanGeometry['beams'] = [];
  const xLines = doc.grid.filter((g) => g.x !== undefined).sort((p, q) => (p.x as number) - (q.x as number));
  const yLines = doc.grid.filter((g) => g.y !== undefined).sort((p, q) => (p.y as number) - (q.y as number));
  const crossLabel = (lines: typeof xLines, key: 'x' | 'y', v: number) =>
    lines.find((l) => Math.abs((l[key] as number) - v) < ON_LINE)?.label ?? 'end';

  for (const g of doc.grid) {
    const axis: 'x' | 'y' = g.x !== undefined ? 'x' : 'y';
    const v = (g.x ?? g.y) as number;
    const a = axis === 'x' ? { x: v, y: minY + 1 } : { x: minX + 1, y: v };
    const b = axis === 'x' ? { x: v, y: maxY - 0.5 } : { x: maxX - 0.5, y: v };
    grid.push({ id: g.id, label: g.label, axis, a, b });
    at.set(g.id, { x: (a.x + b.x) / 2, y: (a.y + b.y) / 2 });
    at.set(`L-${g.id}`, at.get(g.id) as Pt);
    // the engine names a span B-<line label>/<cross label>-<cross label> (see libs/structural layout)
    const along = doc.columns
      .filter((c) => Math.abs((axis === 'x' ? c.x : c.y) - v) < ON_LINE)
      .map((c) => (axis === 'x' ? c.y : c.x))
      .sort((p, q) => p - q);
    const cross = axis === 'x' ? yLines : xLines;
    const crossKey = axis === 'x' ? 'y' : 'x';
    for (let i = 0; i + 1 < along.length; i++) {
      const s = along[i];
      const e = along[i + 1];
      const id = `B-${g.label}/${crossLabel(cross, crossKey, s)}-${crossLabel(cross, crossKey, e)}`;
      const seg = axis === 'x' ? { a: { x: v, y: s }, b: { x: v, y: e } } : { a: { x: s, y: v }, b: { x: e, y: v } };
      beams.push({ id, lineId: g.id, ...seg });
      at.set(id, { x: (seg.a.x + seg.b.x) / 2, y: (seg.a.y + seg.b.y) / 2 });
    }
  }
  const secondaries = doc.secondaryBeams.map((s) => ({ id: s.id, a: s.start, b: s.end }));
  for (const s of secondaries) at.set(s.id, { x: (s.a.x + s.b.x) / 2, y: (s.a.y + s.b.y) / 2 });
  const n = doc.boundary.vertices.length;
  const property = new Set(doc.boundary.propertyLines);
  const boundary = doc.boundary.vertices.map((v, i) => ({
    id: `boundary-${i}`,
    a: v,
    b: doc.boundary.vertices[(i + 1) % n],
    property: property.has(i),
  }));
  return { box: { minX, minY, width: maxX - minX, height: maxY - minY }, grid, beams, secondaries, boundary, at };
}

/**
 * Where a check's marker goes: among the elements it names, the columns if there are any (a column
 * named with its grid line sits at the column), otherwise the middle of those with a place.
 */
export function markerPoint(doc: SchemeDocument, geometry: PlanGeometry, elements: readonly string[]): Pt | null {
  const columns = new Set(doc.columns.map((c) => c.id));
  const named = elements.some((e) => columns.has(e)) ? elements.filter((e) => columns.has(e)) : elements;
  const pts = named.map((e) => geometry.at.get(e)).filter((p): p is Pt => p !== undefined);
  if (!pts.length) return null;
  return { x: pts.reduce((s, p) => s + p.x, 0) / pts.length, y: pts.reduce((s, p) => s + p.y, 0) / pts.length };
}
