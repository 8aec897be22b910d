import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { ANIMATION_MODULE_TYPE } from '@angular/core';
import { schemeSchema, type SchemeDocument } from '@trabeate/contracts';
import { demoScheme } from '@trabeate/structural';
import { BoundaryPanel } from './boundary-panel';
import type { VertexDrop } from './plan-view';

// The engine's invented demo plot, parsed by the contract as a saved scheme would be.
const boundary = (): SchemeDocument['boundary'] => schemeSchema.parse(demoScheme()).boundary;

jest.setTimeout(30_000);

describe('BoundaryPanel', () => {
  let fixture: ComponentFixture<BoundaryPanel>;
  const el = () => fixture.nativeElement as HTMLElement;
  const all = (sel: string) => Array.from(el().querySelectorAll<HTMLElement>(sel));

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [{ provide: ANIMATION_MODULE_TYPE, useValue: 'NoopAnimations' }] });
    fixture = TestBed.createComponent(BoundaryPanel);
    fixture.componentRef.setInput('boundary', boundary());
    fixture.componentRef.setInput('editable', true);
    fixture.detectChanges();
  });

  it('lists each corner with its coordinates and each side with its property-line mark', () => {
    expect(all('[data-testid="boundary-corner"]')).toHaveLength(4);
    expect(all('[data-testid="corner-x"]').map((i) => (i as HTMLInputElement).value)).toEqual([
      '0',
      '14.5',
      '14.5',
      '0',
    ]);
    const marks = all('[data-testid="side-property"] input').map((i) => (i as HTMLInputElement).checked);
    expect(marks).toEqual([true, false, false, true]);
    expect(all('[data-testid="boundary-side"]')[3].textContent).toContain('Side 4–1 is a property line');
  });

  it('sends a typed coordinate as a move of that corner, and refuses text that is not a number', () => {
    const moves: VertexDrop[] = [];
    fixture.componentInstance.move.subscribe((m) => moves.push(m));
    const y = all('[data-testid="corner-y"]')[2] as HTMLInputElement;
    y.value = '18.6';
    y.dispatchEvent(new Event('change'));
    expect(moves).toEqual([{ index: 2, x: 14.5, y: 18.6 }]);

    y.value = '18,6';
    y.dispatchEvent(new Event('change'));
    fixture.detectChanges();
    expect(moves).toHaveLength(1);
    expect(el().querySelector('[data-testid="boundary-error"]')?.textContent).toContain('number of metres');
  });

  it('asks to mark a side, add a corner on it or remove a corner, and never offers to go below three corners', () => {
    const asked: string[] = [];
    const c = fixture.componentInstance;
    c.toggleProperty.subscribe((k) => asked.push(`mark ${k}`));
    c.insert.subscribe((k) => asked.push(`insert ${k}`));
    c.remove.subscribe((k) => asked.push(`remove ${k}`));
    all('[data-testid="side-property"] input')[1].click();
    all('[data-testid="side-add-corner"]')[2].click();
    all('[data-testid="corner-delete"]')[0].click();
    expect(asked).toEqual(['mark 1', 'insert 2', 'remove 0']);

    const three = boundary();
    three.vertices = three.vertices.slice(0, 3);
    three.propertyLines = [0];
    fixture.componentRef.setInput('boundary', three);
    fixture.detectChanges();
    expect(all('[data-testid="corner-delete"]').every((b) => (b as HTMLButtonElement).disabled)).toBe(true);
  });
});
