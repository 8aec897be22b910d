import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { schemeDetailSchema, type SchemeCheck, type SchemeDocument } from '@trabeate/contracts';
import { demoSchemeVariant } from '@trabeate/structural';
import { planGeometry } from './plan-geometry';
import type { PlanPart } from './editor-model';
import { PlanView, type ColumnDrop, type PlanTap, type VertexDrop } from './plan-view';

// The demo variant (no B3), parsed by the contract as the API would send it.
const doc = (): SchemeDocument =>
  schemeDetailSchema.parse({
    id: '00000000-0000-4000-8000-000000000402',
    projectId: '00000000-0000-4000-8000-000000000301',
    name: 'Tamarind Row without B3',
    archivedAt: null,
    createdAt: '2026-11-30T09:00:00.000Z',
    canEdit: true,
    current: {
      version: 1,
      savedAt: '2026-12-01T10:00:00.000Z',
      savedBy: { id: '00000000-0000-4000-8000-000000000202', displayName: 'Cato Brennagh' },
      restoredFrom: null,
      schemaVersion: 1,
      checks: { engineVersion: '0.1.0', ok: true, errors: 0, warnings: 0 },
    },
    document: { ...demoSchemeVariant(), name: 'Tamarind Row without B3' },
  }).document;

jest.setTimeout(30_000);

describe('PlanView while a column is dragged', () => {
  let fixture: ComponentFixture<PlanView>;
  const d = doc();
  const box = planGeometry(d).box;
  const el = () => fixture.nativeElement as HTMLElement;
  const q = (sel: string) => el().querySelector<SVGElement>(sel);
  /** jsdom has no screen matrix, so the plan reads client units as view units (1 m each) */
  const pointer = (target: Element, type: string, x: number, y: number) =>
    target.dispatchEvent(
      new PointerEvent(type, {
        bubbles: true,
        pointerId: 1,
        button: 0,
        clientX: x - box.minX,
        clientY: box.minY + box.height - y,
      }),
    );
  const dims = () => Array.from(el().querySelectorAll('[data-testid="dimension"]')).map((t) => t.textContent?.trim());

  beforeEach(() => {
    fixture = TestBed.createComponent(PlanView);
    fixture.componentRef.setInput('document', d);
    fixture.componentRef.setInput('editable', true);
    fixture.componentRef.setInput('selection', ['C2']);
    fixture.detectChanges();
  });

  it('moves only a copy of the dragged column, by one transform, and leaves every drawn column in place until the drop', () => {
    const drops: ColumnDrop[] = [];
    fixture.componentInstance.place.subscribe((p) => drops.push(p));
    const c2 = q('[data-column="C2"]')!;
    const a1 = q('[data-column="A1"]')!;
    const c2At = [c2.getAttribute('x'), c2.getAttribute('y')];
    const a1At = [a1.getAttribute('x'), a1.getAttribute('y')];
    expect(q('.moving')).toBeNull();

    // C2 stands at (8.6, 4.2) on grid C; moved up to y 6.1 it snaps back across to grid C
    pointer(c2, 'pointerdown', 8.6, 4.2);
    pointer(q('[data-testid="plan"]')!, 'pointermove', 8.52, 6.1);
    fixture.detectChanges();

    const move = /^translate\((\S+) (\S+)\)$/.exec(q('.moving')?.getAttribute('transform') ?? '');
    const [dx, dy] = [Number(move?.[1]), Number(move?.[2])];
    expect(dx).toBe(0);
    expect(dy).toBeCloseTo(-1.9, 9); // plan y runs up the screen
    expect(q('[data-moving-column="C2"]')).not.toBeNull();
    expect(el().querySelectorAll('[data-moving-column]')).toHaveLength(1);
    // the drawn columns are the same nodes where they were; C2's own stays as an outline
    expect(q('[data-column="C2"]')).toBe(c2);
    expect(q('[data-column="A1"]')).toBe(a1);
    expect([c2.getAttribute('x'), c2.getAttribute('y')]).toEqual(c2At);
    expect([a1.getAttribute('x'), a1.getAttribute('y')]).toEqual(a1At);
    expect(c2.classList.contains('lifted')).toBe(true);
    expect(drops).toEqual([]);

    pointer(q('[data-testid="plan"]')!, 'pointerup', 8.52, 6.1);
    fixture.detectChanges();
    expect(drops).toHaveLength(1);
    expect(drops[0].id).toBe('C2');
    expect(drops[0].x).toBeCloseTo(8.6, 9);
    expect(drops[0].y).toBeCloseTo(6.1, 9);
    expect(q('.moving')).toBeNull();
    expect(c2.classList.contains('lifted')).toBe(false);
  });

  it('keeps the dimensions of the chosen column with it as it moves', () => {
    // C3 stands 4 m north of C2 on grid C (y 8.2 against 4.2)
    expect(dims()).toContain('4.00 m');
    pointer(q('[data-column="C2"]')!, 'pointerdown', 8.6, 4.2);
    pointer(q('[data-testid="plan"]')!, 'pointermove', 8.52, 6.1);
    fixture.detectChanges();
    expect(dims()).toContain('2.10 m');
    expect(dims()).not.toContain('4.00 m');
    // a pointer cancelled mid-drag puts everything back as it was
    q('[data-testid="plan"]')!.dispatchEvent(new PointerEvent('pointercancel', { bubbles: true, pointerId: 1 }));
    fixture.detectChanges();
    expect(dims()).toContain('4.00 m');
    expect(q('.moving')).toBeNull();
  });

  it('lets a press on a dimension reach the column under it (dimensions take no pointer events)', () => {
    // The chosen column's dimension lines cross its centre at a small zoom; a press there must
    // still pick the column up.
    pointer(q('[data-column="C2"]')!, 'pointerdown', 8.6, 4.2);
    fixture.detectChanges();
    expect(q('[data-testid="dimensions"]')?.getAttribute('pointer-events')).toBe('none');
  });
});

