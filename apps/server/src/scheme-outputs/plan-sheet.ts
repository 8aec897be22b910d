import type { PlanSheetSize, SchemeDocument } from '@trabeate/contracts';
import type { SchemeResult } from '@trabeate/structural';
import { FOOTING_OPTION_LABELS, PLAN_SCALES } from '@trabeate/contracts';

// The plan sheet of a scheme's column layout, as a list of drawing primitives in sheet
// millimetres (origin at the top left, y downwards). The PDF (sheet-pdf.ts) and the SVG
// (sheet-svg.ts) only translate these primitives, so the two never drift apart.

/** ISO 216 sheet sizes, landscape, mm. */
export const SHEET_MM: Record<PlanSheetSize, { w: number; h: number }> = {
  A0: { w: 1189, h: 841 },
  A1: { w: 841, h: 594 },
  A2: { w: 594, h: 420 },
  A3: { w: 420, h: 297 },
  A4: { w: 297, h: 210 },
};

export type Tone = 'ink' | 'muted' | 'accent' | 'paper';
export type Primitive =
  | { kind: 'line'; x1: number; y1: number; x2: number; y2: number; width: number; tone: Tone; dash?: number[] }
  | {
      kind: 'poly';
      points: [number, number][];
      width: number;
      tone: Tone;
      fill?: Tone;
      closed: boolean;
      dash?: number[];
    }
  | { kind: 'circle'; cx: number; cy: number; r: number; width: number; tone: Tone; fill?: Tone }
  | {
      kind: 'text';
      x: number;
      y: number;
      text: string;
      /** font size on paper, mm */
      size: number;
      anchor: 'start' | 'middle' | 'end';
      bold?: boolean;
      tone: Tone;
      /** degrees anticlockwise */
      rotate?: number;
    };

export interface TitleFields {
  firm: string;
  project: string;
  drawingNumber: string;
  title: string;
  revision: string;
  suitability: string;
  drawnBy: string;
  checkedBy: string;
  approvedBy: string;
  /** already in the firm's date format */
  date: string;
  scheme: string;
  engineVersion: string;
  caution: string;
}

export interface PlanSheet {
  size: PlanSheetSize;
  scale: number;
  widthMm: number;
  heightMm: number;
  primitives: Primitive[];
}

/** The plan could not be drawn at this size and scale; `smallestScale` is the first that fits (null: none does). */
export class SheetDoesNotFit extends Error {
  constructor(
    readonly smallestScale: number | null,
    message: string,
  ) {
    super(message);
  }
}

const MARGIN = 10;
// The title panel runs down the right-hand edge (narrower on A4 and A3).
const panelWidth = (size: PlanSheetSize) => (size === 'A4' ? 62 : size === 'A3' ? 72 : 90);
// Paper kept around the plan for grid bubbles and dimension chains, mm.
const AROUND = 24;
const BUBBLE_R = 4;

interface Extent {
  minX: number;
  maxX: number;
  minY: number;
  maxY: number;
}

function planExtent(doc: SchemeDocument, results: SchemeResult): Extent {
  const xs = doc.boundary.vertices.map((v) => v.x);
  const ys = doc.boundary.vertices.map((v) => v.y);
  for (const c of doc.columns) {
    xs.push(c.x);
    ys.push(c.y);
  }
  for (const g of doc.grid) {
    if (g.x !== undefined) xs.push(g.x);
    if (g.y !== undefined) ys.push(g.y);
  }
  for (const f of results.sizes?.footings ?? []) {
    const c = doc.columns.find((k) => k.id === f.columnId);
    if (!c) continue;
    xs.push(c.x - f.adoptedSideM / 2, c.x + f.adoptedSideM / 2);
    ys.push(c.y - f.adoptedSideM / 2, c.y + f.adoptedSideM / 2);
  }
  for (const o of chosenFootings(doc, results).outlines)
    for (const [x, y] of o.points) {
      xs.push(x);
      ys.push(y);
    }
  return { minX: Math.min(...xs), maxX: Math.max(...xs), minY: Math.min(...ys), maxY: Math.max(...ys) };
}

