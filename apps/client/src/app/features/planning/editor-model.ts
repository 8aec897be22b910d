import { SCHEME_DOCUMENT_LIMITS, columnSchema, type SchemeDocument } from '@trabeate/contracts';

// The plan editor's model: pure operations on a scheme document, a bounded undo history and the
// keyboard commands. No Angular here, so every rule is tested directly; the editor component
// (next step) only turns pointer and key events into these calls.

type Column = SchemeDocument['columns'][number];
type Pt = { x: number; y: number };

/**
 * A chosen part of the plan that is not a column: a vertex of the plot boundary (by index) or a
 * secondary beam (by id). Columns stay in `selection` (several can be chosen at once); a part is
 * chosen on its own, so choosing one lets go of the columns and the other way round.
 */
export type PlanPart = { kind: 'vertex'; index: number } | { kind: 'secondary'; id: string };

export interface EditorState {
  readonly doc: SchemeDocument;
  /** ids of the selected columns, in the order chosen */
  readonly selection: readonly string[];
  /** the chosen boundary vertex or secondary beam, when no column is chosen */
  readonly part?: PlanPart | null;
  readonly past: readonly SchemeDocument[];
  readonly future: readonly SchemeDocument[];
}

/** Undo steps kept; older ones are dropped (a long session must not grow without end). */
export const HISTORY_LIMIT = 200;
/** Plan coordinates are kept to the millimetre. */
const mm = (v: number) => Math.round(v * 1000) / 1000;

export const startEditing = (doc: SchemeDocument): EditorState => ({
  doc,
  selection: [],
  part: null,
  past: [],
  future: [],
});

/**
 * Applies a change as one undo step; a change that alters nothing leaves the history alone. A new
 * column selection lets go of the chosen part.
 */
function commit(
  s: EditorState,
  doc: SchemeDocument,
  selection = s.selection,
  part: PlanPart | null = selection === s.selection ? (s.part ?? null) : null,
): EditorState {
  if (doc === s.doc) return { ...s, selection, part };
  const past = [...s.past, s.doc].slice(-HISTORY_LIMIT);
  return { doc, selection, part, past, future: [] };
}

export function undo(s: EditorState): EditorState {
  if (!s.past.length) return s;
  const doc = s.past[s.past.length - 1];
  return {
    doc,
    selection: keep(doc, s.selection),
    part: keepPart(doc, s.part),
    past: s.past.slice(0, -1),
    future: [s.doc, ...s.future],
  };
}

export function redo(s: EditorState): EditorState {
  if (!s.future.length) return s;
  const [doc, ...future] = s.future;
  return { doc, selection: keep(doc, s.selection), part: keepPart(doc, s.part), past: [...s.past, s.doc], future };
}

const keep = (doc: SchemeDocument, ids: readonly string[]) => ids.filter((id) => doc.columns.some((c) => c.id === id));
const keepPart = (doc: SchemeDocument, p: PlanPart | null | undefined): PlanPart | null => {
  if (!p) return null;
  if (p.kind === 'vertex') return p.index < doc.boundary.vertices.length ? p : null;
  return doc.secondaryBeams.some((b) => b.id === p.id) ? p : null;
};

export interface SnapOptions {
  /** how far a point may jump to a grid line or another column, m */
  toleranceM: number;
  /** columns that do not attract (the ones being moved) */
  exclude?: readonly string[];
}

/**
 * Snaps each axis on its own to the nearest grid line or other column within the tolerance; an
 * axis with nothing near stays as it is. Returns what it snapped to, for the editor to show.
 */
export function snap(
  doc: SchemeDocument,
  p: { x: number; y: number },
  { toleranceM, exclude = [] }: SnapOptions,
): { x: number; y: number; snappedX: string | null; snappedY: string | null } {
  const others = doc.columns.filter((c) => !exclude.includes(c.id));
  const candidates = (axis: 'x' | 'y') => [
    ...doc.grid.filter((g) => g[axis] !== undefined).map((g) => ({ v: g[axis] as number, what: `grid ${g.label}` })),
    ...others.map((c) => ({ v: c[axis], what: `column ${c.label}` })),
  ];
  const nearest = (axis: 'x' | 'y') => {
    let best: { v: number; what: string } | null = null;
    for (const c of candidates(axis)) {
      const d = Math.abs(c.v - p[axis]);
      if (d <= toleranceM && (!best || d < Math.abs(best.v - p[axis]))) best = c;
    }
    return best;
  };
  const nx = nearest('x');
  const ny = nearest('y');
  return { x: mm(nx?.v ?? p.x), y: mm(ny?.v ?? p.y), snappedX: nx?.what ?? null, snappedY: ny?.what ?? null };
}

