import { LiveAnnouncer } from '@angular/cdk/a11y';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting, type TestRequest } from '@angular/common/http/testing';
import { ANIMATION_MODULE_TYPE, Component } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { provideRouter, withComponentInputBinding } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { schemeDetailSchema, schemeListSchema, schemeSchema, type SchemeList } from '@trabeate/contracts';
import { demoScheme } from '@trabeate/structural';
import { SchemesPage } from './schemes-page';

const PROJECT = '00000000-0000-4000-8000-000000000301';
const LIST = `/api/projects/${PROJECT}/schemes`;
const id = (n: number) => `00000000-0000-4000-8000-00000000040${n}`;
const checks = { engineVersion: '0.1.0', ok: true, errors: 1, warnings: 4 };

// Built through the contract, so a reply the API could never send fails the test.
const list = (canEdit: boolean, names: string[] = ['Full grid', 'One column fewer']): SchemeList =>
  schemeListSchema.parse({
    items: names.map((name, i) => ({
      id: id(i + 1),
      name,
      version: i + 2,
      archived: false,
      createdAt: '2026-11-20T08:00:00.000Z',
      updatedAt: '2026-12-01T08:30:00.000Z',
      savedBy: { id: '00000000-0000-4000-8000-000000000202', displayName: 'Cato Brennagh' },
      columns: 20 - i,
      checks,
    })),
    total: names.length,
    page: 1,
    pageSize: 25,
    canEdit,
  });

@Component({ template: 'planning' })
class PlanningStub {}

// The first test compiles the page's templates, which takes seconds on a busy shared machine.
jest.setTimeout(30_000);

describe('SchemesPage', () => {
  let harness: RouterTestingHarness;
  let backend: HttpTestingController;
  let announced: string[];
  const el = () => harness.routeNativeElement as HTMLElement;
  const settle = async () => {
    await new Promise((r) => setTimeout(r, 0));
    harness.detectChanges();
  };
  const listRequest = (): TestRequest => backend.expectOne((r) => r.url === LIST && r.method === 'GET');

  async function open(data: SchemeList): Promise<void> {
    announced = [];
    TestBed.configureTestingModule({
      providers: [
        provideRouter(
          [
            { path: 'projects/:projectId/schemes', component: SchemesPage },
            { path: 'projects/:projectId/schemes/:schemeId', component: PlanningStub },
          ],
          withComponentInputBinding(),
        ),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: ANIMATION_MODULE_TYPE, useValue: 'NoopAnimations' },
        { provide: LiveAnnouncer, useValue: { announce: async (m: string) => void announced.push(m) } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    harness = await RouterTestingHarness.create();
    void harness.navigateByUrl(`/projects/${PROJECT}/schemes`);
    await settle();
    const req = listRequest();
    expect(req.request.params.get('sort')).toBe('updatedAt');
    req.flush(data);
    await settle();
  }

  it('lists the schemes with their saves, columns and the checks of the last save', async () => {
    await open(list(true));
    const rows = Array.from(el().querySelectorAll('tr.mat-mdc-row'));
    expect(rows.map((r) => r.querySelector('[data-testid="scheme-link"]')?.textContent?.trim())).toEqual([
      'Full grid',
      'One column fewer',
    ]);
    expect(rows[1].querySelector('[data-testid="scheme-checks"]')?.textContent).toContain('▲ 4 worth a look');
  });

  it('asks the server for the next sort order instead of sorting the page it has', async () => {
    await open(list(true));
    el().querySelector<HTMLElement>('th[mat-sort-header="name"] .mat-sort-header-container')!.click();
    await settle();
    const req = listRequest();
    expect([
      req.request.params.get('sort'),
      req.request.params.get('direction'),
      req.request.params.get('page'),
    ]).toEqual(['name', 'asc', '1']);
    req.flush(list(true));
  });

  it('creates a scheme from the design basis and opens it; a blank name is refused as you type', async () => {
    await open(list(true));
    const input = el().querySelector<HTMLInputElement>('[data-testid="new-name"]')!;
    input.value = '   ';
    input.dispatchEvent(new Event('input'));
    await settle();
    expect(el().querySelector('mat-error')?.textContent).toContain('cannot be only spaces');
    el().querySelector<HTMLButtonElement>('[data-testid="create-scheme"]')!.click();
    await settle();
    backend.expectNone((r) => r.method === 'POST');

    input.value = 'Transfer deck';
    input.dispatchEvent(new Event('input'));
    el().querySelector<HTMLButtonElement>('[data-testid="create-scheme"]')!.click();
    await settle();
    const post = backend.expectOne((r) => r.url === LIST && r.method === 'POST');
    expect(post.request.body).toEqual({ name: 'Transfer deck' });
    post.flush(
      schemeDetailSchema.parse({
        id: id(9),
        projectId: PROJECT,
        name: 'Transfer deck',
        archivedAt: null,
        createdAt: '2026-12-02T08:00:00.000Z',
        canEdit: true,
        current: {
          version: 1,
          savedAt: '2026-12-02T08:00:00.000Z',
          savedBy: null,
          restoredFrom: null,
          schemaVersion: 1,
          checks,
        },
        document: schemeSchema.parse({ ...demoScheme(), id: id(9), name: 'Transfer deck' }),
      }),
    );
    await settle();
    await settle();
    expect(el().textContent).toContain('planning');
  });

  it('shows the principal the schemes without the means to change them', async () => {
    await open(list(false));
    expect(el().querySelector('[data-testid="create-form"]')).toBeNull();
    expect(el().querySelector('[data-testid="duplicate"]')).toBeNull();
    expect(el().querySelectorAll('[data-testid="scheme-link"]')).toHaveLength(2);
  });

  it('says so when the project has no schemes yet', async () => {
    await open(list(false, []));
    expect(el().querySelector('[data-testid="schemes-empty"]')?.textContent).toContain('No schemes yet');
  });

  it("after a failed create or rename, focus goes to that form's name field and the count is announced", async () => {
    await open(list(true));
    const create = el().querySelector<HTMLButtonElement>('[data-testid="create-scheme"]')!;
    create.focus();
    create.click();
    await settle();
    expect(document.activeElement).toBe(el().querySelector('[data-testid="new-name"]'));
    expect(announced).toEqual(['1 field needs attention.']);

    el().querySelector<HTMLButtonElement>('[data-testid="rename"]')!.click();
    await settle();
    const rename = el().querySelector<HTMLInputElement>('[data-testid="rename-input"]')!;
    rename.value = '';
    rename.dispatchEvent(new Event('input'));
    await settle();
    const save = el().querySelector<HTMLButtonElement>('form.rename button[type="submit"]')!;
    save.focus();
    save.click();
    await settle();
    // The empty create field above the table is in error too; the row being renamed keeps the focus.
    expect(document.activeElement).toBe(rename);
    expect(announced).toEqual(['1 field needs attention.', '1 field needs attention.']);
    backend.expectNone((r) => r.method !== 'GET');
  });
});
