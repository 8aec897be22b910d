import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, TestRequest, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter, withComponentInputBinding } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import {
  drawingListSchema,
  drawingSchema,
  nextNumberSchema,
  projectListSchema,
  transmittalListSchema,
  transmittalSchema,
  type Role,
} from '@trabeate/contracts';
import { Session } from '../../core/auth/session';
import { grantedMe } from '../../core/auth/testing';
import { UPLOAD_HTTP } from '../projects/projects-api';
import { HttpClient } from '@angular/common/http';
import { DrawingsPage } from './drawings-page';

// Fixtures go through the contracts' schemas: a shape the API would never send fails here first.
const PROJECT = '00000000-0000-4000-8000-000000000301';
const DRAWING = '00000000-0000-4000-8000-000000000501';
const REVISION = '00000000-0000-4000-8000-000000000601';
const TRANSMITTAL = '00000000-0000-4000-8000-000000000701';
const ME = '00000000-0000-4000-8000-000000000201';
const OTHER = '00000000-0000-4000-8000-000000000202';

const projects = projectListSchema.parse({
  items: [
    {
      id: PROJECT,
      reference: 'QT-07',
      name: 'Quillon Terrace',
      clientOrganisation: { id: '00000000-0000-4000-8000-000000000101', name: 'Quillon Terrace Homes' },
      siteAddress: '4 Ferrow Lane',
      storeys: 5,
      archived: false,
      updatedAt: '2026-03-02T08:00:00.000Z',
      currentStage: null,
      lateStages: 0,
    },
  ],
  total: 1,
  page: 1,
  pageSize: 100,
});

const revision = (over: object = {}) => ({
  id: REVISION,
  drawingId: DRAWING,
  code: 'P01',
  series: 'preliminary',
  suitability: 'S2',
  purpose: 'information',
  description: 'For coordination with the level 1 plan',
  date: '2026-03-01',
  state: 'draft',
  drawnBy: { id: OTHER, displayName: 'Corin Ashdale' },
  checkedBy: null,
  approvedBy: null,
  issuedAt: null,
  fromScheme: null,
  files: [
    {
      id: '00000000-0000-4000-8000-000000000801',
      role: 'pdf',
      fileName: 'QT-S-101 Ground floor.pdf',
      sizeBytes: 20480,
      sha256: 'a'.repeat(64),
      contentType: 'application/pdf',
      uploadedAt: '2026-03-01T09:00:00.000Z',
      downloadUrl: `/api/projects/${PROJECT}/revisions/${REVISION}/files/00000000-0000-4000-8000-000000000801/download`,
    },
  ],
  allowedActions: ['check'],
  ...over,
});

const listItem = (over: object = {}) => ({
  id: DRAWING,
  number: 'QT-S-101',
  title: 'Ground floor columns',
  stageKey: 'column_layout',
  sheetSize: 'A1',
  scale: '1:100',
  current: { id: REVISION, code: 'P01', suitability: 'S2', state: 'draft', date: '2026-03-01', issuedAt: null },
  revisionCount: 1,
  ...over,
});

// The first test also pays for compiling Material's table and forms on a busy two-core machine.
jest.setTimeout(20_000);