/** The label of the grid intersection at a point (letters then numbers, as the grid is labelled), or null. */
function intersectionLabel(doc: SchemeDocument, p: { x: number; y: number }): string | null {
  const gx = doc.grid.find((g) => g.x !== undefined && Math.abs((g.x as number) - p.x) < 0.001);
  const gy = doc.grid.find((g) => g.y !== undefined && Math.abs((g.y as number) - p.y) < 0.001);
  return gx && gy ? `${gx.label}${gy.label}` : null;
}

function freeId(doc: SchemeDocument, wanted: string | null): string {
  const used = new Set(doc.columns.map((c) => c.id));
  if (wanted && !used.has(wanted)) return wanted;
  for (let n = doc.columns.length + 1; ; n++) if (!used.has(`K${n}`)) return `K${n}`;
}

/**
 * Adds a column at a point, sized like the selected (or last) column, named after its grid
 * intersection when it stands on one; the new column becomes the selection.
 */
export function addColumn(s: EditorState, at: { x: number; y: number }): EditorState {
  const like: Column | undefined =
    s.doc.columns.find((c) => c.id === s.selection[s.selection.length - 1]) ?? s.doc.columns[s.doc.columns.length - 1];
  const p = { x: mm(at.x), y: mm(at.y) };
  const id = freeId(s.doc, intersectionLabel(s.doc, p));
  const column: Column = {
    id,
    label: id,
    ...p,
    widthMm: like?.widthMm ?? 300,
    depthMm: like?.depthMm ?? 300,
    orientationDeg: like?.orientationDeg ?? 0,
  };
  return commit(s, { ...s.doc, columns: [...s.doc.columns, column] }, [id]);
}

/** Moves the selected columns by (dx, dy) m as one undo step. */
export function moveSelection(s: EditorState, dx: number, dy: number): EditorState {
  if (!s.selection.length || (dx === 0 && dy === 0)) return s;
  const chosen = new Set(s.selection);
  const columns = s.doc.columns.map((c) => (chosen.has(c.id) ? { ...c, x: mm(c.x + dx), y: mm(c.y + dy) } : c));
  return commit(s, { ...s.doc, columns });
}

/** Moves one column to a point (the end of a drag, already snapped) as one undo step. */
export function moveColumnTo(s: EditorState, id: string, p: { x: number; y: number }): EditorState {
  const c = s.doc.columns.find((x) => x.id === id);
  if (!c || (c.x === mm(p.x) && c.y === mm(p.y))) return s;
  return commit(s, {
    ...s.doc,
    columns: s.doc.columns.map((x) => (x.id === id ? { ...x, x: mm(p.x), y: mm(p.y) } : x)),
  });
}

export function deleteSelection(s: EditorState): EditorState {
  if (!s.selection.length) return s;
  const gone = new Set(s.selection);
  return commit(s, { ...s.doc, columns: s.doc.columns.filter((c) => !gone.has(c.id)) }, []);
}

/** Selects one column, or adds it to / removes it from the selection (`extend`, as with Shift). */
export function select(s: EditorState, id: string, extend = false): EditorState {
  if (!s.doc.columns.some((c) => c.id === id)) return s;
  if (!extend) return { ...s, selection: [id], part: null };
  return {
    ...s,
    part: null,
    selection: s.selection.includes(id) ? s.selection.filter((x) => x !== id) : [...s.selection, id],
  };
}

type Chosen = { kind: 'column'; id: string } | PlanPart;

/**
 * Everything the keyboard can reach, in the order Tab goes: the columns in plan order (by y, then
 * x), then the boundary corners in their order, then the secondary beams as the scheme lists them.
 */
function tabOrder(doc: SchemeDocument): Chosen[] {
  return [
    ...[...doc.columns].sort((a, b) => a.y - b.y || a.x - b.x).map((c): Chosen => ({ kind: 'column', id: c.id })),
    ...doc.boundary.vertices.map((_, index): Chosen => ({ kind: 'vertex', index })),
    ...doc.secondaryBeams.map((b): Chosen => ({ kind: 'secondary', id: b.id })),
  ];
}