describe('PlanView: the boundary and secondary beams', () => {
  let fixture: ComponentFixture<PlanView>;
  const d = doc();
  const box = planGeometry(d).box;
  const el = () => fixture.nativeElement as HTMLElement;
  const q = (sel: string) => el().querySelector<SVGElement>(sel);
  const pointer = (target: Element, type: string, x: number, y: number) =>
    target.dispatchEvent(
      new PointerEvent(type, {
        bubbles: true,
        pointerId: 1,
        button: 0,
        clientX: x - box.minX,
        clientY: box.minY + box.height - y,
      }),
    );

  beforeEach(() => {
    fixture = TestBed.createComponent(PlanView);
    fixture.componentRef.setInput('document', d);
    fixture.componentRef.setInput('editable', true);
    fixture.detectChanges();
  });

  it('names each property line in words beside its line style, not by the look of the line alone', () => {
    expect(el().querySelectorAll('[data-testid="property-line"]')).toHaveLength(2);
    const labels = Array.from(el().querySelectorAll('[data-testid="property-line-label"]'));
    expect(labels.map((t) => t.textContent?.trim())).toEqual(['property line', 'property line']);
  });

  it('drags a boundary corner with the columns’ snapping and drops it where it snapped', () => {
    const drops: VertexDrop[] = [];
    const picks: PlanPart[] = [];
    fixture.componentInstance.placeVertex.subscribe((v) => drops.push(v));
    fixture.componentInstance.pickPart.subscribe((p) => picks.push(p));
    // corner 2 stands at (14.5, 0); near grid D (x 12.8) it snaps to it (10 px at 50 px per metre in jsdom)
    pointer(q('[data-vertex="1"]')!, 'pointerdown', 14.5, 0);
    pointer(q('[data-testid="plan"]')!, 'pointermove', 12.72, 1.0);
    fixture.detectChanges();
    expect(q('[data-testid="moving-vertex"]')).not.toBeNull();
    expect(q('[data-testid="snap-note"]')?.textContent).toContain('on grid D');
    pointer(q('[data-testid="plan"]')!, 'pointerup', 12.72, 1.0);
    fixture.detectChanges();
    expect(drops).toEqual([{ index: 1, x: 12.8, y: 1 }]);
    expect(picks).toEqual([]);
    expect(q('[data-testid="moving-vertex"]')).toBeNull();

    // a press without a move chooses the corner
    pointer(q('[data-vertex="3"]')!, 'pointerdown', 0, 18);
    pointer(q('[data-testid="plan"]')!, 'pointerup', 0, 18);
    expect(picks).toEqual([{ kind: 'vertex', index: 3 }]);
  });

  it('draws each secondary beam with its id, chooses it by a press and shows it chosen', () => {
    const picks: PlanPart[] = [];
    fixture.componentInstance.pickPart.subscribe((p) => picks.push(p));
    expect(q('[data-testid="secondary-label"]')?.textContent?.trim()).toBe('SB1');
    pointer(q('[data-secondary="SB1"]')!, 'pointerdown', 6, 6.2);
    expect(picks).toEqual([{ kind: 'secondary', id: 'SB1' }]);
    fixture.componentRef.setInput('part', { kind: 'secondary', id: 'SB1' });
    fixture.detectChanges();
    expect(q('[data-secondary="SB1"]')?.classList.contains('sel')).toBe(true);
  });

  it('without editing rights there are no corner handles to drag', () => {
    fixture.componentRef.setInput('editable', false);
    fixture.detectChanges();
    expect(el().querySelectorAll('[data-vertex]')).toHaveLength(0);
  });

  it('keeps the marker of a check that still stands when the checks change around it', () => {
    const check = (ruleId: string, elements: string[], message: string): SchemeCheck => ({
      ruleId,
      severity: 'warning',
      status: 'fail',
      elements,
      message,
      value: 1,
      limit: 0,
      unit: 'm',
      sense: 'max',
      source: 'test',
      sourceKind: 'practice',
    });
    const kept = check('column.spacing', ['A1', 'A2'], 'A1 and A2 are far apart');
    fixture.componentRef.setInput('checks', [kept]);
    fixture.detectChanges();
    const marker = q('.marker')!;
    expect(marker.getAttribute('aria-label')).toContain('A1 and A2');
    // an edit brings a new check ahead of it in the list: the same marker stays, not redrawn as the new one
    fixture.componentRef.setInput('checks', [check('column.spacing', ['C1', 'C2'], 'C1 and C2 are far apart'), kept]);
    fixture.detectChanges();
    const again = Array.from(el().querySelectorAll('.marker')).find((m) =>
      m.getAttribute('aria-label')?.includes('A1 and A2'),
    );
    expect(again).toBe(marker);
  });
});