type Pt = [number, number];

/** The outline of a footing the engineer chose, in plan m, with its words for the sheet. */
export interface ChosenOutline {
  columnId: string;
  option: keyof typeof FOOTING_OPTION_LABELS;
  /** closed outlines, plan m (a strap footing has three: exterior pad, strap, interior pad) */
  shapes: Pt[][];
  /** every point of the shapes, for the sheet's extent */
  points: Pt[];
  /** where the words go, plan m */
  labelAt: Pt;
  /** a moved column's section at its new place, when the choice is to move it */
  movedColumn: Pt[] | null;
}

const unit = (x: number, y: number): Pt => {
  const l = Math.hypot(x, y) || 1;
  return [x / l, y / l];
};

/**
 * The chosen footing at each column with a recorded choice (scheme.footingChoices), drawn from the
 * sizes the engine stored for that option: a strap's exterior pad against the line, the strap and
 * the interior pad; a combined footing from the line past the interior column; the moved column
 * with its own pad at the new place; one combined footing under two overlapping pads. Lengths run
 * along the line from the column to its interior neighbour (the engine sizes them so), widths
 * across it. `covered` are the columns whose plain isolated pad the chosen outline replaces. A
 * choice the stored results no longer offer (a stale one) draws nothing: the plain pad stays.
 */
