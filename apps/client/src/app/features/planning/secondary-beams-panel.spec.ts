import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { ANIMATION_MODULE_TYPE } from '@angular/core';
import { schemeSchema } from '@trabeate/contracts';
import { demoScheme } from '@trabeate/structural';
import { SecondaryBeamsPanel, type SecondaryEnds } from './secondary-beams-panel';

// The engine's invented demo, parsed by the contract: SB1 from (4.4, 6.2) to (8.6, 6.2).
const beams = () => schemeSchema.parse(demoScheme()).secondaryBeams;

jest.setTimeout(30_000);

describe('SecondaryBeamsPanel', () => {
  let fixture: ComponentFixture<SecondaryBeamsPanel>;
  const el = () => fixture.nativeElement as HTMLElement;
  const input = (id: string, i = 0) => el().querySelectorAll<HTMLInputElement>(`[data-testid="${id}"]`)[i];
  const change = (id: string, value: string, i = 0) => {
    const x = input(id, i);
    x.value = value;
    x.dispatchEvent(new Event('change'));
    fixture.detectChanges();
  };

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [{ provide: ANIMATION_MODULE_TYPE, useValue: 'NoopAnimations' }] });
    fixture = TestBed.createComponent(SecondaryBeamsPanel);
    fixture.componentRef.setInput('beams', beams());
    fixture.componentRef.setInput('editable', true);
    fixture.detectChanges();
  });

  it('shows each beam as the line it sits on and where it runs from and to', () => {
    const row = el().querySelector('[data-testid="secondary-row"]')!;
    expect(row.textContent).toContain('SB1');
    expect(row.textContent).toContain('along x');
    expect([input('secondary-at').value, input('secondary-from').value, input('secondary-to').value]).toEqual([
      '6.2',
      '4.4',
      '8.6',
    ]);
  });

  it('moving the line a beam sits on moves both its ends, so a typed beam stays straight', () => {
    const sent: Required<SecondaryEnds>[] = [];
    fixture.componentInstance.update.subscribe((u) => sent.push(u));
    change('secondary-at', '7');
    change('secondary-to', '7.5');
    expect(sent).toEqual([
      { id: 'SB1', start: { x: 4.4, y: 7 }, end: { x: 8.6, y: 7 } },
      // the row still shows the document (the page has not applied the first change here)
      { id: 'SB1', start: { x: 4.4, y: 6.2 }, end: { x: 7.5, y: 6.2 } },
    ]);
  });

  it('refuses a beam shorter than the engine takes and a coordinate that is not a number, with a message', () => {
    const sent: unknown[] = [];
    fixture.componentInstance.update.subscribe((u) => sent.push(u));
    fixture.componentInstance.add.subscribe((u) => sent.push(u));
    change('secondary-to', '4.45');
    expect(el().querySelector('[data-testid="secondary-error"]')?.textContent).toContain('at least 0.1 m');
    change('secondary-from', 'four');
    expect(el().querySelector('[data-testid="secondary-error"]')?.textContent).toContain('number of metres');
    expect(sent).toEqual([]);
  });

  it('adds a typed beam along the chosen axis, and asks to place one on the plan', () => {
    const added: SecondaryEnds[] = [];
    let placed = 0;
    fixture.componentInstance.add.subscribe((a) => added.push(a));
    fixture.componentInstance.place.subscribe(() => placed++);
    input('secondary-new-at').value = '2.2';
    input('secondary-new-from').value = '0.2';
    input('secondary-new-to').value = '4.4';
    el().querySelector<HTMLButtonElement>('[data-testid="secondary-add-typed"]')!.click();
    expect(added).toEqual([{ start: { x: 0.2, y: 2.2 }, end: { x: 4.4, y: 2.2 } }]);
    el().querySelector<HTMLButtonElement>('[data-testid="secondary-place"]')!.click();
    expect(placed).toBe(1);
    fixture.componentRef.setInput('placing', 'end');
    fixture.detectChanges();
    expect(el().querySelector('[data-testid="secondary-placing"]')?.textContent).toContain('where it ends');
    // Escape on the Stop placing button stops, as Escape on the plan does; when not placing it does nothing
    const button = el().querySelector<HTMLButtonElement>('[data-testid="secondary-place"]')!;
    button.dispatchEvent(new KeyboardEvent('keydown', { key: 'Escape', bubbles: true }));
    expect(placed).toBe(2);
    fixture.componentRef.setInput('placing', 'off');
    fixture.detectChanges();
    button.dispatchEvent(new KeyboardEvent('keydown', { key: 'Escape', bubbles: true }));
    expect(placed).toBe(2);
  });
});
