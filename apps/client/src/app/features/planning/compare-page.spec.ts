import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ANIMATION_MODULE_TYPE } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { provideRouter, withComponentInputBinding } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { schemeDetailSchema, type SchemeDetail } from '@trabeate/contracts';
import { analyseScheme, demoScheme, demoSchemeVariant, type Scheme } from '@trabeate/structural';
import { ComparePage } from './compare-page';

// The first test compiles the page's templates, which takes seconds on a busy shared machine.
jest.setTimeout(30_000);

const PROJECT = '00000000-0000-4000-8000-000000000301';
const A = '00000000-0000-4000-8000-000000000401';
const B = '00000000-0000-4000-8000-000000000402';

// Parsed by the contract, so a reply the API could never send fails here.
const detail = (id: string, name: string, doc: Scheme): SchemeDetail =>
  schemeDetailSchema.parse({
    id,
    projectId: PROJECT,
    name,
    archivedAt: null,
    createdAt: '2026-11-30T09:00:00.000Z',
    canEdit: false,
    current: {
      version: 1,
      savedAt: '2026-12-01T10:00:00.000Z',
      savedBy: null,
      restoredFrom: null,
      schemaVersion: 1,
      checks: { engineVersion: '0.1.0', ok: true, errors: 0, warnings: 0 },
    },
    document: { ...doc, id, name },
  });

describe('ComparePage', () => {
  let harness: RouterTestingHarness;
  let backend: HttpTestingController;
  const el = () => harness.routeNativeElement as HTMLElement;
  const settle = async (ms = 0) => {
    await new Promise((r) => setTimeout(r, ms));
    harness.detectChanges();
  };

  async function open(url: string): Promise<void> {
    TestBed.configureTestingModule({
      providers: [
        provideRouter(
          [{ path: 'projects/:projectId/schemes/compare', component: ComparePage }],
          withComponentInputBinding(),
        ),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: ANIMATION_MODULE_TYPE, useValue: 'NoopAnimations' },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    harness = await RouterTestingHarness.create();
    void harness.navigateByUrl(url);
    await settle();
  }

  it('shows both plans, the figures side by side and the plain words on what drives the cost', async () => {
    await open(`/projects/${PROJECT}/schemes/compare?a=${A}&b=${B}`);
    backend.expectOne(`/api/projects/${PROJECT}/schemes/${A}`).flush(detail(A, 'Full grid', demoScheme()));
    backend.expectOne(`/api/projects/${PROJECT}/schemes/${B}`).flush(detail(B, 'Without B3', demoSchemeVariant()));
    await settle();
    await settle(10);
    expect(el().querySelectorAll('tb-plan-view')).toHaveLength(2);
    const summary = el().querySelector('[data-testid="compare-summary"]')?.textContent ?? '';
    expect(summary).toContain('Without B3 has 1 column fewer than Full grid');
    expect(summary).toMatch(/longest beam span is 8\.40 m against 4\.20 m/);
    const rows = Array.from(el().querySelectorAll('[data-testid="compare-table"] tbody tr')).map((r) =>
      Array.from(r.children).map((c) => c.textContent?.trim()),
    );
    expect(rows.find((r) => r[0] === 'columns')).toEqual(['columns', '20 no.', '19 no.', '−1 no.']);
    // the demo prices in INR (libs/structural demo.ts); money goes through Intl.NumberFormat
    const cost = rows.find((r) => r[0] === 'cost')!;
    expect(cost[1]).toMatch(/^₹[\d,]+$/);
    expect(el().querySelector('[data-testid="caution"]')?.textContent).toMatch(/licensed structural engineer/);
  });

  it("counts each scheme's failed checks by the engine's severities, not as one number", async () => {
    await open(`/projects/${PROJECT}/schemes/compare?a=${A}&b=${B}`);
    backend.expectOne(`/api/projects/${PROJECT}/schemes/${A}`).flush(detail(A, 'Full grid', demoScheme()));
    backend.expectOne(`/api/projects/${PROJECT}/schemes/${B}`).flush(detail(B, 'Without B3', demoSchemeVariant()));
    await settle();
    await settle(10);
    // counted here from the engine's own results, independently of the comparison
    const count = (doc: Scheme, sev: string) =>
      analyseScheme(doc).checks.filter((c) => c.status === 'fail' && c.severity === sev).length;
    const shown = (i: number) => {
      const dd = el().querySelector(`[data-testid="check-counts-${i}"]`)!;
      return Object.fromEntries(
        Array.from(dd.querySelectorAll('[data-severity]')).map((e) => [
          e.getAttribute('data-severity'),
          e.textContent?.replace(/\s+/g, ' ').trim(),
        ]),
      );
    };
    for (const [i, doc] of [demoScheme(), demoSchemeVariant()].entries())
      expect(shown(i)).toEqual({
        error: `${count(doc, 'error')} Must fix`,
        warning: `${count(doc, 'warning')} Worth a look`,
        info: `${count(doc, 'info')} Note`,
      });
    // the variant's point load on the long span is among its failures, so the counts differ
    expect(shown(1)).not.toEqual(shown(0));
    const rows = Array.from(el().querySelectorAll('[data-testid="compare-table"] tbody tr')).map(
      (r) => r.children[0].textContent?.trim() ?? '',
    );
    expect(rows).toEqual(
      expect.arrayContaining(['failed checks: errors', 'failed checks: warnings', 'failed checks: notes']),
    );
    expect(rows).not.toContain('failed checks');
  });

  it('asks for two schemes when the address names fewer', async () => {
    await open(`/projects/${PROJECT}/schemes/compare?a=${A}`);
    expect(el().querySelector('[data-testid="compare-pick"]')).not.toBeNull();
    backend.expectNone(`/api/projects/${PROJECT}/schemes/${A}`);
  });
});