const sameChosen = (a: Chosen, b: Chosen | null) =>
  !!b && a.kind === b.kind && (a.kind === 'vertex' ? a.index === (b as typeof a).index : a.id === (b as typeof a).id);

function current(s: EditorState): Chosen | null {
  if (s.part) return s.part;
  const id = s.selection[s.selection.length - 1];
  return id === undefined ? null : { kind: 'column', id };
}

function choose(s: EditorState, c: Chosen): EditorState {
  return c.kind === 'column' ? { ...s, selection: [c.id], part: null } : { ...s, selection: [], part: c };
}

/** Whether anything (a column or another part) is chosen. */
export const hasChoice = (s: EditorState): boolean => s.selection.length > 0 || !!s.part;

/**
 * The next (or previous) element in Tab order from the one chosen last, wrapping round; with
 * nothing chosen, the first (or last).
 */
export function cycle(s: EditorState, backwards = false): EditorState {
  const order = tabOrder(s.doc);
  if (!order.length) return s;
  const now = current(s);
  const at = order.findIndex((c) => sameChosen(c, now));
  const next = at < 0 ? (backwards ? order.length - 1 : 0) : (at + (backwards ? -1 : 1) + order.length) % order.length;
  return choose(s, order[next]);
}

/**
 * Tab: like cycle, but past the last element (or before the first, with Shift) it lets go of
 * everything, so the page can let the focus leave the plan instead of trapping it.
 */
function tab(s: EditorState, backwards: boolean): EditorState {
  const order = tabOrder(s.doc);
  const now = current(s);
  const at = order.findIndex((c) => sameChosen(c, now));
  if (at >= 0 && (backwards ? at === 0 : at === order.length - 1)) return { ...s, selection: [], part: null };
  return cycle(s, backwards);
}

/** Moves what is chosen by (dx, dy) m: the columns, a boundary corner or a secondary beam. */
function moveChosen(s: EditorState, dx: number, dy: number): EditorState {
  if (!hasChoice(s)) return cycle(s, dx < 0 || dy > 0); // nothing chosen: an arrow chooses first
  const p = s.part;
  if (p?.kind === 'vertex') {
    const v = s.doc.boundary.vertices[p.index];
    return v ? moveVertex(s, p.index, { x: v.x + dx, y: v.y + dy }) : s;
  }
  if (p?.kind === 'secondary') return moveSecondary(s, p.id, dx, dy);
  return moveSelection(s, dx, dy);
}

/** Deletes what is chosen: the selected columns, a boundary corner (while more than three remain) or a secondary beam. */
export function deleteChosen(s: EditorState): EditorState {
  const p = s.part;
  if (p?.kind === 'vertex') return deleteVertex(s, p.index);
  if (p?.kind === 'secondary') return deleteSecondaryBeam(s, p.id);
  return deleteSelection(s);
}

export interface KeyInput {
  key: string;
  shiftKey?: boolean;
  ctrlKey?: boolean;
  metaKey?: boolean;
}

/**
 * The keyboard: arrows move what is chosen (columns, a boundary corner or a secondary beam) by
 * `stepM` (ten times with Shift), and with nothing chosen choose the first element (Right, Down)
 * or the last (Left, Up); Delete or Backspace deletes what is chosen (a corner only while three
 * remain); Tab and Shift+Tab go through the columns, then the boundary corners, then the secondary
 * beams, and past the end let go of everything; Insert (or "n") adds a column one step east of the
 * last selected; Ctrl/⌘+Z undoes, Ctrl/⌘+Shift+Z or Ctrl+Y redoes; Escape lets go. Returns null
 * for a key the editor does not use (the browser keeps it).
 */