export function chosenFootings(
  doc: SchemeDocument,
  results: SchemeResult,
): { outlines: ChosenOutline[]; covered: Set<string> } {
  const outlines: ChosenOutline[] = [];
  const covered = new Set<string>();
  const col = new Map(doc.columns.map((c) => [c.id, c]));
  const pads = new Map((results.sizes?.footings ?? []).map((f) => [f.columnId, f.adoptedSideM]));
  const v = doc.boundary.vertices;
  const centre: Pt = [v.reduce((s, p) => s + p.x, 0) / v.length, v.reduce((s, p) => s + p.y, 0) / v.length];
  const square = (x: number, y: number, side: number): Pt[] => {
    const h = side / 2;
    return [
      [x - h, y - h],
      [x + h, y - h],
      [x + h, y + h],
      [x - h, y + h],
    ];
  };
  for (const choice of doc.footingChoices ?? []) {
    const c = col.get(choice.columnId);
    if (!c) continue;
    // A band along axis u from s0 to s1 (m from `from`), half-widths w0 at s0 and w1 at s1.
    const band = (from: Pt, u: Pt, s0: number, s1: number, w0: number, w1 = w0): Pt[] => {
      const n: Pt = [-u[1], u[0]];
      const at = (s: number, w: number): Pt => [from[0] + u[0] * s + n[0] * w, from[1] + u[1] * s + n[1] * w];
      return [at(s0, -w0), at(s1, -w1), at(s1, w1), at(s0, w0)];
    };
    let shapes: Pt[][] = [];
    let labelAt: Pt = [c.x, c.y];
    let movedColumn: Pt[] | null = null;
    const these: string[] = [c.id];
    if (choice.option === 'combinedOverlap' || choice.option === 'isolated') {
      const o = results.footings.combined.find((k) => k.columnIds.includes(c.id));
      const a = o && col.get(o.columnIds[0]);
      const b = o && col.get(o.columnIds[1]);
      if (!o || !a || !b) continue;
      these.push(a.id, b.id);
      if (choice.option === 'isolated')
        shapes = [a, b].filter((k) => (pads.get(k.id) ?? 0) > 0).map((k) => square(k.x, k.y, pads.get(k.id)!));
      else {
        const u = unit(b.x - a.x, b.y - a.y);
        const mid = o.resultantFromFirstM;
        shapes = [band([a.x, a.y], u, mid - o.lengthM / 2, mid + o.lengthM / 2, o.adoptedWidthM / 2)];
      }
      labelAt = [(a.x + b.x) / 2, (a.y + b.y) / 2];
    } else {
      const o = results.footings.boundary.find((k) => k.columnId === c.id);
      if (!o) continue;
      const inner = o.interiorColumnId ? col.get(o.interiorColumnId) : undefined;
      // along the cross wall toward the interior column; without one, away from the line into the plot
      let u: Pt;
      if (inner) u = unit(inner.x - c.x, inner.y - c.y);
      else {
        const p = v[o.propertyLine];
        const q = v[(o.propertyLine + 1) % v.length];
        const t = unit(q.x - p.x, q.y - p.y);
        const n: Pt = [-t[1], t[0]];
        const side = (centre[0] - p.x) * n[0] + (centre[1] - p.y) * n[1];
        u = side >= 0 ? n : [-n[0], -n[1]];
      }
      const d = o.distanceToLineM;
      const from: Pt = [c.x, c.y];
      if (choice.option === 'shift') {
        const np = o.shift.newPosition;
        const side = pads.get(c.id) ?? 0;
        if (side > 0) shapes = [square(np.x, np.y, side)];
        const [bx, by] = c.orientationDeg === 90 ? [c.depthMm, c.widthMm] : [c.widthMm, c.depthMm];
        movedColumn = [
          [np.x - bx / 2000, np.y - by / 2000],
          [np.x + bx / 2000, np.y - by / 2000],
          [np.x + bx / 2000, np.y + by / 2000],
          [np.x - bx / 2000, np.y + by / 2000],
        ];
        labelAt = [np.x, np.y];
      } else if (choice.option === 'strap' && o.strap && inner && o.spacingM !== null) {
        const st = o.strap;
        const half = (doc.basis.beamWidthMm ?? 300) / 2000;
        shapes = [
          band(from, u, -d, st.exteriorLengthM - d, st.exteriorWidthM / 2),
          band(from, u, st.exteriorLengthM - d, o.spacingM - st.interiorSideM / 2, half),
          square(inner.x, inner.y, st.interiorSideM),
        ];
        these.push(inner.id);
      } else if (choice.option === 'combinedRectangular' && o.combinedRectangular && inner) {
        const r = o.combinedRectangular;
        shapes = [band(from, u, -d, r.lengthM - d, r.adoptedWidthM / 2)];
        these.push(inner.id);
      } else if (choice.option === 'combinedTrapezoidal' && o.combinedTrapezoidal && inner) {
        const r = o.combinedTrapezoidal;
        shapes = [band(from, u, -d, r.lengthM - d, r.widthAtFirstM / 2, r.widthAtFarM / 2)];
        these.push(inner.id);
      } else continue;
      if (choice.option !== 'shift' && inner) labelAt = [(c.x + inner.x) / 2, (c.y + inner.y) / 2];
    }
    if (!shapes.length) continue;
    for (const id of these) covered.add(id);
    outlines.push({
      columnId: c.id,
      option: choice.option,
      shapes,
      points: [...shapes.flat(), ...(movedColumn ?? [])],
      labelAt,
      movedColumn,
    });
  }
  return { outlines, covered };
}

/** The drawing area of a sheet (inside the frame, left of the title panel), mm. */
function drawingArea(size: PlanSheetSize) {
  const { w, h } = SHEET_MM[size];
  return { x: MARGIN, y: MARGIN, w: w - 2 * MARGIN - panelWidth(size), h: h - 2 * MARGIN };
}

const fits = (e: Extent, size: PlanSheetSize, scale: number) => {
  const a = drawingArea(size);
  return (
    ((e.maxX - e.minX) * 1000) / scale + 2 * AROUND <= a.w && ((e.maxY - e.minY) * 1000) / scale + 2 * AROUND <= a.h
  );
};

/** The smallest of the offered scales (largest drawing) at which the plan fits this sheet; null when none does. */
export function smallestFittingScale(doc: SchemeDocument, results: SchemeResult, size: PlanSheetSize): number | null {
  const e = planExtent(doc, results);
  return PLAN_SCALES.find((s) => fits(e, size, s)) ?? null;
}

