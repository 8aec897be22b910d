import { schemeSchema } from '@trabeate/contracts';
import { demoSchemeVariant } from '@trabeate/structural';
import {
  HISTORY_LIMIT,
  PLAN_COORD_M,
  SECTION_MM,
  typedCoordinate,
  typedNumber,
  addColumn,
  clearFootingChoice,
  cycle,
  deleteSelection,
  deleteVertex,
  insertVertex,
  moveVertex,
  selectVertex,
  togglePropertyLine,
  addSecondaryBeam,
  deleteSecondaryBeam,
  moveSecondary,
  selectSecondary,
  updateSecondaryBeam,
  addStair,
  deleteStair,
  updateStair,
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

  describe('plot boundary', () => {
    // The demo plot: corners (0,0) (14.5,0) (14.5,18) (0,18); property lines on side 0 (south,
    // corner 1 to 2) and side 3 (west, corner 4 back to 1).
    const sides = (s: ReturnType<typeof start>) => {
      const { vertices: v, propertyLines } = s.doc.boundary;
      return propertyLines.map((k) => [v[k], v[(k + 1) % v.length]]);
    };

    it('moves a corner to a point as one undo step, keeping it chosen and to the millimetre', () => {
      const s = moveVertex(selectVertex(start(), 2), 2, { x: 15.00049, y: 18.2 });
      expect(s.doc.boundary.vertices[2]).toEqual({ x: 15, y: 18.2 });
      expect(s.part).toEqual({ kind: 'vertex', index: 2 });
      expect(s.past).toHaveLength(1);
      expect(undo(s).doc.boundary.vertices[2]).toEqual({ x: 14.5, y: 18 });
      expect(moveVertex(s, 2, { x: 15, y: 18.2 })).toBe(s);
    });

    it('choosing a corner lets go of the chosen columns, and choosing a column lets go of the corner', () => {
      const s = selectVertex(select(start(), 'A1'), 1);
      expect([s.selection, s.part]).toEqual([[], { kind: 'vertex', index: 1 }]);
      expect(select(s, 'A1').part).toBeNull();
    });

    it('adds a corner in the middle of a side; both halves of a property line stay property lines and later marks move up', () => {
      const s = insertVertex(start(), 0);
      expect(s.doc.boundary.vertices).toEqual([
        { x: 0, y: 0 },
        { x: 7.25, y: 0 },
        { x: 14.5, y: 0 },
        { x: 14.5, y: 18 },
        { x: 0, y: 18 },
      ]);
      expect(s.doc.boundary.propertyLines).toEqual([0, 1, 4]);
      // the same pieces of the outline are marked as before: the south side and the west side
      expect(sides(s)).toEqual([
        [
          { x: 0, y: 0 },
          { x: 7.25, y: 0 },
        ],
        [
          { x: 7.25, y: 0 },
          { x: 14.5, y: 0 },
        ],
        [
          { x: 0, y: 18 },
          { x: 0, y: 0 },
        ],
      ]);
      expect(s.part).toEqual({ kind: 'vertex', index: 1 });
      // on the closing side the new corner goes last, and the closing side's mark splits too
      const closing = insertVertex(start(), 3);
      expect(closing.doc.boundary.vertices[4]).toEqual({ x: 0, y: 9 });
      expect(closing.doc.boundary.propertyLines).toEqual([0, 3, 4]);
    });

    it('deletes a corner, joining its two sides, and keeps every mark on the same piece of the outline', () => {
      // corner 3 (14.5, 18) joins the east and north sides, neither a property line
      const s = deleteVertex(start(), 2);
      expect(s.doc.boundary.vertices).toHaveLength(3);
      expect(sides(s)).toEqual([
        [
          { x: 0, y: 0 },
          { x: 14.5, y: 0 },
        ],
        [
          { x: 0, y: 18 },
          { x: 0, y: 0 },
        ],
      ]);
      expect(s.doc.boundary.propertyLines).toEqual([0, 2]);
      // never below three corners
      expect(deleteVertex(s, 0)).toBe(s);
      // after an added corner, deleting it again gives back the outline and its marks
      const back = deleteVertex(insertVertex(start(), 1), 2);
      expect(back.doc.boundary).toEqual(start().doc.boundary);
    });

    it('deleting the first corner joins the closing side to the first; a joined side stays a property line if either half was', () => {
      const s = deleteVertex(insertVertex(start(), 1), 0);
      // corners now (14.5,0) (14.5,9) (14.5,18) (0,18); the joined side (0,18)→(14.5,0) joins two property lines
      expect(s.doc.boundary.vertices[0]).toEqual({ x: 14.5, y: 0 });
      expect(s.doc.boundary.propertyLines).toEqual([3]);
      expect(sides(s)).toEqual([
        [
          { x: 0, y: 18 },
          { x: 14.5, y: 0 },
        ],
      ]);
      // corner 2 joins the south side (a property line) and the east side (not): the joined side stays marked
      expect(deleteVertex(start(), 1).doc.boundary.propertyLines).toEqual([0, 2]);
      // every result is still a boundary the contract accepts
      expect(() => schemeSchema.parse(s.doc)).not.toThrow();
    });

    it('marks and unmarks a side as a property line, each as one undo step', () => {
      const on = togglePropertyLine(start(), 1);
      expect(on.doc.boundary.propertyLines).toEqual([0, 1, 3]);
      const off = togglePropertyLine(on, 0);
      expect(off.doc.boundary.propertyLines).toEqual([1, 3]);
      expect(off.past).toHaveLength(2);
      expect(undo(off).doc.boundary.propertyLines).toEqual([0, 1, 3]);
      expect(togglePropertyLine(off, 9)).toBe(off);
    });

    it('undo of an added corner lets go of the corner that is gone', () => {
      const s = insertVertex(start(), 3);
      expect(s.part).toEqual({ kind: 'vertex', index: 4 });
      expect(undo(s).part).toBeNull();
    });
  });

  describe('secondary beams', () => {
    // the demo has SB1 from (4.4, 6.2) to (8.6, 6.2), between grid lines B and C
    const sb = (s: ReturnType<typeof start>, id: string) => s.doc.secondaryBeams.find((b) => b.id === id);

    it('adds a beam between two pressed points, each end snapped like a column and the beam straightened along x or y', () => {
      // ends near grid C (8.6) and grid D (12.8), the second a little off the first's y
      const s = addSecondaryBeam(start(), { x: 8.55, y: 10.3 }, { x: 12.74, y: 10.41 }, 0.1);
      expect(sb(s, 'SB2')).toEqual({ id: 'SB2', start: { x: 8.6, y: 10.3 }, end: { x: 12.8, y: 10.3 } });
      expect(s.part).toEqual({ kind: 'secondary', id: 'SB2' });
      expect(s.past).toHaveLength(1);
      // mostly along y: it runs along y from the first end
      const v = addSecondaryBeam(start(), { x: 2.0, y: 0.25 }, { x: 2.3, y: 4.15 }, 0.1);
      expect(sb(v, 'SB2')).toEqual({ id: 'SB2', start: { x: 2.0, y: 0.2 }, end: { x: 2.0, y: 4.2 } });
      // two presses on one spot are no beam
      const same = start();
      expect(addSecondaryBeam(same, { x: 3, y: 3 }, { x: 3.05, y: 3.02 }, 0)).toBe(same);
      // the result is a document the contract accepts
      expect(() => schemeSchema.parse(s.doc)).not.toThrow();
    });

    it('never reuses an id', () => {
      let s = addSecondaryBeam(start(), { x: 0.2, y: 2 }, { x: 4.4, y: 2 }, 0);
      s = deleteSecondaryBeam(s, 'SB1');
      s = addSecondaryBeam(s, { x: 0.2, y: 3 }, { x: 4.4, y: 3 }, 0);
      expect(s.doc.secondaryBeams.map((b) => b.id)).toEqual(['SB2', 'SB3']);
    });

    it('changes the ends by typed coordinates, moves the whole beam and deletes it, each as one undo step', () => {
      let s = selectSecondary(start(), 'SB1');
      s = updateSecondaryBeam(s, 'SB1', { end: { x: 7.00049, y: 6.2 } });
      expect(sb(s, 'SB1')?.end).toEqual({ x: 7, y: 6.2 });
      expect(updateSecondaryBeam(s, 'SB1', { end: { x: 7, y: 6.2 } })).toBe(s);
      s = moveSecondary(s, 'SB1', 0, 0.5);
      expect(sb(s, 'SB1')).toMatchObject({ start: { x: 4.4, y: 6.7 }, end: { x: 7, y: 6.7 } });
      s = deleteSecondaryBeam(s, 'SB1');
      expect(s.doc.secondaryBeams).toEqual([]);
      expect(s.part).toBeNull();
      expect(s.past).toHaveLength(3);
      const back = undo(undo(s));
      expect(sb(back, 'SB1')?.end).toEqual({ x: 7, y: 6.2 });
    });
  });

  describe('keyboard over every part of the plan', () => {
    const key = (s: ReturnType<typeof start>, k: string, shiftKey = false) => editorKey(s, { key: k, shiftKey }, 0.05)!;

    it('Tab goes through the columns, then the boundary corners, then the secondary beams, and past the last lets go', () => {
      let s = start();
      const seen: string[] = [];
      for (let i = 0; i < 19 + 4 + 1; i++) {
        s = key(s, 'Tab');
        seen.push(s.part ? (s.part.kind === 'vertex' ? `corner ${s.part.index}` : s.part.id) : s.selection.join());
      }
      expect(seen.slice(0, 2)).toEqual(['A1', 'B1']);
      expect(seen.slice(18)).toEqual(['D5', 'corner 0', 'corner 1', 'corner 2', 'corner 3', 'SB1']);
      const out = key(s, 'Tab');
      expect([out.selection, out.part]).toEqual([[], null]);
      // Shift+Tab from nothing comes in at the last, and before the first lets go
      expect(key(start(), 'Tab', true).part).toEqual({ kind: 'secondary', id: 'SB1' });
      const first = key(start(), 'Tab');
      expect(key(first, 'Tab', true).selection).toEqual([]);
    });

    it('with nothing chosen an arrow chooses the first element (right, down) or the last (left, up), moving nothing', () => {
      const s = start();
      const right = key(s, 'ArrowRight');
      expect(right.selection).toEqual(['A1']);
      expect(right.doc).toBe(s.doc);
      expect(key(s, 'ArrowUp').part).toEqual({ kind: 'secondary', id: 'SB1' });
    });

    it('arrows move a chosen corner or secondary beam by the step, Delete removes it, Escape lets go', () => {
      let s = key(selectVertex(start(), 2), 'ArrowUp', true);
      expect(s.doc.boundary.vertices[2]).toEqual({ x: 14.5, y: 18.5 });
      s = key(s, 'Delete');
      expect(s.doc.boundary.vertices).toHaveLength(3);
      expect(key(selectVertex(s, 0), 'Delete').doc).toBe(s.doc); // three corners stay
      let b = key(selectSecondary(start(), 'SB1'), 'ArrowLeft');
      expect(b.doc.secondaryBeams[0]).toMatchObject({ start: { x: 4.35, y: 6.2 }, end: { x: 8.55, y: 6.2 } });
      expect(key(b, 'Escape').part).toBeNull();
      b = key(b, 'Backspace');
      expect(b.doc.secondaryBeams).toEqual([]);
      expect(undo(b).doc.secondaryBeams).toHaveLength(1);
    });
  });

  it('adds, changes and removes stair flights, each as one undo step, never reusing an id', () => {
    let s = addStair(start(), { riserMm: 165, treadMm: 280, risers: 10, widthM: 1.2, use: 'other' });
    expect(s.doc.stairs.map((f) => f.id)).toEqual(['ST1', 'ST2']);
    s = updateStair(s, 'ST2', { riserMm: 150 });
    expect(s.doc.stairs[1]).toEqual({ id: 'ST2', riserMm: 150, treadMm: 280, risers: 10, widthM: 1.2, use: 'other' });
    expect(updateStair(s, 'ST2', { riserMm: 150 })).toBe(s);
    s = deleteStair(s, 'ST1');
    s = addStair(s, { riserMm: 170, treadMm: 260, risers: 9, widthM: 1, use: 'residential' });
    expect(s.doc.stairs.map((f) => f.id)).toEqual(['ST2', 'ST3']);
    expect(s.past).toHaveLength(4);
    expect(undo(undo(s)).doc.stairs.map((f) => f.id)).toEqual(['ST1', 'ST2']);
    expect(() => schemeSchema.parse(s.doc)).not.toThrow();
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

describe('typed values', () => {
  it('reads a typed number within its bounds, and nothing else, blank included', () => {
    expect(typedNumber('4.25', 0, 10)).toBe(4.25);
    expect(typedNumber(' 10 ', 0, 10)).toBe(10);
    expect([
      typedNumber('', 0, 10),
      typedNumber('  ', 0, 10),
      typedNumber('4,2', 0, 10),
      typedNumber('11', 0, 10),
    ]).toEqual([null, null, null, null]);
  });

  it('holds coordinates and section sides to the contract’s own limits (so the engine never refuses them)', () => {
    expect(SECTION_MM).toEqual({ min: 100, max: 5000 });
    expect(typedCoordinate(String(PLAN_COORD_M))).toBe(PLAN_COORD_M);
    expect(typedCoordinate(String(-PLAN_COORD_M - 1))).toBeNull();
  });
});
