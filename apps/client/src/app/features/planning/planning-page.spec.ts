import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ANIMATION_MODULE_TYPE } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { provideRouter, withComponentInputBinding } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatSelectHarness } from '@angular/material/select/testing';
import { schemeDetailSchema, type SchemeDetail } from '@trabeate/contracts';
import { demoSchemeVariant } from '@trabeate/structural';
import { PlanningPage } from './planning-page';

const PROJECT = '00000000-0000-4000-8000-000000000301';
const SCHEME = '00000000-0000-4000-8000-000000000402';
const URL = `/api/projects/${PROJECT}/schemes/${SCHEME}`;

// Parsed by the contract, so a reply the API could never send fails here.
const detail = (): SchemeDetail =>
  schemeDetailSchema.parse({
    id: SCHEME,
    projectId: PROJECT,
    name: 'Tamarind Row without B3',
    archivedAt: null,
    createdAt: '2026-11-30T09:00:00.000Z',
    canEdit: true,
    current: {
      version: 3,
      savedAt: '2026-12-01T10:00:00.000Z',
      savedBy: { id: '00000000-0000-4000-8000-000000000202', displayName: 'Cato Brennagh' },
      restoredFrom: null,
      schemaVersion: 1,
      checks: { engineVersion: '0.1.0', ok: true, errors: 3, warnings: 12 },
    },
    document: { ...demoSchemeVariant(), id: SCHEME, name: 'Tamarind Row without B3' },
  });

// The first test compiles the page's templates, which takes seconds on a busy shared machine.
jest.setTimeout(30_000);

describe('PlanningPage', () => {
  let harness: RouterTestingHarness;
  let backend: HttpTestingController;
  const el = () => harness.routeNativeElement as HTMLElement;
  const all = (sel: string) => Array.from(el().querySelectorAll<HTMLElement>(sel));
  const settle = async (ms = 0) => {
    await new Promise((r) => setTimeout(r, ms));
    harness.detectChanges();
  };

  async function open(answer: (req: ReturnType<HttpTestingController['expectOne']>) => void): Promise<void> {
    TestBed.configureTestingModule({
      providers: [
        provideRouter(
          [{ path: 'projects/:projectId/schemes/:schemeId', component: PlanningPage }],
          withComponentInputBinding(),
        ),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: ANIMATION_MODULE_TYPE, useValue: 'NoopAnimations' },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    harness = await RouterTestingHarness.create();
    void harness.navigateByUrl(`/projects/${PROJECT}/schemes/${SCHEME}`);
    await settle();
    answer(backend.expectOne(URL));
    await settle();
    // the engine's answer arrives on a later task, as from a worker
    await settle(10);
  }

  afterEach(() => document.querySelectorAll('.cdk-overlay-container').forEach((n) => n.remove()));

  it('shows the caution on the planning screen itself, before and after the checks arrive', async () => {
    await open((req) => req.flush(detail()));
    const caution = el().querySelector('[data-testid="caution"]')?.textContent ?? '';
    expect(caution).toContain('Preliminary');
    expect(caution).toMatch(/local regulations apply/);
    expect(caution).toMatch(/licensed structural engineer/);
  });

  it('draws the plan: grid lines labelled letters one way and numbers the other, columns, property lines', async () => {
    await open((req) => req.flush(detail()));
    const labels = all('[data-testid="grid-label"] text').map((t) => t.textContent?.trim());
    expect(labels).toEqual(['A', 'B', 'C', 'D', '1', '2', '3', '4', '5']);
    expect(all('[data-column]')).toHaveLength(19);
    expect(all('[data-column="B3"]')).toHaveLength(0);
    expect(all('[data-testid="property-line"]')).toHaveLength(2);
  });

  it("lists the engine's failed checks with a marker on the plan, and explains the one chosen", async () => {
    await open((req) => req.flush(detail()));
    const checks = all('[data-testid="check"]');
    const span = checks.find((c) => c.textContent?.includes('continuous span 8.4 m'));
    expect(span).toBeDefined();
    expect(all('[data-testid="marker-beam.span"]')).toHaveLength(1);
    // no marker hides another: the span and the column spacing under it share a spot on the plan
    const spots = all('.marker').map((m) => m.getAttribute('transform'));
    expect(new Set(spots).size).toBe(spots.length);

    span!.click();
    await settle();
    const explained = el().querySelector('[data-testid="check-explained"]')?.textContent ?? '';
    expect(explained).toContain('Beam span against the limit for its support condition');
    // 8 m for continuous beams: common practice (libs/structural codes.ts, beamSpanContinuousMaxM)
    expect(el().querySelector('[data-testid="check-numbers"]')?.textContent).toContain(
      '8.4 m against a limit of at most 8 m',
    );
    expect(el().querySelector('[data-testid="check-source"]')?.textContent).toContain('(common practice)');
    // the span the check names is drawn highlighted on the plan
    expect(all('[data-beam].hl').map((b) => b.getAttribute('data-beam'))).toEqual(['B-3/A-C']);
  });

  it('chooses a check from its marker on the plan as well, by click or keyboard', async () => {
    await open((req) => req.flush(detail()));
    const marker = el().querySelector<SVGGElement>('[data-testid="marker-beam.span"]')!;
    marker.dispatchEvent(new KeyboardEvent('keydown', { key: 'Enter' }));
    await settle();
    expect(el().querySelector('.check.chosen')?.textContent).toContain('continuous span 8.4 m');
    expect(marker.getAttribute('aria-label')).toMatch(/^worth a look: /);
  });

  it('filters the list by severity and by rule', async () => {
    await open((req) => req.flush(detail()));
    const loader = TestbedHarnessEnvironment.loader(harness.fixture);
    const [severity, rule] = await loader.getAllHarnesses(MatSelectHarness);
    await severity.open();
    await severity.clickOptions({ text: 'Must fix' });
    await settle();
    const errors = all('[data-testid="check"]');
    expect(errors.length).toBeGreaterThan(0);
    expect(errors.every((c) => c.classList.contains('error'))).toBe(true);

    await severity.open();
    await severity.clickOptions({ text: 'All' });
    await rule.open();
    await rule.clickOptions({ text: 'Footing crossing a property line' });
    await settle();
    const footings = all('[data-testid="check"]');
    expect(footings.length).toBeGreaterThan(3);
    expect(footings.every((c) => c.textContent?.includes('would cross property line'))).toBe(true);
  });

  it('says why when the scheme cannot be loaded, with a way to try again', async () => {
    await open((req) =>
      req.flush(
        { error: { code: 'not_found', message: 'No scheme with this id in this project.' } },
        { status: 404, statusText: 'Not Found' },
      ),
    );
    expect(el().querySelector('[data-testid="scheme-error"]')?.textContent).toContain(
      'No scheme with this id in this project.',
    );
    expect(el().querySelector('[data-testid="caution"]')).not.toBeNull();
  });
});