export function editorKey(s: EditorState, e: KeyInput, stepM: number): EditorState | null {
  const mod = e.ctrlKey || e.metaKey;
  const step = e.shiftKey ? stepM * 10 : stepM;
  if (mod && e.key.toLowerCase() === 'z') return e.shiftKey ? redo(s) : undo(s);
  if (mod && e.key.toLowerCase() === 'y') return redo(s);
  if (mod) return null;
  switch (e.key) {
    case 'ArrowLeft':
      return moveChosen(s, -step, 0);
    case 'ArrowRight':
      return moveChosen(s, step, 0);
    case 'ArrowUp':
      return moveChosen(s, 0, step); // plan y runs up the screen
    case 'ArrowDown':
      return moveChosen(s, 0, -step);
    case 'Delete':
    case 'Backspace':
      return deleteChosen(s);
    case 'Tab':
      return tab(s, !!e.shiftKey);
    case 'Escape':
      return { ...s, selection: [], part: null };
    case 'Insert':
    case 'n': {
      const from = s.doc.columns.find((c) => c.id === s.selection[s.selection.length - 1]);
      return addColumn(s, from ? { x: from.x + step, y: from.y } : { x: 0, y: 0 });
    }
    default:
      return null;
  }
}

/** The parts of a column the inspector may change by typing. */
export type ColumnPatch = Partial<Pick<Column, 'x' | 'y' | 'widthMm' | 'depthMm' | 'orientationDeg'>>;

/** Changes one column's position, section or orientation as one undo step. */
export function updateColumn(s: EditorState, id: string, patch: ColumnPatch): EditorState {
  const c = s.doc.columns.find((x) => x.id === id);
  if (!c) return s;
  const next: Column = {
    ...c,
    ...patch,
    ...(patch.x !== undefined ? { x: mm(patch.x) } : {}),
    ...(patch.y !== undefined ? { y: mm(patch.y) } : {}),
  };
  const same = (Object.keys(next) as (keyof Column)[]).every((k) => next[k] === c[k]);
  if (same) return s;
  return commit(s, { ...s.doc, columns: s.doc.columns.map((x) => (x.id === id ? next : x)) });
}

/**
 * Reads a spacing list as typed, e.g. `4.2 4.2 3.6` (spaces or semicolons between). A comma is
 * refused rather than guessed at: `4,2` could be one spacing or two. Each spacing must lie
 * between 0.5 m and 30 m.
 */
export function parseSpacings(text: string): { spacings: number[] } | { error: string } {
  const parts = text
    .trim()
    .split(/[\s;]+/)
    .filter(Boolean);
  if (!parts.length) return { error: 'Type at least one spacing in metres, e.g. 4.2 4.2 3.6.' };
  const spacings: number[] = [];
  for (const p of parts) {
    const v = Number(p);
    if (!/^\d+(\.\d+)?$/.test(p) || !Number.isFinite(v))
      return { error: `“${p}” is not a number of metres (use a point for decimals).` };
    if (v < 0.5 || v > 30) return { error: `${p} m is outside 0.5–30 m.` };
    spacings.push(v);
  }
  return { spacings };
}

/** A typed number between `min` and `max` (inclusive), or null for anything else (blank included). */
export function typedNumber(text: string, min: number, max: number): number | null {
  const v = Number(text);
  return text.trim() === '' || !Number.isFinite(v) || v < min || v > max ? null : v;
}

/** The contract's plan coordinate bound (m) and section sides (mm): what a typed value must meet. */
export const PLAN_COORD_M = SCHEME_DOCUMENT_LIMITS.coordM;
export const SECTION_MM = {
  min: columnSchema.shape.widthMm.minValue ?? 0,
  max: columnSchema.shape.widthMm.maxValue ?? 0,
};

/** A typed plan coordinate in metres, within the contract's plan limits, or null. */
export const typedCoordinate = (text: string): number | null => typedNumber(text, -PLAN_COORD_M, PLAN_COORD_M);

/** The spacings between consecutive grid lines on one axis, in plan order. */
export function spacingsOf(doc: SchemeDocument, axis: 'x' | 'y'): number[] {
  const at = doc.grid
    .filter((g) => g[axis] !== undefined)
    .map((g) => g[axis] as number)
    .sort((a, b) => a - b);
  return at.slice(1).map((v, i) => mm(v - at[i]));
}

const letters = (i: number): string =>
  i < 26 ? String.fromCharCode(65 + i) : letters(Math.floor(i / 26) - 1) + String.fromCharCode(65 + (i % 26));

/**
 * Rebuilds the grid lines of one axis from spacings, from the first line's position (0 when
 * there is none). Lines at x are lettered A, B, …; lines at y numbered 1, 2, …, as the trade
 * labels grids. Each kept line keeps its own settings (overhangs, walls, beam sizes). Columns
 * stay where they are: moving them is the engineer's decision.
 */