const failedCheck = (ruleId: string, elements: string[], message: string): SchemeCheck => ({
  ruleId,
  severity: 'error',
  status: 'fail',
  elements,
  message,
  value: 1,
  limit: 0,
  unit: 'm',
  sense: 'max',
  source: 'test',
  sourceKind: 'practice',
});

describe('PlanView while a secondary beam is placed by two presses', () => {
  let fixture: ComponentFixture<PlanView>;
  const d = doc();
  const box = planGeometry(d).box;
  const el = () => fixture.nativeElement as HTMLElement;
  const q = (sel: string) => el().querySelector<SVGElement>(sel);
  const plan = () => q('[data-testid="plan"]')!;
  const pointer = (target: Element, type: string, x: number, y: number) =>
    target.dispatchEvent(
      new PointerEvent(type, {
        bubbles: true,
        pointerId: 1,
        button: 0,
        clientX: x - box.minX,
        clientY: box.minY + box.height - y,
      }),
    );
  const X = (x: number) => x - box.minX;
  const Y = (y: number) => box.minY + box.height - y;
  const attrs = (e: Element | null, ...names: string[]) => names.map((n) => Number(e?.getAttribute(n)));
  let taps: PlanTap[];

  /** what the page does with a tap while placing: the first end asks for the second, the second ends it */
  const pageTakes = () =>
    fixture.componentInstance.tap.subscribe(() => {
      fixture.componentRef.setInput('placing', taps.length === 1 ? 'end' : 'off');
    });

  beforeEach(() => {
    taps = [];
    fixture = TestBed.createComponent(PlanView);
    fixture.componentRef.setInput('document', d);
    fixture.componentRef.setInput('editable', true);
    fixture.componentInstance.tap.subscribe((t) => taps.push(t));
    fixture.detectChanges();
  });

  it('marks the snapped first end and draws the beam from it to the pointer until the second press', () => {
    pageTakes();
    fixture.componentRef.setInput('placing', 'start');
    fixture.detectChanges();
    expect(q('[data-testid="place-beam"]')).toBeNull();

    // near grid C (x 8.6) at y 10.3: the first end snaps onto grid C
    pointer(plan(), 'pointerdown', 8.55, 10.3);
    pointer(plan(), 'pointerup', 8.55, 10.3);
    fixture.detectChanges();
    const mark = q('[data-testid="place-beam"]');
    expect(mark?.getAttribute('aria-hidden')).toBe('true');
    expect(attrs(q('[data-testid="place-start"] circle'), 'cx', 'cy')).toEqual([X(8.6), Y(10.3)]);
    expect(q('[data-testid="place-band"]')).toBeNull();

    // the pointer moves near grid D, a little off the line: the band runs along x to grid D
    pointer(plan(), 'pointermove', 12.7, 10.9);
    fixture.detectChanges();
    const band = q('[data-testid="place-band"]');
    expect(attrs(band, 'x1', 'y1', 'x2', 'y2').map((v) => Math.round(v * 1000) / 1000)).toEqual([
      X(8.6),
      Y(10.3),
      X(12.8),
      Y(10.3),
    ]);

    pointer(plan(), 'pointerdown', 12.7, 10.9);
    pointer(plan(), 'pointerup', 12.7, 10.9);
    fixture.detectChanges();
    expect(taps).toHaveLength(2);
    expect(q('[data-testid="place-beam"]')).toBeNull();
  });

  it('takes the first end away when placing stops before the second press, and starts afresh next time', () => {
    fixture.componentRef.setInput('placing', 'start');
    fixture.detectChanges();
    pointer(plan(), 'pointerdown', 8.55, 10.3);
    pointer(plan(), 'pointerup', 8.55, 10.3);
    fixture.componentRef.setInput('placing', 'end');
    fixture.detectChanges();
    pointer(plan(), 'pointermove', 12.7, 10.3);
    fixture.detectChanges();
    expect(q('[data-testid="place-band"]')).not.toBeNull();

    // Stop placing (or Escape on the plan): the page's step goes off
    fixture.componentRef.setInput('placing', 'off');
    fixture.detectChanges();
    expect(q('[data-testid="place-beam"]')).toBeNull();

    // placing again: nothing is drawn until a new first press, and no band from the old pointer
    fixture.componentRef.setInput('placing', 'start');
    fixture.detectChanges();
    expect(q('[data-testid="place-beam"]')).toBeNull();
    pointer(plan(), 'pointerdown', 4.45, 6.9);
    pointer(plan(), 'pointerup', 4.45, 6.9);
    fixture.componentRef.setInput('placing', 'end');
    fixture.detectChanges();
    expect(attrs(q('[data-testid="place-start"] circle'), 'cx', 'cy')).toEqual([X(4.4), Y(6.9)]);
    expect(q('[data-testid="place-band"]')).toBeNull();
  });

  it('lets presses through check markers while placing: a press on a marker or on the column under it gives an end there, picking nothing and choosing no check', () => {
    const picks: unknown[] = [];
    const chosen: number[] = [];
    fixture.componentInstance.pick.subscribe((p) => picks.push(p));
    fixture.componentInstance.pickPart.subscribe((p) => picks.push(p));
    fixture.componentInstance.choose.subscribe((i) => chosen.push(i));
    // a check on C2 and C3: its marker sits on grid C's beam between them, where beams end
    fixture.componentRef.setInput('checks', [failedCheck('beam.span', ['C2', 'C3'], 'C2–C3 spans too far')]);
    fixture.detectChanges();
    const markers = () => q('[tbPlanMarkerLayer]')!;
    expect(markers().getAttribute('pointer-events')).toBeNull(); // not placing: a press chooses the check

    fixture.componentRef.setInput('placing', 'start');
    fixture.detectChanges();
    // the markers let the press through (pointer-events none), so the browser hands it to what is under them
    expect(markers().getAttribute('pointer-events')).toBe('none');
    pointer(q('.marker path')!, 'pointerdown', 8.7, 6.65);
    pointer(plan(), 'pointerup', 8.7, 6.65);
    // a marker can stand over a column's corner: a press on the column is a press on the plan too
    pointer(q('[data-column="C2"]')!, 'pointerdown', 8.75, 4.25);
    pointer(plan(), 'pointerup', 8.75, 4.25);
    expect(taps.map((t) => [t.x, t.y].map((v) => Math.round(v * 1000) / 1000))).toEqual([
      [8.7, 6.65],
      [8.75, 4.25],
    ]);
    expect(picks).toEqual([]);
    expect(chosen).toEqual([]);

    // a press on a corner handle or a secondary beam is a press on the plan as well
    fixture.componentRef.setInput('placing', 'end');
    fixture.detectChanges();
    pointer(q('[data-secondary="SB1"]')!, 'pointerdown', 6, 6.2);
    pointer(plan(), 'pointerup', 6, 6.2);
    pointer(q('[data-vertex="1"]')!, 'pointerdown', 14.5, 0);
    pointer(plan(), 'pointerup', 14.5, 0);
    expect(taps).toHaveLength(4);
    expect(picks).toEqual([]);

    fixture.componentRef.setInput('placing', 'off');
    fixture.detectChanges();
    expect(markers().getAttribute('pointer-events')).toBeNull();
  });
});