const round = (v: number, step = 0.01) => Math.round(v / step) * step;
const mm = (m: number) => String(Math.round(m * 1000));

/** Splits text into lines of at most `chars` characters at spaces (both renderers print lines as given). */
export function wrap(text: string, chars: number): string[] {
  const lines: string[] = [];
  let line = '';
  for (const word of text.split(/\s+/)) {
    if (line && (line + ' ' + word).length > chars) {
      lines.push(line);
      line = word;
    } else line = line ? `${line} ${word}` : word;
  }
  if (line) lines.push(line);
  return lines;
}

/**
 * Builds the sheet: frame, plot boundary with its property lines, grid lines with bubbles and
 * dimension chains, columns drawn to size with their marks and sections, footing outlines (the
 * chosen footing where the engineer recorded one, else the isolated pad from the stored results), scale bar, north point and the title panel.
 * Plan coordinates are m with y to the north; the sheet is drawn with north up.
 */
export function buildPlanSheet(
  doc: SchemeDocument,
  results: SchemeResult,
  size: PlanSheetSize,
  scale: number,
  title: TitleFields,
): PlanSheet {
  const e = planExtent(doc, results);
  if (!fits(e, size, scale)) {
    const smallest = smallestFittingScale(doc, results, size);
    throw new SheetDoesNotFit(
      smallest,
      smallest === null
        ? `The plan does not fit an ${size} sheet at any offered scale; choose a larger sheet.`
        : `The plan does not fit an ${size} sheet at 1:${scale}; the smallest scale that fits is 1:${smallest}.`,
    );
  }
  const { w: W, h: H } = SHEET_MM[size];
  const area = drawingArea(size);
  const k = 1000 / scale; // paper mm per plan m
  const planW = (e.maxX - e.minX) * k;
  const planH = (e.maxY - e.minY) * k;
  const ox = area.x + (area.w - planW) / 2;
  const oy = area.y + (area.h - planH) / 2;
  const px = (x: number) => round(ox + (x - e.minX) * k);
  const py = (y: number) => round(oy + (e.maxY - y) * k);
  const out: Primitive[] = [];
  const text = (
    x: number,
    y: number,
    t: string,
    size: number,
    more: Partial<Extract<Primitive, { kind: 'text' }>> = {},
  ) => out.push({ kind: 'text', x: round(x), y: round(y), text: t, size, anchor: 'start', tone: 'ink', ...more });

  // frame
  out.push({
    kind: 'poly',
    points: [
      [MARGIN, MARGIN],
      [W - MARGIN, MARGIN],
      [W - MARGIN, H - MARGIN],
      [MARGIN, H - MARGIN],
    ],
    width: 0.5,
    tone: 'ink',
    closed: true,
  });

  // plot boundary; property lines heavy and dash-dotted, with their words
  const v = doc.boundary.vertices;
  out.push({ kind: 'poly', points: v.map((p) => [px(p.x), py(p.y)]), width: 0.25, tone: 'muted', closed: true });
  for (const i of doc.boundary.propertyLines) {
    const a = v[i];
    const b = v[(i + 1) % v.length];
    out.push({
      kind: 'line',
      x1: px(a.x),
      y1: py(a.y),
      x2: px(b.x),
      y2: py(b.y),
      width: 0.7,
      tone: 'accent',
      dash: [6, 1.5, 1, 1.5],
    });
    const angle = (Math.atan2(-(py(b.y) - py(a.y)), px(b.x) - px(a.x)) * 180) / Math.PI;
    const upright = angle > 90 || angle < -90 ? angle + 180 : angle;
    text((px(a.x) + px(b.x)) / 2, (py(a.y) + py(b.y)) / 2 - 1.5, 'PROPERTY LINE', 2, {
      anchor: 'middle',
      tone: 'accent',
      rotate: round(upright, 1),
    });
  }

  // grid lines, bubbles at both ends, and dimension chains between neighbours
  const xs = doc.grid.filter((g) => g.x !== undefined).sort((a, b) => a.x! - b.x!);
  const ys = doc.grid.filter((g) => g.y !== undefined).sort((a, b) => a.y! - b.y!);
  const top = oy - AROUND + BUBBLE_R + 1;
  const bottom = oy + planH + AROUND - BUBBLE_R - 1;
  const left = ox - AROUND + BUBBLE_R + 1;
  const right = ox + planW + AROUND - BUBBLE_R - 1;
  const bubble = (cx: number, cy: number, label: string) => {
    out.push({ kind: 'circle', cx: round(cx), cy: round(cy), r: BUBBLE_R, width: 0.35, tone: 'ink' });
    text(cx, cy + 1.2, label, 3, { anchor: 'middle', bold: true });
  };
  for (const g of xs) {
    const x = px(g.x!);
    out.push({
      kind: 'line',
      x1: x,
      y1: top + BUBBLE_R,
      x2: x,
      y2: bottom - BUBBLE_R,
      width: 0.18,
      tone: 'muted',
      dash: [8, 1.5, 1.5, 1.5],
    });
    bubble(x, top, g.label);
    bubble(x, bottom, g.label);
  }
  for (const g of ys) {
    const y = py(g.y!);
    out.push({
      kind: 'line',
      x1: left + BUBBLE_R,
      y1: y,
      x2: right - BUBBLE_R,
      y2: y,
      width: 0.18,
      tone: 'muted',
      dash: [8, 1.5, 1.5, 1.5],
    });
    bubble(left, y, g.label);
    bubble(right, y, g.label);
  }
  const chainY = top + BUBBLE_R + 5;
  for (let i = 0; i + 1 < xs.length; i++) {
    const a = px(xs[i].x!);
    const b = px(xs[i + 1].x!);
    out.push({ kind: 'line', x1: a, y1: chainY, x2: b, y2: chainY, width: 0.18, tone: 'ink' });
    for (const t of [a, b])
      out.push({
        kind: 'line',
        x1: t - 0.8,
        y1: chainY + 0.8,
        x2: t + 0.8,
        y2: chainY - 0.8,
        width: 0.35,
        tone: 'ink',
      });
    text((a + b) / 2, chainY - 1, mm(xs[i + 1].x! - xs[i].x!), 2, { anchor: 'middle' });
  }
  const chainX = left + BUBBLE_R + 5;
  for (let i = 0; i + 1 < ys.length; i++) {
    const a = py(ys[i].y!);
    const b = py(ys[i + 1].y!);
    out.push({ kind: 'line', x1: chainX, y1: a, x2: chainX, y2: b, width: 0.18, tone: 'ink' });
    for (const t of [a, b])
      out.push({
        kind: 'line',
        x1: chainX - 0.8,
        y1: t + 0.8,
        x2: chainX + 0.8,
        y2: t - 0.8,
        width: 0.35,
        tone: 'ink',
      });
    text(chainX - 1, (a + b) / 2, mm(ys[i + 1].y! - ys[i].y!), 2, { anchor: 'middle', rotate: 90 });
  }

  // footing outlines under the columns: the footing the engineer chose where there is a choice,
  // else the isolated pad as sized from the results
  const chosen = chosenFootings(doc, results);
  const footings = new Map((results.sizes?.footings ?? []).map((f) => [f.columnId, f]));
  for (const o of chosen.outlines) {
    for (const shape of o.shapes)
      out.push({
        kind: 'poly',
        points: shape.map(([x, y]) => [px(x), py(y)]),
        width: 0.35,
        tone: 'accent',
        closed: true,
        dash: [2, 1],
      });
    if (o.movedColumn)
      out.push({
        kind: 'poly',
        points: o.movedColumn.map(([x, y]) => [px(x), py(y)]),
        width: 0.25,
        tone: 'accent',
        closed: true,
        dash: [0.8, 0.6],
      });
  }
  for (const c of doc.columns) {
    const f = footings.get(c.id);
    if (!f || !(f.adoptedSideM > 0) || chosen.covered.has(c.id)) continue;
    const h = f.adoptedSideM / 2;
    out.push({
      kind: 'poly',
      points: [
        [px(c.x - h), py(c.y - h)],
        [px(c.x + h), py(c.y - h)],
        [px(c.x + h), py(c.y + h)],
        [px(c.x - h), py(c.y + h)],
      ],
      width: 0.25,
      tone: 'ink',
      closed: true,
      dash: [2, 1],
    });
  }
  // columns to size (orientation 90 turns the section), with mark and section beside each
  for (const c of doc.columns) {
    const [bx, by] = c.orientationDeg === 90 ? [c.depthMm, c.widthMm] : [c.widthMm, c.depthMm];
    const hx = bx / 2000;
    const hy = by / 2000;
    out.push({
      kind: 'poly',
      points: [
        [px(c.x - hx), py(c.y - hy)],
        [px(c.x + hx), py(c.y - hy)],
        [px(c.x + hx), py(c.y + hy)],
        [px(c.x - hx), py(c.y + hy)],
      ],
      width: 0.35,
      tone: 'ink',
      fill: 'ink',
      closed: true,
    });
    const lx = px(c.x + hx) + 1.2;
    const ly = py(c.y + hy) - 1;
    text(lx, ly, c.label, 2.5, { bold: true });
    const f = chosen.covered.has(c.id) ? undefined : footings.get(c.id);
    text(lx, ly + 3, `${c.widthMm}×${c.depthMm}${f ? ` · F ${f.adoptedSideM.toFixed(1)} m sq.` : ''}`, 1.8, {
      tone: 'muted',
    });
  }
  // the chosen footings' words, just below their outlines (clear of the grid line through them)
  const colLabel = new Map(doc.columns.map((c) => [c.id, c.label]));
  for (const o of chosen.outlines) {
    const [x] = o.labelAt;
    const below = Math.max(...o.points.map(([, y]) => py(y)));
    text(
      px(x),
      below + 3,
      `${colLabel.get(o.columnId) ?? o.columnId}: ${FOOTING_OPTION_LABELS[o.option]} (chosen)`,
      1.9,
      {
        anchor: 'middle',
        bold: true,
        tone: 'accent',
      },
    );
  }

  // scale bar: five equal parts of a round length in metres, alternately filled
  const barM = scale <= 20 ? 1 : scale <= 100 ? 5 : scale <= 250 ? 10 : 20;
  const part = (barM * k) / 5;
  const sbx = area.x + 6;
  const sby = area.y + area.h - 8;
  for (let i = 0; i < 5; i++)
    out.push({
      kind: 'poly',
      points: [
        [round(sbx + i * part), sby],
        [round(sbx + (i + 1) * part), sby],
        [round(sbx + (i + 1) * part), sby + 1.6],
        [round(sbx + i * part), sby + 1.6],
      ],
      width: 0.2,
      tone: 'ink',
      fill: i % 2 === 0 ? 'ink' : undefined,
      closed: true,
    });
  text(sbx, sby - 1.2, '0', 2, { anchor: 'middle' });
  text(sbx + 5 * part, sby - 1.2, `${barM} m`, 2, { anchor: 'middle' });
  text(sbx + 5 * part + 4, sby + 1.6, `1:${scale} at ${size}`, 2);

  // north point: a slim half-filled arrow in a ring, N above
  const nx = area.x + area.w - 12;
  const ny = area.y + 14;
  out.push({ kind: 'circle', cx: nx, cy: ny, r: 6, width: 0.25, tone: 'ink' });
  out.push({
    kind: 'poly',
    points: [
      [nx, ny - 8],
      [nx + 2.2, ny + 4],
      [nx, ny + 2],
    ],
    width: 0.25,
    tone: 'ink',
    fill: 'ink',
    closed: true,
  });
  out.push({
    kind: 'poly',
    points: [
      [nx, ny - 8],
      [nx - 2.2, ny + 4],
      [nx, ny + 2],
    ],
    width: 0.25,
    tone: 'ink',
    closed: true,
  });
  text(nx, ny - 9.5, 'N', 3, { anchor: 'middle', bold: true });

  titlePanel(out, size, scale, title, text);
  return { size, scale, widthMm: W, heightMm: H, primitives: out };
}

