import { ANIMATION_MODULE_TYPE } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { schemeSchema, type SchemeDocument } from '@trabeate/contracts';
import { analyseScheme, demoScheme, type Scheme, type SchemeResult } from '@trabeate/structural';
import { FootingOptions } from './footing-options';
import { footingSites, staleChoices, type FootingChoice } from './footing-options-model';

// Every figure here comes from the engine's own run on its invented demo scheme (property lines
// on the south and west); the panel must show what the engine sized, in the units it names.
const demoDoc = (): SchemeDocument => schemeSchema.parse(demoScheme());
const run = (doc: SchemeDocument): SchemeResult => analyseScheme(doc as Scheme);

jest.setTimeout(30_000);

describe('FootingOptions', () => {
  let fixture: ComponentFixture<FootingOptions>;
  const el = () => fixture.nativeElement as HTMLElement;
  const q = (sel: string) => el().querySelector<HTMLElement>(sel);
  const all = (sel: string) => Array.from(el().querySelectorAll<HTMLElement>(sel));
  const text = (sel: string) => q(sel)?.textContent?.replace(/\s+/g, ' ').trim() ?? '';

  function mount(doc: SchemeDocument, result: SchemeResult | null, editable = true) {
    TestBed.configureTestingModule({ providers: [{ provide: ANIMATION_MODULE_TYPE, useValue: 'NoopAnimations' }] });
    fixture = TestBed.createComponent(FootingOptions);
    fixture.componentRef.setInput('document', doc);
    fixture.componentRef.setInput('result', result);
    fixture.componentRef.setInput('editable', editable);
    fixture.detectChanges();
    const recorded: FootingChoice[] = [];
    const cleared: string[] = [];
    fixture.componentInstance.record.subscribe((c) => recorded.push(c));
    fixture.componentInstance.clear.subscribe((id) => cleared.push(id));
    return { recorded, cleared };
  }
  const openColumn = (label: string) => {
    const row = all('[data-testid="footing-site"]').find((r) => r.querySelector('td')?.textContent?.trim() === label);
    row?.querySelector<HTMLElement>('[data-testid="footing-site-open"]')?.click();
    fixture.detectChanges();
  };

  it('says it is sizing while the engine runs, and shows the caution throughout', () => {
    mount(demoDoc(), null);
    expect(q('[data-testid="footings-waiting"]')).not.toBeNull();
    expect(text('[data-testid="footing-caution"]')).toMatch(/Preliminary.*licensed structural engineer/);
  });

  it("lists every column the engine found at a property line and shows its options side by side with the engine's figures", () => {
    const doc = demoDoc();
    const result = run(doc);
    const first = result.footings.boundary.find((o) => o.strap?.feasible && o.combinedRectangular)!;
    expect(first).toBeDefined();
    mount(doc, result);

    const expected = footingSites(doc, result).map((s) => s.label);
    expect(expected.length).toBeGreaterThan(0);
    expect(all('[data-testid="footing-site"]').map((r) => r.querySelector('td')?.textContent?.trim())).toEqual(
      expected,
    );

    openColumn(first.columnId);
    const detail = text('[data-testid="footing-site-detail"]');
    expect(detail).toContain(`Column ${first.columnId}`);
    const shift = text('[data-testid="option-shift"]');
    expect(shift).toContain(`${first.shift.shiftM.toFixed(2)} m`);
    expect(shift).toContain(`${first.shift.spanBeforeM!.toFixed(2)} → ${first.shift.spanAfterM!.toFixed(2)} m`);
    const strap = text('[data-testid="option-strap"]');
    expect(strap).toContain(`${first.strap!.exteriorLengthM.toFixed(2)} × ${first.strap!.exteriorWidthM.toFixed(2)} m`);
    expect(strap).toContain(`${Math.round(first.strap!.strapMomentKNm).toLocaleString('en-US')} kN·m service`);
    const rect = text('[data-testid="option-combinedRectangular"]');
    expect(rect).toContain(
      `${first.combinedRectangular!.lengthM.toFixed(2)} × ${first.combinedRectangular!.adoptedWidthM.toFixed(2)} m`,
    );
    // the trapezoid is shown with its sizes and, where the engine finds it unworkable, why
    const trap = text('[data-testid="option-combinedTrapezoidal"]');
    expect(trap).toContain(`${first.combinedTrapezoidal!.lengthM.toFixed(2)} m`);
    if (!first.combinedTrapezoidal!.feasible) expect(trap).toMatch(/Not possible.*third and a half/);
    // only workable options may be chosen
    const offered = all('[data-testid="footing-choice-option"] mat-radio-button').map((b) =>
      b.getAttribute('data-testid'),
    );
    expect(offered).toContain('choose-shift');
    expect(offered).toContain('choose-strap');
    expect(offered.includes('choose-combinedTrapezoidal')).toBe(first.combinedTrapezoidal!.feasible);
  });

  it('says "not possible" with the reason where the engine has no interior column to strap or combine with', () => {
    const base = demoDoc();
    const line = run(base).footings.boundary.find((o) => o.interiorColumnId)!;
    // take away every other column on the line running inward from the edge column (the line
    // the shift moves it along), so nothing is left to strap to or share a footing with
    const edge = base.columns.find((c) => c.id === line.columnId)!;
    const alongX = Math.abs(line.shift.newPosition.x - edge.x) > 1e-6;
    const onLine = (c: { x: number; y: number }) => (alongX ? Math.abs(c.y - edge.y) : Math.abs(c.x - edge.x)) < 1e-6;
    const doc = { ...base, columns: base.columns.filter((c) => c.id === edge.id || !onLine(c)) };
    const result = run(doc);
    const after = result.footings.boundary.find(
      (o) => o.columnId === line.columnId && o.propertyLine === line.propertyLine,
    )!;
    expect(after.strap).toBeNull();
    mount(doc, result);
    openColumn(line.columnId);
    // a corner column has a set of cards per property line; this line's set is the one emptied
    const site = footingSites(doc, result).find((x) => x.columnId === line.columnId)!;
    const k = site.lines.findIndex((o) => o.propertyLine === line.propertyLine);
    const card = (what: string) => all(`[data-testid="option-${what}"]`)[k]?.textContent?.replace(/\s+/g, ' ') ?? '';
    expect(card('strap')).toMatch(/Not possible no interior column on the line across/);
    expect(card('combinedRectangular')).toMatch(/Not possible no interior column/);
    expect(card('combinedTrapezoidal')).toMatch(/Not possible no interior column/);
    // only what the engine found workable on some line of this column may be chosen
    const offered = all('[data-testid="footing-choice-option"] mat-radio-button').map((b) => b.dataset['testid']);
    expect(offered).toEqual(site.possible.map((o) => `choose-${o}`));
    if (site.lines.length === 1) expect(offered).toEqual(['choose-shift']);
  });

  it('records the chosen option with its reason, and refuses a blank reason as it is typed', async () => {
    const doc = demoDoc();
    const result = run(doc);
    const column = result.footings.boundary.find((o) => o.strap?.feasible)!.columnId;
    const { recorded } = mount(doc, result);
    openColumn(column);

    q('[data-testid="choose-strap"] input')!.click();
    const reason = q('[data-testid="footing-choice-reason"]') as HTMLTextAreaElement;
    reason.value = '   ';
    reason.dispatchEvent(new Event('input'));
    fixture.detectChanges();
    expect(text('mat-error')).toBe('Say why this option, in a sentence or two.');
    q('[data-testid="footing-choice-record"]')!.click();
    fixture.detectChanges();
    expect(recorded).toEqual([]);
    expect(document.activeElement).toBe(reason);

    reason.value = '  The neighbour will not allow a pad under the line.  ';
    reason.dispatchEvent(new Event('input'));
    fixture.detectChanges();
    expect(q('mat-error')).toBeNull();
    q('[data-testid="footing-choice-record"]')!.click();
    expect(recorded).toEqual([
      { columnId: column, option: 'strap', reason: 'The neighbour will not allow a pad under the line.' },
    ]);
  });

  it('refuses a reason over 2000 characters while it is typed', () => {
    const doc = demoDoc();
    const result = run(doc);
    const { recorded } = mount(doc, result);
    openColumn(result.footings.boundary[0].columnId);
    q('[data-testid="choose-shift"] input')!.click();
    const reason = q('[data-testid="footing-choice-reason"]') as HTMLTextAreaElement;
    reason.value = 'x'.repeat(2001);
    reason.dispatchEvent(new Event('input'));
    fixture.detectChanges();
    expect(text('mat-error')).toBe('Keep the reason to 2000 characters.');
    q('[data-testid="footing-choice-record"]')!.click();
    expect(recorded).toEqual([]);
  });

  it('shows a recorded choice read-only, with no form, to someone who may not edit', () => {
    const base = demoDoc();
    const result = run(base);
    const column = result.footings.boundary[0].columnId;
    const doc = {
      ...base,
      footingChoices: [{ columnId: column, option: 'shift' as const, reason: 'Bay can spare it.' }],
    };
    mount(doc, run(doc), false);
    const row = all('[data-testid="footing-site"]').find((r) => r.textContent?.includes('Move the column inward'));
    expect(row).toBeDefined();
    openColumn(column);
    expect(q('[data-testid="footing-choice-form"]')).toBeNull();
    expect(text('[data-testid="footing-choice-read"]')).toBe('Move the column inward Bay can spare it.');
  });

  it('warns, without blocking, about a recorded choice for a column no longer at a property line', () => {
    const base = demoDoc();
    const result = run(base);
    const atLine = new Set(footingSites(base, result).map((s) => s.columnId));
    const inner = base.columns.find((c) => !atLine.has(c.id))!;
    const doc = { ...base, footingChoices: [{ columnId: inner.id, option: 'strap' as const, reason: 'Old record.' }] };
    const res = run(doc);
    expect(staleChoices(doc, footingSites(doc, res))).toHaveLength(1);
    const { cleared } = mount(doc, res);
    expect(text('[data-testid="footing-stale"]')).toContain(
      `Out of date Recorded for ${inner.id}: Strap to an interior column. Column ${inner.id}'s own footing no longer crosses a property line`,
    );
    q('[data-testid="footing-stale-clear"]')!.click();
    expect(cleared).toEqual([inner.id]);
  });
});