export function setGridSpacings(s: EditorState, axis: 'x' | 'y', spacings: readonly number[]): EditorState {
  const old = s.doc.grid.filter((g) => g[axis] !== undefined).sort((a, b) => (a[axis] as number) - (b[axis] as number));
  const other = s.doc.grid.filter((g) => g[axis] === undefined);
  const origin = old.length ? (old[0][axis] as number) : 0;
  const positions = [origin];
  for (const d of spacings) positions.push(mm(positions[positions.length - 1] + d));
  const otherIds = new Set(other.map((g) => g.id));
  const lines = positions.map((v, i) => {
    const label = axis === 'x' ? letters(i) : String(i + 1);
    const { x: _x, y: _y, ...keep } = old[i] ?? { id: label, label };
    const id = old[i]?.id ?? (otherIds.has(label) ? `${axis}-${label}` : label);
    return { ...keep, id, label, [axis]: v };
  });
  const before = spacingsOf(s.doc, axis);
  if (before.length === spacings.length && before.every((d, i) => d === mm(spacings[i])) && old.length) return s;
  const grid = axis === 'x' ? [...lines, ...other] : [...other, ...lines];
  return commit(s, { ...s.doc, grid });
}

export type FootingChoice = SchemeDocument['footingChoices'][number];

/**
 * Records (or changes) the footing option chosen for one column, with its reason, as one undo
 * step. The reason is kept as typed, trimmed; the column stays where it is whatever the option
 * (moving a column inward is an edit of its own).
 */
export function setFootingChoice(s: EditorState, choice: FootingChoice): EditorState {
  const next: FootingChoice = { columnId: choice.columnId, option: choice.option, reason: choice.reason.trim() };
  const list = s.doc.footingChoices ?? [];
  const old = list.find((c) => c.columnId === next.columnId);
  if (old && old.option === next.option && old.reason === next.reason) return s;
  const footingChoices = old ? list.map((c) => (c.columnId === next.columnId ? next : c)) : [...list, next];
  return commit(s, { ...s.doc, footingChoices });
}

/** Removes the recorded footing choice of a column as one undo step (nothing to remove: no step). */
export function clearFootingChoice(s: EditorState, columnId: string): EditorState {
  const list = s.doc.footingChoices ?? [];
  if (!list.some((c) => c.columnId === columnId)) return s;
  return commit(s, { ...s.doc, footingChoices: list.filter((c) => c.columnId !== columnId) });
}

// The plot boundary. Property lines are kept as segment indices (segment k runs from vertex k to
// vertex k + 1, the last one closing the outline back to vertex 0), so every change of the
// vertices renumbers them to keep each mark on the same piece of the outline.

/** A boundary keeps at least three vertices: fewer is no outline at all. */
export const MIN_BOUNDARY_VERTICES = 3;

/** Chooses a boundary vertex (letting go of any columns). */
export function selectVertex(s: EditorState, index: number): EditorState {
  if (index < 0 || index >= s.doc.boundary.vertices.length) return s;
  return { ...s, selection: [], part: { kind: 'vertex', index } };
}

/** Moves boundary vertex `index` to a point (plan m, already snapped) as one undo step. */
export function moveVertex(s: EditorState, index: number, p: Pt): EditorState {
  const vs = s.doc.boundary.vertices;
  const v = vs[index];
  if (!v || (v.x === mm(p.x) && v.y === mm(p.y))) return s;
  const vertices = vs.map((w, i) => (i === index ? { x: mm(p.x), y: mm(p.y) } : w));
  return commit(s, { ...s.doc, boundary: { ...s.doc.boundary, vertices } }, [], { kind: 'vertex', index });
}

/**
 * Adds a vertex on segment `segment` (at its middle unless a point is given) and chooses it. The
 * two halves of a property line are both property lines; later segments move up by one.
 */
export function insertVertex(s: EditorState, segment: number, at?: Pt): EditorState {
  const { vertices: vs, propertyLines } = s.doc.boundary;
  const n = vs.length;
  if (segment < 0 || segment >= n) return s;
  const a = vs[segment];
  const b = vs[(segment + 1) % n];
  const p = at ?? { x: (a.x + b.x) / 2, y: (a.y + b.y) / 2 };
  const vertices = [...vs.slice(0, segment + 1), { x: mm(p.x), y: mm(p.y) }, ...vs.slice(segment + 1)];
  const lines = propertyLines.flatMap((k) => (k < segment ? [k] : k === segment ? [k, k + 1] : [k + 1]));
  return commit(s, { ...s.doc, boundary: { vertices, propertyLines: lines } }, [], {
    kind: 'vertex',
    index: segment + 1,
  });
}