/**
 * Our title panel: a column down the right edge. A tall firm band in the accent tone at the top,
 * then the project and title, a two-by-two block of number / revision / suitability / scale with
 * the number set large, the people, the date and the scheme it came from, and the caution last.
 */
function titlePanel(
  out: Primitive[],
  size: PlanSheetSize,
  scale: number,
  t: TitleFields,
  text: (
    x: number,
    y: number,
    t: string,
    size: number,
    more?: Partial<Extract<Primitive, { kind: 'text' }>>,
  ) => unknown,
) {
  const { w: W, h: H } = SHEET_MM[size];
  const pw = panelWidth(size);
  const x0 = W - MARGIN - pw;
  const x1 = W - MARGIN;
  const pad = 2.5;
  const chars = Math.floor((pw - 2 * pad) / 1.25);
  out.push({ kind: 'line', x1: x0, y1: MARGIN, x2: x0, y2: H - MARGIN, width: 0.5, tone: 'ink' });
  const rule = (y: number) => out.push({ kind: 'line', x1: x0, y1: y, x2: x1, y2: y, width: 0.25, tone: 'muted' });
  let y = MARGIN;
  out.push({
    kind: 'poly',
    points: [
      [x0, y],
      [x1, y],
      [x1, y + 14],
      [x0, y + 14],
    ],
    width: 0,
    tone: 'accent',
    fill: 'accent',
    closed: true,
  });
  text(x0 + pad, y + 9, t.firm.toUpperCase(), 3.2, { bold: true, tone: 'paper' });
  y += 14;
  const field = (label: string, value: string, at: number, width: number, big = false) => {
    text(at + pad, y + 3.5, label, 1.7, { tone: 'muted' });
    const lines = wrap(value || '—', Math.floor((width - 2 * pad) / (big ? 2.2 : 1.45)));
    lines.slice(0, 3).forEach((l, i) => text(at + pad, y + 8 + i * (big ? 5 : 3.4), l, big ? 4 : 2.6, { bold: big }));
    return 8 + (Math.min(lines.length, 3) - 1) * (big ? 5 : 3.4) + 2.5;
  };
  y += field('Project', t.project, x0, pw);
  rule(y);
  y += field('Title', t.title, x0, pw);
  rule(y);
  const half = pw / 2;
  const rowA = Math.max(field('Drawing number', t.drawingNumber, x0, pw, true));
  y += rowA;
  rule(y);
  const rowB = Math.max(field('Revision', t.revision, x0, half), field('Suitability', t.suitability, x0 + half, half));
  out.push({ kind: 'line', x1: x0 + half, y1: y, x2: x0 + half, y2: y + rowB, width: 0.25, tone: 'muted' });
  y += rowB;
  rule(y);
  const rowC = Math.max(field('Scale', `1:${scale} at ${size}`, x0, half), field('Date', t.date, x0 + half, half));
  out.push({ kind: 'line', x1: x0 + half, y1: y, x2: x0 + half, y2: y + rowC, width: 0.25, tone: 'muted' });
  y += rowC;
  rule(y);
  y += field('Drawn', t.drawnBy, x0, pw);
  y += field('Checked', t.checkedBy, x0, pw);
  y += field('Approved', t.approvedBy, x0, pw);
  rule(y);
  y += field('From scheme', `${t.scheme} · engine ${t.engineVersion}`, x0, pw);
  rule(y);
  const caution = wrap(t.caution, chars);
  const cy = H - MARGIN - 3 - caution.length * 2.8;
  text(x0 + pad, cy - 1.5, 'CAUTION', 2, { bold: true, tone: 'accent' });
  caution.forEach((l, i) => text(x0 + pad, cy + 2 + i * 2.8, l, 1.9));
}
