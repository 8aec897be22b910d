import type { SchemeDocument } from '@trabeate/contracts';

// The plan editor's model: pure operations on a scheme document, a bounded undo history and the
// keyboard commands. No Angular here, so every rule is tested directly; the editor component
// (next step) only turns pointer and key events into these calls.

type Column = SchemeDocument['columns'][number];

export interface EditorState {
  readonly doc: SchemeDocument;
  /** ids of the selected columns, in the order chosen */
  readonly selection: readonly string[];
  readonly past: readonly SchemeDocument[];
  readonly future: readonly SchemeDocument[];
}

/** Undo steps kept; older ones are dropped (a long session must not grow without end). */
export const HISTORY_LIMIT = 200;
/** Plan coordinates are kept to the millimetre. */
const mm = (v: number) => Math.round(v * 1000) / 1000;

export const startEditing = (doc: SchemeDocument): EditorState => ({ doc, selection: [], past: [], future: [] });

/** Applies a change as one undo step; a change that alters nothing leaves the history alone. */
function commit(s: EditorState, doc: SchemeDocument, selection = s.selection): EditorState {
  if (doc === s.doc) return { ...s, selection };
  const past = [...s.past, s.doc].slice(-HISTORY_LIMIT);
  return { doc, selection, past, future: [] };
}

export function undo(s: EditorState): EditorState {
  if (!s.past.length) return s;
  const doc = s.past[s.past.length - 1];
  return { doc, selection: keep(doc, s.selection), past: s.past.slice(0, -1), future: [s.doc, ...s.future] };
}

export function redo(s: EditorState): EditorState {
  if (!s.future.length) return s;
  const [doc, ...future] = s.future;
  return { doc, selection: keep(doc, s.selection), past: [...s.past, s.doc], future };
}

const keep = (doc: SchemeDocument, ids: readonly string[]) => ids.filter((id) => doc.columns.some((c) => c.id === id));

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
  if (!extend) return { ...s, selection: [id] };
  return {
    ...s,
    selection: s.selection.includes(id) ? s.selection.filter((x) => x !== id) : [...s.selection, id],
  };
}

/** The next (or previous) column in plan order (by y, then x), from the last one selected. */
export function cycle(s: EditorState, backwards = false): EditorState {
  const order = [...s.doc.columns].sort((a, b) => a.y - b.y || a.x - b.x);
  if (!order.length) return s;
  const at = order.findIndex((c) => c.id === s.selection[s.selection.length - 1]);
  const next = at < 0 ? (backwards ? order.length - 1 : 0) : (at + (backwards ? -1 : 1) + order.length) % order.length;
  return { ...s, selection: [order[next].id] };
}

export interface KeyInput {
  key: string;
  shiftKey?: boolean;
  ctrlKey?: boolean;
  metaKey?: boolean;
}

/**
 * The keyboard: arrows move the selection by `stepM` (ten times with Shift); Delete or Backspace
 * deletes it; Tab and Shift+Tab cycle through the columns; Insert (or "n") adds a column one step
 * east of the last selected; Ctrl/⌘+Z undoes, Ctrl/⌘+Shift+Z or Ctrl+Y redoes; Escape clears the
 * selection. Returns null for a key the editor does not use (the browser keeps it).
 */
export function editorKey(s: EditorState, e: KeyInput, stepM: number): EditorState | null {
  const mod = e.ctrlKey || e.metaKey;
  const step = e.shiftKey ? stepM * 10 : stepM;
  if (mod && e.key.toLowerCase() === 'z') return e.shiftKey ? redo(s) : undo(s);
  if (mod && e.key.toLowerCase() === 'y') return redo(s);
  if (mod) return null;
  switch (e.key) {
    case 'ArrowLeft':
      return moveSelection(s, -step, 0);
    case 'ArrowRight':
      return moveSelection(s, step, 0);
    case 'ArrowUp':
      return moveSelection(s, 0, step); // plan y runs up the screen
    case 'ArrowDown':
      return moveSelection(s, 0, -step);
    case 'Delete':
    case 'Backspace':
      return deleteSelection(s);
    case 'Tab':
      return cycle(s, e.shiftKey);
    case 'Escape':
      return { ...s, selection: [] };
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