describe('DrawingsPage', () => {
  let backend: HttpTestingController;
  let harness: RouterTestingHarness;
  const el = () => harness.routeNativeElement as HTMLElement;
  const settle = async () => {
    await new Promise((r) => setTimeout(r));
    harness.detectChanges();
    await new Promise((r) => setTimeout(r));
    harness.detectChanges();
  };
  const params = (req: TestRequest) =>
    Object.fromEntries(req.request.params.keys().map((k) => [k, req.request.params.get(k)]));
  const registerRequest = (state?: string) =>
    backend.expectOne(
      (r) =>
        r.url === `/api/projects/${PROJECT}/drawings` &&
        (state ? r.params.get('state') === state : !r.params.has('state') || r.params.get('state') !== 'approved'),
    );

  async function open(url: string, role: Role): Promise<void> {
    TestBed.configureTestingModule({
      providers: [
        provideRouter([{ path: 'drawings', component: DrawingsPage }], withComponentInputBinding()),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: UPLOAD_HTTP, useFactory: () => TestBed.inject(HttpClient) },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    const loaded = TestBed.inject(Session).load();
    backend.expectOne('/api/me').flush({ ...grantedMe(role), user: { ...grantedMe(role).user, id: ME } });
    await loaded;
    harness = await RouterTestingHarness.create();
    void harness.navigateByUrl(url);
    await settle();
    backend.expectOne((r) => r.url === '/api/projects').flush(projects);
    await settle();
  }

  afterEach(() => backend.verify());

  it('asks the server for the sorted, filtered page of the register and shows states in words', async () => {
    await open('/drawings?sort=date&direction=desc&state=draft&q=ground', 'engineer');
    const req = registerRequest();
    expect(params(req)).toEqual({
      page: '1',
      pageSize: '25',
      sort: 'date',
      direction: 'desc',
      q: 'ground',
      state: 'draft',
    });
    req.flush(drawingListSchema.parse({ items: [listItem()], total: 1, page: 1, pageSize: 25 }));
    backend.expectOne(`/api/projects/${PROJECT}/transmittals`).flush(transmittalListSchema.parse([]));
    await settle();
    const rows = el().querySelectorAll('[data-testid="drawings-table"] tr.mat-mdc-row');
    expect(rows).toHaveLength(1);
    expect(rows[0].textContent).toContain('QT-S-101');
    expect(rows[0].textContent).toContain('Draft');
    expect(rows[0].textContent).toContain('Column layout');
    expect(el().querySelector('[data-testid="no-transmittals"]')?.textContent).toContain(
      'No drawings have been issued',
    );
  });

  it('opens a drawing, checks its revision, and shows the server’s reason when it refuses', async () => {
    await open(`/drawings?drawing=${DRAWING}`, 'engineer');
    registerRequest().flush(drawingListSchema.parse({ items: [listItem()], total: 1, page: 1, pageSize: 25 }));
    backend.expectOne(`/api/projects/${PROJECT}/transmittals`).flush([]);
    backend
      .expectOne(`/api/projects/${PROJECT}/drawings/${DRAWING}`)
      .flush(drawingSchema.parse({ ...listItem(), revisions: [revision()], canRegisterRevision: false }));
    await settle();
    const history = el().querySelector('[data-testid="revision-history"]')!;
    expect(history.textContent).toContain('P01');
    expect(history.textContent).toContain('Shared for information');
    expect(history.textContent).toContain('Drawn by Corin Ashdale');

    (el().querySelector('[data-testid="revision-check"]') as HTMLButtonElement).click();
    await settle();
    const post = backend.expectOne(`/api/projects/${PROJECT}/revisions/${REVISION}/transitions`);
    expect(post.request.body).toEqual({ action: 'check' });
    post.flush(
      { error: { code: 'conflict', message: 'Revision P01 has no PDF yet; upload its PDF before it is checked.' } },
      { status: 409, statusText: 'Conflict' },
    );
    await settle();
    expect(el().querySelector('[data-testid="drawing-refusal"]')?.textContent).toContain('has no PDF yet');
  });

  it('shows a client contact the transmittals sent to them, and acknowledges receipt', async () => {
    await open(`/drawings?transmittal=${TRANSMITTAL}`, 'client');
    registerRequest().flush(
      drawingListSchema.parse({
        items: [
          listItem({
            current: {
              id: REVISION,
              code: 'P01',
              suitability: 'S2',
              state: 'issued',
              date: '2026-03-01',
              issuedAt: '2026-03-02T10:00:00.000Z',
            },
          }),
        ],
        total: 1,
        page: 1,
        pageSize: 25,
      }),
    );
    const transmittal = transmittalSchema.parse({
      id: TRANSMITTAL,
      number: 1,
      reference: 'QT-07-TR-001',
      purpose: 'coordination',
      note: '',
      issuedBy: { id: OTHER, displayName: 'Corin Ashdale' },
      issuedAt: '2026-03-02T10:00:00.000Z',
      linksExpireAt: '2026-03-16T10:00:00.000Z',
      items: [
        {
          revisionId: REVISION,
          drawingId: DRAWING,
          number: 'QT-S-101',
          title: 'Ground floor columns',
          code: 'P01',
          suitability: 'S2',
          purpose: 'information',
          date: '2026-03-01',
          state: 'issued',
          files: revision().files,
        },
      ],
      recipients: [
        {
          id: '00000000-0000-4000-8000-000000000901',
          email: 'aster@example.test',
          name: 'Aster Pellow',
          userId: ME,
          acknowledgedAt: null,
        },
      ],
      sheetUrl: `/api/projects/${PROJECT}/transmittals/${TRANSMITTAL}/sheet`,
      zipUrl: `/api/projects/${PROJECT}/transmittals/${TRANSMITTAL}/zip`,
      myAcknowledgement: { acknowledgedAt: null },
    });
    backend.expectOne(`/api/projects/${PROJECT}/transmittals`).flush(
      transmittalListSchema.parse([
        {
          id: TRANSMITTAL,
          number: 1,
          reference: 'QT-07-TR-001',
          purpose: 'coordination',
          issuedAt: '2026-03-02T10:00:00.000Z',
          myAcknowledgement: { acknowledgedAt: null },
          itemCount: 1,
          recipientCount: 1,
          acknowledgedCount: 0,
        },
      ]),
    );
    backend.expectOne(`/api/projects/${PROJECT}/transmittals/${TRANSMITTAL}`).flush(transmittal);
    await settle();
    expect(el().querySelector('[data-testid="new-drawing"]')).toBeNull();
    expect(el().querySelector('[data-testid="transmittal-list"]')?.textContent).toContain(
      'Awaiting your acknowledgement',
    );
    const detail = el().querySelector('[data-testid="transmittal-detail"]')!;
    expect(detail.querySelector('[data-testid="zip-download"]')?.getAttribute('href')).toBe(transmittal.zipUrl);
    expect(detail.querySelector('[data-testid="recipients"]')).toBeNull();

    (el().querySelector('[data-testid="acknowledge"]') as HTMLButtonElement).click();
    await settle();
    const ack = backend.expectOne(`/api/projects/${PROJECT}/transmittals/${TRANSMITTAL}/acknowledge`);
    expect(ack.request.method).toBe('POST');
    ack.flush({ ...transmittal, myAcknowledgement: { acknowledgedAt: '2026-03-03T08:00:00.000Z' } });
    await settle();
    backend.expectOne(`/api/projects/${PROJECT}/transmittals`).flush([]);
    backend
      .expectOne(`/api/projects/${PROJECT}/transmittals/${TRANSMITTAL}`)
      .flush({ ...transmittal, myAcknowledgement: { acknowledgedAt: '2026-03-03T08:00:00.000Z' } });
    await settle();
    expect(el().querySelector('[data-testid="acknowledge"]')).toBeNull();
  });

  it('shows the scheme and version a plan sheet revision was drawn from, linked, and nothing for one uploaded by hand', async () => {
    const SCHEME = '00000000-0000-4000-8000-000000000901';
    await open(`/drawings?drawing=${DRAWING}`, 'engineer');
    registerRequest().flush(drawingListSchema.parse({ items: [listItem()], total: 1, page: 1, pageSize: 25 }));
    backend.expectOne(`/api/projects/${PROJECT}/transmittals`).flush(transmittalListSchema.parse([]));
    const sheet = revision({
      id: '00000000-0000-4000-8000-000000000702',
      code: 'P02',
      description: 'Column layout from scheme Wide bays, version 3',
      fromScheme: { id: SCHEME, name: 'Wide bays', version: 3 },
    });
    const byHand = revision({ state: 'superseded', allowedActions: [] });
    backend
      .expectOne(`/api/projects/${PROJECT}/drawings/${DRAWING}`)
      .flush(drawingSchema.parse({ ...listItem(), revisions: [sheet, byHand], canRegisterRevision: false }));
    await settle();
    const origins = el().querySelectorAll('[data-testid="revision-from-scheme"]');
    expect(origins).toHaveLength(1);
    expect(origins[0].textContent?.replace(/\s+/g, ' ').trim()).toBe('Plan sheet drawn from Wide bays, version 3');
    expect(origins[0].querySelector('a')?.getAttribute('href')).toBe(`/projects/${PROJECT}/schemes/${SCHEME}`);
  });

  it('proposes the next number, but never over a number the engineer typed while it was on its way', async () => {
    await open('/drawings', 'engineer');
    registerRequest().flush(drawingListSchema.parse({ items: [listItem()], total: 1, page: 1, pageSize: 25 }));
    backend.expectOne(`/api/projects/${PROJECT}/transmittals`).flush([]);
    await settle();
    const nextNumber = `/api/projects/${PROJECT}/drawings/next-number`;
    const numberInput = () => el().querySelector('[data-testid="drawing-number"]') as HTMLInputElement;

    // Untouched: the proposal fills the field.
    (el().querySelector('[data-testid="new-drawing"]') as HTMLButtonElement).click();
    await settle();
    backend.expectOne(nextNumber).flush(nextNumberSchema.parse({ number: 'QT-S-102', pattern: 'QT-S-{n}' }));
    await settle();
    expect(numberInput().value).toBe('QT-S-102');

    // Typed before the proposal arrived: the typed number stays.
    (el().querySelector('.new-drawing .form-actions button[type="button"]') as HTMLButtonElement).click();
    await settle();
    (el().querySelector('[data-testid="new-drawing"]') as HTMLButtonElement).click();
    await settle();
    const pending = backend.expectOne(nextNumber);
    numberInput().value = 'QT-S-900';
    numberInput().dispatchEvent(new Event('input'));
    pending.flush(nextNumberSchema.parse({ number: 'QT-S-102', pattern: 'QT-S-{n}' }));
    await settle();
    expect(numberInput().value).toBe('QT-S-900');
  });

  it('rejects a reply that is not the register’s shape instead of showing it', async () => {
    await open('/drawings', 'engineer');
    // A plain list where the API sends a page: the parse fails and the page says so.
    registerRequest().flush([listItem()]);
    backend.expectOne(`/api/projects/${PROJECT}/transmittals`).flush([]);
    await settle();
    expect(el().querySelector('[data-testid="drawings-error"]')).not.toBeNull();
    expect(el().querySelector('[data-testid="drawings-table"]')).toBeNull();
  });
});