/**
 * Removes boundary vertex `index` (never below three vertices). Its two segments become one, which
 * is a property line when either of them was: a mark is taken off by the engineer, never silently
 * (a lost property line would hide the footing checks at that boundary).
 */
export function deleteVertex(s: EditorState, index: number): EditorState {
  const { vertices: vs, propertyLines } = s.doc.boundary;
  const n = vs.length;
  if (n <= MIN_BOUNDARY_VERTICES || index < 0 || index >= n) return s;
  const vertices = vs.filter((_, i) => i !== index);
  const before = (index - 1 + n) % n; // the segment ending at the vertex
  const marked = new Set(propertyLines);
  // old segment k (k ≠ index) becomes k - 1 past the removed vertex; `before` carries the merged one
  const renumber = (k: number) => (k > index ? k - 1 : k);
  const lines = new Set<number>();
  for (const k of marked) if (k !== index && k !== before) lines.add(renumber(k));
  if (marked.has(index) || marked.has(before)) lines.add(renumber(before));
  return commit(s, { ...s.doc, boundary: { vertices, propertyLines: [...lines].sort((p, q) => p - q) } }, [], null);
}

/** Marks segment `segment` as a property line, or takes the mark off, as one undo step. */
export function togglePropertyLine(s: EditorState, segment: number): EditorState {
  const { vertices, propertyLines } = s.doc.boundary;
  if (segment < 0 || segment >= vertices.length) return s;
  const lines = propertyLines.includes(segment)
    ? propertyLines.filter((k) => k !== segment)
    : [...propertyLines, segment].sort((p, q) => p - q);
  return commit(s, { ...s.doc, boundary: { vertices, propertyLines: lines } });
}

// Secondary beams: beams that frame into other beams. The engine takes only beams parallel to x
// or to y, longer than 0.1 m (libs/structural validateScheme), so the editor makes each one so.

type SecondaryBeam = SchemeDocument['secondaryBeams'][number];
/** the engine's shortest secondary beam, m (libs/structural validate.ts) */
export const SECONDARY_MIN_M = 0.1;

/** Chooses a secondary beam (letting go of any columns). */
export function selectSecondary(s: EditorState, id: string): EditorState {
  if (!s.doc.secondaryBeams.some((b) => b.id === id)) return s;
  return { ...s, selection: [], part: { kind: 'secondary', id } };
}

/** Why a beam between two points cannot be a secondary beam, or null when it can. */
export function secondaryProblem(a: Pt, b: Pt): string | null {
  if (Math.hypot(b.x - a.x, b.y - a.y) < SECONDARY_MIN_M) return 'A secondary beam is longer than 0.1 m.';
  return null;
}

/** Straightens a beam to run along x or y, whichever it runs more along; the start stays put. */
export function straighten(a: Pt, b: Pt): { start: Pt; end: Pt } {
  const start = { x: mm(a.x), y: mm(a.y) };
  const end = Math.abs(b.x - a.x) >= Math.abs(b.y - a.y) ? { x: mm(b.x), y: start.y } : { x: start.x, y: mm(b.y) };
  return { start, end };
}

/**
 * Adds a secondary beam from `a` to `b` (plan m): each end snapped like a column (to grid lines and
 * columns within the tolerance), then straightened along x or y. A beam too short to be one adds
 * nothing. The new beam is chosen.
 */
export function addSecondaryBeam(s: EditorState, a: Pt, b: Pt, toleranceM: number): EditorState {
  const sa = snap(s.doc, a, { toleranceM });
  const sb = snap(s.doc, b, { toleranceM });
  const { start, end } = straighten(sa, sb);
  if (secondaryProblem(start, end)) return s;
  const used = new Set(s.doc.secondaryBeams.map((x) => x.id));
  let n = s.doc.secondaryBeams.length + 1;
  while (used.has(`SB${n}`)) n++;
  const beam: SecondaryBeam = { id: `SB${n}`, start, end };
  return commit(s, { ...s.doc, secondaryBeams: [...s.doc.secondaryBeams, beam] }, [], {
    kind: 'secondary',
    id: beam.id,
  });
}

