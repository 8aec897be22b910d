import { schemeSchema } from '@trabeate/contracts';
import { demoSchemeVariant } from '@trabeate/structural';
import {
  HISTORY_LIMIT,
  addColumn,
  clearFootingChoice,
  cycle,
  deleteSelection,
  editorKey,
  moveColumnTo,
  moveSelection,
  parseSpacings,
  redo,
  select,
  setBasis,
  setFootingChoice,
  setGridSpacings,
  snap,
  spacingsOf,
  startEditing,
  undo,
  updateColumn,
} from './editor-model';

// The engine's invented demo with column B3 left out: grid A–D at x 0.2, 4.4, 8.6, 12.8 m and
// 1–5 at y 0.2, 4.2, 8.2, 12.2, 16.2 m.
const start = () => startEditing(schemeSchema.parse(demoSchemeVariant()));
const col = (s: ReturnType<typeof start>, id: string) => s.doc.columns.find((c) => c.id === id);

describe('plan editor model', () => {
  it('adds a column at a grid intersection under its grid name, sized like the selected one, and selects it', () => {
    const s = addColumn(select(start(), 'B2'), { x: 4.4, y: 8.2 });
    expect(col(s, 'B3')).toEqual({
      id: 'B3',
      label: 'B3',
      x: 4.4,
      y: 8.2,
      widthMm: 230,
      depthMm: 500,
      orientationDeg: 90,
    });
    expect(s.doc.columns).toHaveLength(20);
    expect(s.selection).toEqual(['B3']);
  });

  it('names a column off the grid with a free id, never reusing one', () => {
    const s = addColumn(addColumn(start(), { x: 2, y: 2 }), { x: 3, y: 3 });
    const ids = s.doc.columns.map((c) => c.id);
    expect(new Set(ids).size).toBe(ids.length);
    expect(ids.slice(-2)).toEqual(['K20', 'K21']);
  });

  it('moves the whole selection by a step and keeps coordinates to the millimetre', () => {
    let s = select(select(start(), 'A1'), 'B1', true);
    s = moveSelection(s, 0.1, 0.2);
    expect([col(s, 'A1')?.x, col(s, 'A1')?.y, col(s, 'B1')?.x]).toEqual([0.3, 0.4, 4.5]);
    expect(col(s, 'C1')?.x).toBe(8.6);
  });

  it('snaps each axis to the nearest grid line or other column within the tolerance, and only then', () => {
    const s = start();
    expect(snap(s.doc, { x: 4.31, y: 7.0 }, { toleranceM: 0.15 })).toEqual({
      x: 4.4,
      y: 7.0,
      snappedX: 'grid B',
      snappedY: null,
    });
    // a column being dragged does not attract itself, but the grid line under it still does
    expect(snap(s.doc, { x: 4.5, y: 4.25 }, { toleranceM: 0.15, exclude: ['B2'] })).toMatchObject({
      x: 4.4,
      y: 4.2,
    });
    s.doc.columns.push({ id: 'X', label: 'X', x: 6.0, y: 6.0, widthMm: 300, depthMm: 300, orientationDeg: 0 });
    expect(snap(s.doc, { x: 6.08, y: 1 }, { toleranceM: 0.1 })).toMatchObject({ x: 6.0, snappedX: 'column X' });
  });

  it('deletes the selection, and undo brings it back with its selection; redo removes it again', () => {
    const before = select(start(), 'C3');
    const deleted = deleteSelection(before);
    expect(col(deleted, 'C3')).toBeUndefined();
    expect(deleted.selection).toEqual([]);
    const back = undo(deleted);
    expect(back.doc).toBe(before.doc);
    const again = redo(back);
    expect(col(again, 'C3')).toBeUndefined();
    expect(redo(again)).toBe(again);
  });

  it('a new change after undo drops the redo steps, and history keeps only the newest steps', () => {
    let s = select(start(), 'A1');
    s = moveSelection(s, 1, 0);
    s = undo(s);
    expect(s.future).toHaveLength(1);
    s = moveSelection(s, 0, 1);
    expect(s.future).toHaveLength(0);
    for (let i = 0; i < HISTORY_LIMIT + 20; i++) s = moveSelection(s, 0.001, 0);
    expect(s.past).toHaveLength(HISTORY_LIMIT);
  });

  it('a drag that ends where it started adds no undo step', () => {
    const s = start();
    expect(moveColumnTo(s, 'A1', { x: 0.2, y: 0.2 })).toBe(s);
    expect(moveColumnTo(s, 'A1', { x: 0.5, y: 0.2 }).past).toHaveLength(1);
  });

  it('works from the keyboard: arrows, Shift for ten steps, Tab cycles, Delete, undo and redo', () => {
    let s = editorKey(start(), { key: 'Tab' }, 0.05)!;
    expect(s.selection).toEqual(['A1']); // plan order: lowest y first, then x
    s = editorKey(s, { key: 'Tab' }, 0.05)!;
    expect(s.selection).toEqual(['B1']);
    expect(cycle(s, true).selection).toEqual(['A1']);
    s = editorKey(s, { key: 'ArrowUp' }, 0.05)!;
    s = editorKey(s, { key: 'ArrowRight', shiftKey: true }, 0.05)!;
    expect([col(s, 'B1')?.x, col(s, 'B1')?.y]).toEqual([4.9, 0.25]);
    s = editorKey(s, { key: 'z', ctrlKey: true }, 0.05)!;
    expect(col(s, 'B1')?.x).toBe(4.4);
    s = editorKey(s, { key: 'Z', ctrlKey: true, shiftKey: true }, 0.05)!;
    expect(col(s, 'B1')?.x).toBe(4.9);
    s = editorKey(s, { key: 'Delete' }, 0.05)!;
    expect(col(s, 'B1')).toBeUndefined();
    expect(editorKey(s, { key: 'q' }, 0.05)).toBeNull();
  });

  it('changes a column by typed coordinates, section and orientation as one undo step each', () => {
    let s = updateColumn(start(), 'C2', { x: 8.1234, y: 4.0 });
    expect([col(s, 'C2')?.x, col(s, 'C2')?.y]).toEqual([8.123, 4.0]);
    s = updateColumn(s, 'C2', { widthMm: 300, depthMm: 600, orientationDeg: 90 });
    expect(col(s, 'C2')).toMatchObject({ widthMm: 300, depthMm: 600, orientationDeg: 90 });
    expect(s.past).toHaveLength(2);
    expect(updateColumn(s, 'C2', { widthMm: 300 })).toBe(s);
    expect(col(undo(s), 'C2')?.depthMm).not.toBe(600);
  });

  it('reads a typed spacing list in metres and says what is wrong with a bad one', () => {
    expect(parseSpacings(' 4.2 4.2  3.6 ')).toEqual({ spacings: [4.2, 4.2, 3.6] });
    expect(parseSpacings('4.2;5')).toEqual({ spacings: [4.2, 5] });
    expect(parseSpacings('')).toMatchObject({ error: expect.stringContaining('at least one') });
    expect(parseSpacings('4,2')).toMatchObject({ error: expect.stringContaining('“4,2”') });
    expect(parseSpacings('4.2 abc')).toMatchObject({ error: expect.stringContaining('“abc”') });
    expect(parseSpacings('0.2')).toMatchObject({ error: expect.stringContaining('0.5–30 m') });
  });

  it('rebuilds one axis of the grid from spacings, lettered or numbered, keeping each line’s settings', () => {
    const s0 = start();
    expect(spacingsOf(s0.doc, 'x')).toEqual([4.2, 4.2, 4.2]);
    const s = setGridSpacings(s0, 'x', [4.2, 4.2, 3.6, 3.0]);
    const xs = s.doc.grid.filter((g) => g.x !== undefined);
    expect(xs.map((g) => [g.label, g.x])).toEqual([
      ['A', 0.2],
      ['B', 4.4],
      ['C', 8.6],
      ['D', 12.2],
      ['E', 15.2],
    ]);
    // the numbered lines are untouched, the overhang set on line 5 included
    expect(s.doc.grid.filter((g) => g.y !== undefined)).toEqual(s0.doc.grid.filter((g) => g.y !== undefined));
    expect(s.past).toHaveLength(1);
    expect(setGridSpacings(s0, 'x', [4.2, 4.2, 4.2])).toBe(s0);
    const fewer = setGridSpacings(s0, 'y', [6]);
    expect(fewer.doc.grid.filter((g) => g.y !== undefined).map((g) => g.label)).toEqual(['1', '2']);
  });

  it('records a footing choice with its trimmed reason, changes it and clears it, each as one undo step', () => {
    const a = start();
    const set = setFootingChoice(a, { columnId: 'A1', option: 'strap', reason: '  Strap keeps A1 where it is.  ' });
    expect(set.doc.footingChoices).toEqual([
      { columnId: 'A1', option: 'strap', reason: 'Strap keeps A1 where it is.' },
    ]);
    expect(set.past).toHaveLength(1);
    // the column is not moved by the record
    expect(set.doc.columns).toBe(a.doc.columns);

    const changed = setFootingChoice(set, { columnId: 'A1', option: 'shift', reason: 'Shift is cheaper here.' });
    expect(changed.doc.footingChoices).toEqual([{ columnId: 'A1', option: 'shift', reason: 'Shift is cheaper here.' }]);
    expect(changed.past).toHaveLength(2);
    // choosing the same again is no step at all
    expect(setFootingChoice(changed, { columnId: 'A1', option: 'shift', reason: 'Shift is cheaper here. ' })).toBe(
      changed,
    );

    const other = setFootingChoice(changed, { columnId: 'D1', option: 'combinedRectangular', reason: 'One pad.' });
    expect(other.doc.footingChoices.map((c) => c.columnId)).toEqual(['A1', 'D1']);

    const cleared = clearFootingChoice(other, 'A1');
    expect(cleared.doc.footingChoices.map((c) => c.columnId)).toEqual(['D1']);
    expect(clearFootingChoice(cleared, 'A1')).toBe(cleared);

    const back = undo(undo(cleared));
    expect(back.doc.footingChoices).toEqual([{ columnId: 'A1', option: 'shift', reason: 'Shift is cheaper here.' }]);
    expect(undo(back).doc.footingChoices).toEqual([
      { columnId: 'A1', option: 'strap', reason: 'Strap keeps A1 where it is.' },
    ]);
    const again = redo(redo(back));
    expect(again.doc).toBe(cleared.doc);
  });

  it('sets the design basis as one undo step, keeps the plan, and takes the same basis again as no step', () => {
    const a = select(start(), 'A1');
    const basis = { ...a.doc.basis, concreteMPa: 35, storeys: 5, rates: { ...a.doc.basis.rates, steelPerKg: 1.2 } };
    const set = setBasis(a, basis);
    expect(set.doc.basis).toEqual(basis);
    expect(set.doc.columns).toBe(a.doc.columns);
    expect(set.selection).toEqual(['A1']);
    expect(set.past).toHaveLength(1);
    // the same values in another key order, with an absent optional field spelled out, change nothing
    const reordered = { ...Object.fromEntries(Object.entries(basis).reverse()), slabThicknessMm: undefined };
    expect(setBasis(set, reordered as typeof basis)).toBe(set);
    const back = undo(set);
    expect(back.doc.basis).toEqual(a.doc.basis);
    expect(redo(back).doc.basis).toEqual(basis);
    // a later edit of the plan drops the redo of the basis, as any edit does
    expect(moveSelection(back, 0.1, 0).future).toEqual([]);
  });
});
