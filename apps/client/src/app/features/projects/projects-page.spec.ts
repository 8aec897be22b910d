import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, TestRequest, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { Router, provideRouter, withComponentInputBinding } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import {
  clientOrganisationSchema,
  meSchema,
  projectListSchema,
  type ProjectList,
  type ProjectListItem,
} from '@trabeate/contracts';
import { reply, replyError } from '../../../testing/api-replies';
import { Session } from '../../core/auth/session';
import { grantedMe } from '../../core/auth/testing';
import { ProjectsPage } from './projects-page';

const ORG = { id: '00000000-0000-4000-8000-000000000101', name: 'Quillon Terrace Homes' };

function item(n: number, extra: Partial<ProjectListItem> = {}): ProjectListItem {
  return {
    id: `00000000-0000-4000-8000-0000000003${String(n).padStart(2, '0')}`,
    reference: `QTH-${n}`,
    name: `Block ${n}`,
    clientOrganisation: ORG,
    siteAddress: '4 Ferrow Lane',
    storeys: 5,
    archived: false,
    updatedAt: '2026-03-02T08:00:00.000Z',
    currentStage: { key: 'column_layout', title: 'Column layout', state: 'under_review' },
    lateStages: 0,
    ...extra,
  };
}
const page = (items: ProjectListItem[], total = items.length, p = 1, pageSize = 25): ProjectList => ({
  items,
  total,
  page: p,
  pageSize,
});

describe('ProjectsPage', () => {
  let backend: HttpTestingController;
  let harness: RouterTestingHarness;
  const el = () => harness.routeNativeElement as HTMLElement;
  const listRequest = () => backend.expectOne((r) => r.url === '/api/projects');
  const params = (req: TestRequest) =>
    Object.fromEntries(req.request.params.keys().map((k) => [k, req.request.params.get(k)]));
  const settle = async () => {
    await new Promise((r) => setTimeout(r));
    harness.detectChanges();
  };

  async function open(url: string, role: 'principal' | 'engineer' = 'principal'): Promise<void> {
    TestBed.configureTestingModule({
      providers: [
        provideRouter([{ path: 'projects', component: ProjectsPage }], withComponentInputBinding()),
        provideHttpClient(),
        provideHttpClientTesting(),
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    const loaded = TestBed.inject(Session).load();
    reply(backend.expectOne('/api/me'), meSchema, grantedMe(role));
    await loaded;
    harness = await RouterTestingHarness.create();
    void harness.navigateByUrl(url);
    await settle();
    if (role === 'principal')
      reply(backend.expectOne('/api/client-organisations'), clientOrganisationSchema.array(), [ORG]);
  }

  afterEach(() => backend.verify());

  it('asks the server for the first page, newest reference first, of active projects by default', async () => {
    await open('/projects');
    const req = listRequest();
    expect(params(req)).toEqual({ page: '1', pageSize: '25', sort: 'reference', direction: 'desc', status: 'active' });
    reply(req, projectListSchema, page([item(1), item(2, { lateStages: 2 })]));
    await settle();
    const rows = el().querySelectorAll('[data-testid="projects-table"] tr.mat-mdc-row');
    expect(rows.length).toBe(2);
    expect(rows[0].textContent).toContain('QTH-1');
    expect(rows[0].textContent).toContain('Column layout');
    expect(rows[0].textContent).toContain('Under review');
    expect(rows[1].querySelector('.late')?.textContent).toContain('2');
  });

  it('reads page, size, sort and filters from the address, so reload and back return to the same view', async () => {
    await open(`/projects?page=3&pageSize=10&sort=name&direction=asc&q=ferrow&client=${ORG.id}&status=all`);
    expect(params(listRequest())).toEqual({
      page: '3',
      pageSize: '10',
      sort: 'name',
      direction: 'asc',
      status: 'all',
      q: 'ferrow',
      clientOrganisationId: ORG.id,
    });
  });

  it('sorting by a column puts the sort in the address, back on page 1, and asks the server again', async () => {
    await open('/projects?page=2');
    reply(listRequest(), projectListSchema, page([item(1)], 30, 2));
    await settle();
    const clientHeader = Array.from(el().querySelectorAll<HTMLElement>('th .mat-sort-header-container')).find((h) =>
      h.textContent?.includes('Client'),
    );
    clientHeader!.click();
    await settle();
    expect(TestBed.inject(Router).url).toBe('/projects?sort=client&direction=asc');
    expect(params(listRequest())).toMatchObject({ page: '1', sort: 'client', direction: 'asc' });
  });

  it('paging moves to the next page with the server and keeps the sort', async () => {
    await open('/projects?sort=updatedAt&direction=desc');
    reply(
      listRequest(),
      projectListSchema,
      page(
        Array.from({ length: 25 }, (_, i) => item(i + 1)),
        60,
      ),
    );
    await settle();
    (el().querySelector('button.mat-mdc-paginator-navigation-next') as HTMLButtonElement).click();
    await settle();
    expect(params(listRequest())).toMatchObject({ page: '2', pageSize: '25', sort: 'updatedAt', direction: 'desc' });
  });

  it('searching waits for a pause in typing, then asks once for what was typed', async () => {
    await open('/projects');
    reply(listRequest(), projectListSchema, page([item(1)]));
    const input = el().querySelector('[data-testid="project-search"]') as HTMLInputElement;
    for (const text of ['f', 'fe', 'fer']) {
      input.value = text;
      input.dispatchEvent(new Event('input'));
      await new Promise((r) => setTimeout(r, 50));
    }
    backend.expectNone((r) => r.url === '/api/projects');
    await new Promise((r) => setTimeout(r, 350));
    await settle();
    expect(params(listRequest())).toMatchObject({ q: 'fer', page: '1' });
  });

  it('says so when no project matches the filters, and offers to clear them', async () => {
    await open('/projects?q=zzz');
    reply(listRequest(), projectListSchema, page([], 0));
    await settle();
    expect(el().textContent).toContain('No projects match');
  });

  it('shows the server’s reason when the list cannot be loaded', async () => {
    await open('/projects');
    replyError(listRequest(), 500, { code: 'internal', message: 'The database is away.' });
    await settle();
    expect(el().querySelector('[data-testid="projects-error"]')?.textContent).toContain('The database is away.');
  });

  it('offers “New project” and the client filter to the principal only', async () => {
    await open('/projects', 'engineer');
    reply(listRequest(), projectListSchema, page([item(1)]));
    await settle();
    expect(el().querySelector('[data-testid="new-project"]')).toBeNull();
    expect(el().querySelector('[data-testid="client-filter"]')).toBeNull();
  });
});
