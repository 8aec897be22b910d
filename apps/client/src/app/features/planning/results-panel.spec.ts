import { ComponentFixture, TestBed } from '@angular/core/testing';
import { schemeSchema, type SchemeDocument } from '@trabeate/contracts';
import {
  CAUTION,
  analyseScheme,
  beamLineDiagram,
  demoScheme,
  type Scheme,
  type SchemeResult,
} from '@trabeate/structural';
import { fig } from './beam-line-chart';
import { ResultsPanel } from './results-panel';

// Fixtures are the engine's own output on the demo scheme (the document parsed by the contract),
// so the views are tested against what the worker really sends.
const demoDoc = (): SchemeDocument => schemeSchema.parse(demoScheme());

jest.setTimeout(30_000);

describe('ResultsPanel', () => {
  let fixture: ComponentFixture<ResultsPanel>;
  const el = () => fixture.nativeElement as HTMLElement;
  const all = (sel: string) => Array.from(el().querySelectorAll<HTMLElement>(sel));
  const one = (sel: string) => el().querySelector<HTMLElement>(sel) as HTMLElement;
  const settle = async (ms = 0) => {
    await new Promise((r) => setTimeout(r, ms));
    fixture.detectChanges();
    await fixture.whenStable();
    fixture.detectChanges();
  };
  /** waits for the in-thread worker's answer (it computes on a later task) */
  const drawn = async () => {
    for (let i = 0; i < 50 && !el().querySelector('[data-testid="moment-chart"]'); i++) await settle(20);
  };

  function open(document: SchemeDocument | undefined, result: SchemeResult | null): void {
    fixture = TestBed.createComponent(ResultsPanel);
    fixture.componentRef.setInput('document', document);
    fixture.componentRef.setInput('result', result);
    fixture.detectChanges();
  }

  const pick = (testId: string, value: string) => {
    const s = one(`[data-testid="${testId}"]`) as unknown as HTMLSelectElement;
    s.value = value;
    s.dispatchEvent(new Event('change'));
  };
  const rows = (table: string) =>
    all(`[data-testid="${table}"] tbody tr`).map((tr) =>
      Array.from(tr.querySelectorAll('td')).map((td) => (td.textContent ?? '').trim()),
    );

  it('waits for the engine with the caution already on view', () => {
    open(demoDoc(), null);
    expect(one('[data-testid="results-caution"]').textContent).toContain(CAUTION);
    expect(one('[data-testid="results-waiting"]').textContent).toContain('Waiting');
  });

  it('asks for the input problems to be fixed when the engine refuses the scheme', () => {
    const bad = { ...demoScheme(), columns: [] } as Scheme;
    const r = analyseScheme({ ...bad, basis: { ...bad.basis, storeys: 0 } });
    expect(r.ok).toBe(false);
    open(demoDoc(), r);
    expect(one('[data-testid="results-problems"]').textContent).toContain('input problems');
  });

  it("draws the chosen beam line's moment and shear envelopes with the engine's peaks, reactions and governing depth", async () => {
    const scheme = demoScheme();
    const result = analyseScheme(scheme);
    open(demoDoc(), result);
    const target = result.beamLines.find((b) => b.level === 'roof' && b.label === 'B');
    if (!target) throw new Error('no roof line B');
    one('[data-testid="results-view-lines"]').click();
    await settle();
    pick('beam-line-select', `roof|${target.lineId}`);
    await settle();
    await drawn();
    const d = beamLineDiagram(scheme, target.lineId, 'roof');
    expect(one('.diagrams').getAttribute('data-line')).toBe(`roof|${target.lineId}`);

    // the SVG is an image with a title and description, and both envelope paths are drawn
    const svg = one('[data-testid="moment-chart"] svg');
    expect(svg.getAttribute('role')).toBe('img');
    expect(svg.querySelector('title')?.textContent).toContain('Bending moment envelope, line B, roof');
    expect(svg.querySelector('desc')?.textContent).toContain('Largest sagging');
    for (const p of ['moment-upper', 'moment-lower', 'shear-upper', 'shear-lower'])
      expect(one(`[data-testid="${p}"]`).getAttribute('d')).toMatch(/^M[\d.]+ [\d.]+( L[\d.]+ [\d.-]+)+$/);

    // the printed peaks are the envelope's exact figures
    const sag = Math.max(...d.members.map((m) => m.maxMomentKNm));
    const hog = Math.min(...d.members.map((m) => m.minMomentKNm));
    const caption = one('[data-testid="moment-peaks"]').textContent ?? '';
    expect(caption).toContain(`Largest sagging ${fig(sag)} kN·m`);
    expect(caption).toContain(`largest hogging ${fig(hog)} kN·m`);
    expect(sag).toBe(Math.max(...target.members.map((m) => m.maxMomentKNm)));

    // reactions at the supports, each the largest factored reaction of the envelope
    const reactions = all('[data-testid="shear-chart"] .reaction').map((t) => t.textContent?.trim());
    expect(reactions).toEqual(
      target.reactions.filter((r) => r.columnId !== null).map((r) => `R ${fig(r.maxFactoredKN)} kN`),
    );

    // the table alternative holds every station
    expect(rows('moment-values')).toHaveLength(d.stations.length);
    expect(rows('moment-values')[0]).toEqual([
      '0.00',
      d.members[0].id,
      fig(d.stations[0].maxMomentKNm),
      fig(d.stations[0].minMomentKNm),
    ]);

    // the governing preliminary depth of the line and the rule that sets it
    const beams = result.sizes.beams.filter((b) => b.lineId === target.lineId);
    const g = beams.reduce((a, b) => (b.adoptedDepthMm > a.adoptedDepthMm ? b : a));
    const text = one('[data-testid="governing-depth"]').textContent ?? '';
    expect(text).toContain(`${g.adoptedDepthMm} mm`);
    expect(text).toContain(g.governs === 'moment' ? g.momentSource : g.spanDepthSource);
    expect(rows('line-depths')).toHaveLength(beams.length);
    expect(one('[data-testid="results-caution"]')).toBeTruthy();
  });

  it('redraws when the document changes and shows what the engine refuses as an error', async () => {
    const result = analyseScheme(demoScheme());
    open(demoDoc(), result);
    expect(one('[data-testid="results-choose"]')).toBeTruthy();
    one('[data-testid="results-view-lines"]').click();
    await settle();
    await drawn();
    expect(one('[data-testid="moment-chart"]')).toBeTruthy();
    // a line that the edited document no longer has: the engine's refusal is shown, not a stale drawing
    const edited = { ...demoDoc(), grid: demoDoc().grid.filter((g) => g.id !== 'A'), columns: [] };
    fixture.componentRef.setInput('document', edited);
    await settle();
    for (let i = 0; i < 50 && !el().querySelector('[data-testid="diagram-error"]'); i++) await settle(20);
    expect(one('[data-testid="diagram-error"]').textContent).toContain('could not be drawn');
    expect(el().querySelector('[data-testid="moment-chart"]')).toBeNull();
  });

  it('lists the column schedule per storey, sortable, with the tributary cross-check and capacity state', async () => {
    const result = analyseScheme(demoScheme());
    open(demoDoc(), result);
    one('[data-testid="results-view-columns"]').click();
    await settle();
    expect(rows('column-schedule')).toHaveLength(result.loads.columns.length);
    const a1 = result.loads.columns.find((c) => c.columnId === 'A1');
    if (!a1) throw new Error('no A1');
    const row = (id: string) => rows('column-schedule').find((r) => r[0] === id) as string[];
    const n = (v: number) => v.toLocaleString('en-GB', { maximumFractionDigits: 0 });
    expect(row('A1').slice(0, 5)).toEqual([
      a1.columnId,
      n(a1.deadKN[0]),
      n(a1.liveKN[0]),
      n(a1.factoredKN[0]),
      n(a1.tributaryKN[0]),
    ]);
    expect(row('A1')[6]).toBe('230 × 500');
    const a1Sizes = result.sizes.columns.find((c) => c.columnId === 'A1')!;
    const pct = (v: number) =>
      (v * 100).toLocaleString('en-GB', { minimumFractionDigits: 2, maximumFractionDigits: 2 });
    // the steel ratio has a column of its own, as a percentage with figures aligned
    expect(all('[data-testid="column-schedule"] th')[10].textContent).toContain('Steel needed (%)');
    expect(row('A1')[10]).toBe(pct(a1Sizes.steelRatio[0]));
    const steelCell = all('[data-testid="column-schedule"] tbody tr')
      .find((tr) => tr.querySelector('td')?.textContent?.trim() === 'A1')!
      .querySelectorAll('td')[10];
    expect(steelCell.classList).toContain('tb-figure');
    expect(row('A1')[11]).toContain(a1Sizes.utilisation[0] <= 1 ? 'Within' : 'Over');

    pick('storey-select', '3');
    await settle();
    expect(row('A1')[3]).toBe(n(a1.factoredKN[2]));
    expect(row('A1')[10]).toBe(pct(a1Sizes.steelRatio[2]));

    // sorting by factored load, then again for the other direction
    one('[data-testid="sort-factored"]').click();
    await settle();
    const third = result.loads.columns.map((c) => c.factoredKN[2]);
    expect(rows('column-schedule')[0][3]).toBe(n(Math.min(...third)));
    one('[data-testid="sort-factored"]').click();
    await settle();
    expect(rows('column-schedule')[0][3]).toBe(n(Math.max(...third)));
    expect(one('[data-testid="column-schedule"] th[aria-sort="descending"]').textContent).toContain('Factored');
  });

  it('lists every beam span and every footing in their schedules', async () => {
    const result = analyseScheme(demoScheme());
    open(demoDoc(), result);
    one('[data-testid="results-view-beams"]').click();
    await settle();
    expect(rows('beam-schedule')).toHaveLength(result.sizes.beams.length);
    const b0 = result.sizes.beams[0];
    expect(rows('beam-schedule')[0][0]).toBe(b0.memberId);
    expect(rows('beam-schedule')[0][8]).toBe(String(b0.adoptedDepthMm));
    expect(rows('beam-schedule')[0][9]).toBe(b0.providedDepthMm === null ? '—' : String(b0.providedDepthMm));
    one('[data-testid="results-view-footings"]').click();
    await settle();
    expect(rows('footing-schedule')).toHaveLength(result.sizes.footings.length);
    const f0 = result.sizes.footings[0];
    expect(rows('footing-schedule')[0][0]).toBe(f0.columnId);
    expect(rows('footing-schedule')[0][4]).toBe(f0.adoptedSideM.toFixed(2));
  });

  it("shows each stair flight against the code family's limits with their sources, and a flight that fails", async () => {
    const doc = demoDoc();
    const steep = { ...doc, stairs: doc.stairs.map((f) => ({ ...f, riserMm: 200 })) };
    const result = analyseScheme(steep as Scheme);
    open(steep, result);
    one('[data-testid="results-view-stairs"]').click();
    await settle();
    expect(all('[data-testid="stair-flight"]')).toHaveLength(steep.stairs.length);
    const riser = rows('stair-checks').filter((r) => r[0] === 'Stair riser height');
    // the engine's IS 456 family limit: riser at most 190 mm (codes.ts, National Building Code of India as quoted)
    const max = riser.find((r) => r[2].startsWith('at most')) as string[];
    expect(max).toEqual([
      'Stair riser height',
      '200',
      'at most 190 mm',
      expect.stringContaining('National Building Code of India'),
      'Fails',
    ]);
    expect(result.checks.some((c) => c.ruleId === 'stair.riser' && c.elements.includes(steep.stairs[0].id))).toBe(true);
    expect(rows('stair-checks').some((r) => r[4] === 'Meets it')).toBe(true);
  });
});