/**
 * Sets a secondary beam's ends to typed coordinates as one undo step. Typed values are the
 * engineer's own: they are kept to the millimetre but not snapped or straightened (the engine
 * names a slanted beam as an input problem).
 */
export function updateSecondaryBeam(s: EditorState, id: string, ends: { start?: Pt; end?: Pt }): EditorState {
  const old = s.doc.secondaryBeams.find((b) => b.id === id);
  if (!old) return s;
  const start = ends.start ? { x: mm(ends.start.x), y: mm(ends.start.y) } : old.start;
  const end = ends.end ? { x: mm(ends.end.x), y: mm(ends.end.y) } : old.end;
  if (start.x === old.start.x && start.y === old.start.y && end.x === old.end.x && end.y === old.end.y) return s;
  const secondaryBeams = s.doc.secondaryBeams.map((b) => (b.id === id ? { ...b, start, end } : b));
  return commit(s, { ...s.doc, secondaryBeams }, [], { kind: 'secondary', id });
}

/** Moves a whole secondary beam by (dx, dy) m as one undo step. */
export function moveSecondary(s: EditorState, id: string, dx: number, dy: number): EditorState {
  const b = s.doc.secondaryBeams.find((x) => x.id === id);
  if (!b || (dx === 0 && dy === 0)) return s;
  const shift = (p: Pt) => ({ x: p.x + dx, y: p.y + dy });
  return updateSecondaryBeam(s, id, { start: shift(b.start), end: shift(b.end) });
}

export function deleteSecondaryBeam(s: EditorState, id: string): EditorState {
  if (!s.doc.secondaryBeams.some((b) => b.id === id)) return s;
  return commit(s, { ...s.doc, secondaryBeams: s.doc.secondaryBeams.filter((b) => b.id !== id) }, [], null);
}

// Stair flights: geometry only (riser, tread, number of risers, width, use); the engine checks
// each against the code family's limits.

type StairFlight = SchemeDocument['stairs'][number];

/** Adds a flight under a free id (ST1, ST2, …) as one undo step. */
export function addStair(s: EditorState, flight: Omit<StairFlight, 'id'>): EditorState {
  const used = new Set(s.doc.stairs.map((f) => f.id));
  let n = s.doc.stairs.length + 1;
  while (used.has(`ST${n}`)) n++;
  return commit(s, { ...s.doc, stairs: [...s.doc.stairs, { id: `ST${n}`, ...flight }] });
}

/** Changes one flight's geometry or use as one undo step (nothing changed: no step). */
export function updateStair(s: EditorState, id: string, patch: Partial<Omit<StairFlight, 'id'>>): EditorState {
  const old = s.doc.stairs.find((f) => f.id === id);
  if (!old) return s;
  const next: StairFlight = { ...old, ...patch, id };
  if ((Object.keys(next) as (keyof StairFlight)[]).every((k) => next[k] === old[k])) return s;
  return commit(s, { ...s.doc, stairs: s.doc.stairs.map((f) => (f.id === id ? next : f)) });
}

export function deleteStair(s: EditorState, id: string): EditorState {
  if (!s.doc.stairs.some((f) => f.id === id)) return s;
  return commit(s, { ...s.doc, stairs: s.doc.stairs.filter((f) => f.id !== id) });
}

export type DesignBasis = SchemeDocument['basis'];

/** Key order does not matter; absent and undefined optional fields are the same. */
const sameBasis = (a: DesignBasis, b: DesignBasis): boolean => {
  const norm = (v: unknown): unknown =>
    v && typeof v === 'object' && !Array.isArray(v)
      ? Object.fromEntries(
          Object.entries(v)
            .filter(([, x]) => x !== undefined)
            .sort(([p], [q]) => p.localeCompare(q))
            .map(([k, x]) => [k, norm(x)]),
        )
      : v;
  return JSON.stringify(norm(a)) === JSON.stringify(norm(b));
};

/**
 * Replaces the scheme's design basis (code family, materials, loads, soil, storeys, unit rates) as
 * one undo step; the same basis again is no step. Checked against the contract by the caller
 * (the basis panel) before it gets here; the engine re-runs on the new document like any edit.
 */
export function setBasis(s: EditorState, basis: DesignBasis): EditorState {
  if (sameBasis(s.doc.basis, basis)) return s;
  return commit(s, { ...s.doc, basis });
}