describe('PlanView: the boundary corners from the keyboard', () => {
  let fixture: ComponentFixture<PlanView>;
  const el = () => fixture.nativeElement as HTMLElement;
  const corner = (i: number) => el().querySelector<SVGElement>(`[data-vertex="${i}"]`)!;
  const keydown = (target: Element, key: string) => {
    const ev = new KeyboardEvent('keydown', { key, bubbles: true, cancelable: true });
    target.dispatchEvent(ev);
    return ev;
  };
  let picks: PlanPart[];

  beforeEach(() => {
    picks = [];
    fixture = TestBed.createComponent(PlanView);
    fixture.componentRef.setInput('document', doc());
    fixture.componentRef.setInput('editable', true);
    fixture.componentInstance.pickPart.subscribe((p) => picks.push(p));
    fixture.detectChanges();
    document.body.appendChild(el());
  });
  afterEach(() => el().remove());

  it('makes each corner a button of its own that Tab reaches, named with its place', () => {
    const corners = Array.from(el().querySelectorAll('[data-vertex]'));
    expect(corners).toHaveLength(4);
    expect(corners.map((c) => [c.getAttribute('tabindex'), c.getAttribute('role')])).toEqual(
      Array(4).fill(['0', 'button']),
    );
    expect(corner(1).getAttribute('aria-label')).toBe('Boundary corner 2 at x 14.50 m, y 0.00 m');
    expect(corner(3).getAttribute('aria-label')).toBe('Boundary corner 4 at x 0.00 m, y 18.00 m');
  });

  it('chooses a corner by Enter or Space, as a press would', () => {
    const enter = keydown(corner(1), 'Enter');
    const space = keydown(corner(2), ' ');
    expect(picks).toEqual([
      { kind: 'vertex', index: 1 },
      { kind: 'vertex', index: 2 },
    ]);
    expect(space.defaultPrevented).toBe(true); // no page scroll
    expect(enter.defaultPrevented).toBe(true);
  });

  it('lets the arrows on the chosen corner go on to the editor, and on another corner chooses that one first', () => {
    fixture.componentRef.setInput('part', { kind: 'vertex', index: 1 });
    fixture.detectChanges();
    // the chosen corner: the page's keys move it
    expect(keydown(corner(1), 'ArrowRight').defaultPrevented).toBe(false);
    expect(picks).toEqual([]);
    // a focused corner that is not chosen: the arrow chooses it, and goes no further
    const stray = keydown(corner(3), 'ArrowUp');
    expect(stray.defaultPrevented).toBe(true);
    expect(picks).toEqual([{ kind: 'vertex', index: 3 }]);
  });

  it('moves the focus with the choice while it is on a corner, and back to the plan editor past the corners', () => {
    // the page's plan editor holds the plan view and the keyboard's focus
    const editor = document.createElement('div');
    editor.tabIndex = 0;
    el().replaceWith(editor);
    editor.appendChild(el());
    editor.focus();
    fixture.componentRef.setInput('part', { kind: 'vertex', index: 0 });
    fixture.detectChanges();
    expect(document.activeElement).toBe(corner(0));
    fixture.componentRef.setInput('part', { kind: 'vertex', index: 1 });
    fixture.detectChanges();
    expect(document.activeElement).toBe(corner(1));
    fixture.componentRef.setInput('part', { kind: 'secondary', id: 'SB1' });
    fixture.detectChanges();
    expect(document.activeElement).toBe(editor);

    // Delete on the focused last corner takes its handle away: the focus stays on the plan editor
    fixture.componentRef.setInput('part', { kind: 'vertex', index: 3 });
    fixture.detectChanges();
    expect(document.activeElement).toBe(corner(3));
    const d = doc();
    fixture.componentRef.setInput('document', {
      ...d,
      boundary: { vertices: d.boundary.vertices.slice(0, 3), propertyLines: [0] },
    });
    fixture.componentRef.setInput('part', null);
    fixture.detectChanges();
    expect(document.activeElement).toBe(editor);
    editor.remove();
  });
});
