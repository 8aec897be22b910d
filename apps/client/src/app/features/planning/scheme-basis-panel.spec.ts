import { ANIMATION_MODULE_TYPE } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { designBasisSchema, schemeSchema } from '@trabeate/contracts';
import { demoScheme } from '@trabeate/structural';
import type { DesignBasis } from './editor-model';
import { SchemeBasisPanel } from './scheme-basis-panel';

// The engine's invented demo basis (IS 456, M25, Fe 500, INR rates), parsed by the contract.
const demoBasis = (): DesignBasis => schemeSchema.parse(demoScheme()).basis;

describe('SchemeBasisPanel', () => {
  let fixture: ComponentFixture<SchemeBasisPanel>;
  let applied: DesignBasis[];
  const el = () => fixture.nativeElement as HTMLElement;
  const input = (key: string) => el().querySelector(`[data-testid="basis-${key}"]`) as HTMLInputElement | null;
  const type = async (key: string, value: string) => {
    const i = input(key)!;
    i.value = value;
    i.dispatchEvent(new Event('input'));
    await fixture.whenStable();
  };
  const errorBeside = (key: string) =>
    input(key)?.closest('mat-form-field')?.querySelector('mat-error')?.textContent?.trim();
  const apply = async () => {
    (el().querySelector('[data-testid="basis-apply"]') as HTMLButtonElement).click();
    await fixture.whenStable();
  };

  async function open(basis: DesignBasis, editable = true): Promise<void> {
    TestBed.configureTestingModule({
      imports: [SchemeBasisPanel],
      providers: [{ provide: ANIMATION_MODULE_TYPE, useValue: 'NoopAnimations' }],
    });
    fixture = TestBed.createComponent(SchemeBasisPanel);
    fixture.componentRef.setInput('basis', basis);
    fixture.componentRef.setInput('editable', editable);
    applied = [];
    fixture.componentInstance.apply.subscribe((b) => applied.push(b));
    await fixture.whenStable();
  }

  it("shows the open scheme's basis, its unit rates in the project's currency", async () => {
    await open(demoBasis());
    expect(input('concreteMPa')?.value).toBe('25');
    expect(input('storeys')?.value).toBe('7');
    expect(input('beamWidthMm')?.value).toBe('230');
    expect(input('bearingPressureKPa')?.value).toBe('150');
    expect(input('steelPerKg')?.value).toBe('75');
    expect(el().querySelector('legend')?.textContent).toContain('INR');
    // αcc is EN 1992's alone: not offered under IS 456
    expect(input('alphaCc')).toBeNull();
  });

  it("holds each value to the contract's limits as it is typed", async () => {
    await open(demoBasis());
    const lim = designBasisSchema.shape;
    await type('concreteMPa', '8');
    expect(errorBeside('concreteMPa')).toBe(`Concrete strength must be at least ${lim.concreteMPa.minValue} MPa.`);
    await type('steelMPa', '900');
    expect(errorBeside('steelMPa')).toBe(`Reinforcement yield strength can be at most ${lim.steelMPa.maxValue} MPa.`);
    await type('storeys', '2.5');
    expect(errorBeside('storeys')).toBe('Storeys must be a whole number.');
    // positive() in the contract: zero is refused, as "more than"
    await type('beamWidthMm', '0');
    expect(errorBeside('beamWidthMm')).toBe('Beam width must be more than 0 mm.');
    await type('bearingPressureKPa', '20000');
    expect(errorBeside('bearingPressureKPa')).toBe('Allowable bearing pressure can be at most 10000 kPa.');
    await type('formworkPerM2', '-1');
    expect(errorBeside('formworkPerM2')).toBe('Formwork rate must be at least 0 INR/m².');
    await type('concreteMPa', '30');
    expect(errorBeside('concreteMPa')).toBeUndefined();
    // nothing is applied while any value is out of bounds
    await apply();
    expect(applied).toEqual([]);
    expect(el().querySelector('[data-testid="basis-error"]')?.textContent).toContain('5 fields need attention.');
  });

  it('applies a basis the contract accepts, keeping the currency and any limit overrides', async () => {
    const basis = { ...demoBasis(), limitOverrides: { beamSpanSimpleMaxM: 6.5 } };
    await open(basis);
    await type('concreteMPa', '30');
    await type('storeys', '9');
    await type('steelPerKg', '82.5');
    await type('slabThicknessMm', '150');
    await apply();
    expect(applied).toHaveLength(1);
    const got = designBasisSchema.parse(applied[0]);
    expect(got).toEqual({
      ...basis,
      concreteMPa: 30,
      storeys: 9,
      slabThicknessMm: 150,
      rates: { ...basis.rates, steelPerKg: 82.5 },
    });
  });

  it('offers αcc under EN 1992 only, within 0.8 to 1.0, and leaves it out under another family', async () => {
    await open({ ...demoBasis(), codeFamily: 'EN1992', alphaCc: 0.85 });
    expect(input('alphaCc')?.value).toBe('0.85');
    await type('alphaCc', '0.7');
    expect(errorBeside('alphaCc')).toBe('αcc must be at least 0.8.');
    await type('alphaCc', '1');
    await apply();
    expect(applied[0]).toMatchObject({ codeFamily: 'EN1992', alphaCc: 1 });

    const form = fixture.componentInstance['form'];
    // as the select does when a family is chosen
    form.controls.codeFamily.setValue('ACI318');
    form.controls.codeFamily.markAsDirty();
    await fixture.whenStable();
    expect(input('alphaCc')).toBeNull();
    await apply();
    expect(applied[1].codeFamily).toBe('ACI318');
    expect('alphaCc' in applied[1]).toBe(false);
  });

  it('discards what was typed, and shows the basis read-only to those who may not edit', async () => {
    await open(demoBasis());
    await type('concreteMPa', '40');
    (el().querySelector('[data-testid="basis-revert"]') as HTMLButtonElement).click();
    await fixture.whenStable();
    expect(input('concreteMPa')?.value).toBe('25');

    TestBed.resetTestingModule();
    await open(demoBasis(), false);
    expect(input('concreteMPa')?.disabled).toBe(true);
    expect(input('steelPerKg')?.disabled).toBe(true);
    expect(el().querySelector('[data-testid="basis-apply"]')).toBeNull();
  });
});
