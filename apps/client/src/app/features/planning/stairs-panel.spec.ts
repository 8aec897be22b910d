import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { ANIMATION_MODULE_TYPE } from '@angular/core';
import { schemeSchema } from '@trabeate/contracts';
import { demoScheme } from '@trabeate/structural';
import { StairsPanel, type FlightDraft } from './stairs-panel';

// The engine's invented demo, parsed by the contract: ST1, 9 risers of 170 mm, treads 260 mm, 1.1 m.
const flights = () => schemeSchema.parse(demoScheme()).stairs;

jest.setTimeout(30_000);

describe('StairsPanel', () => {
  let fixture: ComponentFixture<StairsPanel>;
  const el = () => fixture.nativeElement as HTMLElement;
  const q = <T extends HTMLElement>(id: string) => el().querySelector<T>(`[data-testid="${id}"]`);
  const type = (id: string, value: string) => {
    const input = q<HTMLInputElement>(id)!;
    input.value = value;
    input.dispatchEvent(new Event('input'));
    fixture.detectChanges();
  };
  const errors = () => Array.from(el().querySelectorAll('mat-error')).map((e) => e.textContent?.trim());

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [{ provide: ANIMATION_MODULE_TYPE, useValue: 'NoopAnimations' }] });
    fixture = TestBed.createComponent(StairsPanel);
    fixture.componentRef.setInput('flights', flights());
    fixture.componentRef.setInput('editable', true);
    fixture.detectChanges();
  });

  it('lists each flight with its geometry and use', () => {
    expect(q('stair-row')?.textContent).toContain('ST1: 9 risers of 170 mm, treads 260 mm, 1.1 m wide');
    expect(q('stair-row')?.textContent).toContain('Residential');
  });

  it("checks each field as it is typed against the contract's limits, before any submit", () => {
    q<HTMLButtonElement>('stair-edit')!.click();
    fixture.detectChanges();
    expect(errors()).toEqual([]);
    // stairFlightSchema: riser more than 0 and at most 400 mm; risers a whole number from 1 to 100
    type('stair-riser', '450');
    expect(q('stair-riser-error')?.textContent).toContain('The riser can be at most 400 mm.');
    type('stair-riser', '0');
    // the engine's smallest riser (libs/structural validateScheme), carried by the contract
    expect(q('stair-riser-error')?.textContent).toContain('The riser must be at least 50 mm.');
    type('stair-risers', '9.5');
    expect(q('stair-risers-error')?.textContent).toContain('The number of risers must be a whole number.');
    type('stair-risers', '');
    expect(q('stair-risers-error')?.textContent).toContain('The number of risers is required.');
    type('stair-risers', '101');
    expect(q('stair-risers-error')?.textContent).toContain('at most 100');

    const saved: FlightDraft[] = [];
    fixture.componentInstance.save.subscribe((f) => saved.push(f));
    q<HTMLButtonElement>('stair-save')!.click();
    fixture.detectChanges();
    expect(saved).toEqual([]);
    expect(q('stair-form-error')?.textContent).toContain('Fix the marked fields');
  });

  it('applies an edited flight under its id, and adds a new one without an id', () => {
    const saved: FlightDraft[] = [];
    fixture.componentInstance.save.subscribe((f) => saved.push(f));
    q<HTMLButtonElement>('stair-edit')!.click();
    fixture.detectChanges();
    type('stair-riser', '180');
    q<HTMLButtonElement>('stair-save')!.click();
    fixture.detectChanges();
    expect(saved).toEqual([{ id: 'ST1', riserMm: 180, treadMm: 260, risers: 9, widthM: 1.1, use: 'residential' }]);
    expect(q('stair-form')).toBeNull();

    q<HTMLButtonElement>('stair-add')!.click();
    fixture.detectChanges();
    type('stair-width', '1.2');
    q<HTMLButtonElement>('stair-save')!.click();
    expect(saved[1]).toEqual({ riserMm: 170, treadMm: 260, risers: 9, widthM: 1.2, use: 'residential' });
  });

  it('asks to remove a flight, and says so when there are none', () => {
    const removed: string[] = [];
    fixture.componentInstance.remove.subscribe((id) => removed.push(id));
    q<HTMLButtonElement>('stair-delete')!.click();
    expect(removed).toEqual(['ST1']);
    fixture.componentRef.setInput('flights', []);
    fixture.detectChanges();
    expect(q('stairs-empty')?.textContent).toContain('No stair flights');
  });
});
