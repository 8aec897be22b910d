import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { ANIMATION_MODULE_TYPE, ErrorHandler } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import {
  clientOrganisationSchema,
  meSchema,
  personSchema,
  projectListSchema,
  type Person,
  type ProjectListItem,
} from '@trabeate/contracts';
import { reply } from '../../../testing/api-replies';
import { Session } from '../../core/auth/session';
import { grantedMe } from '../../core/auth/testing';
import { INVITE_PROJECT_PAGE, PeoplePage } from './people-page';

const FENWAY = { id: '00000000-0000-4000-8000-000000000101', name: 'Quillon Terrace Homes' };
const MARLOW = { id: '00000000-0000-4000-8000-000000000102', name: 'Brackwater Schools Board' };

const person: Person = {
  id: '00000000-0000-4000-8000-000000000201',
  email: 'aster@example.test',
  displayName: 'Aster Pellow',
  role: 'principal',
  clientOrganisation: null,
  status: 'active',
  projects: [],
  lastSignedInAt: '2026-03-02T08:00:00.000Z',
  invitationExpiresAt: null,
};

function item(n: number, org = FENWAY): ProjectListItem {
  return {
    id: `00000000-0000-4000-8000-0000000003${String(n).padStart(2, '0')}`,
    reference: `QTH-${n}`,
    name: `Block ${n}`,
    clientOrganisation: org,
    siteAddress: '4 Ferrow Lane',
    storeys: 5,
    archived: false,
    updatedAt: '2026-03-02T08:00:00.000Z',
    currentStage: null,
    lateStages: 0,
  };
}

describe('PeoplePage', () => {
  let fixture: ComponentFixture<PeoplePage>;
  let backend: HttpTestingController;
  const errors: unknown[] = [];

  beforeEach(async () => {
    errors.length = 0;
    TestBed.configureTestingModule({
      imports: [PeoplePage],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: ANIMATION_MODULE_TYPE, useValue: 'NoopAnimations' },
        // What reached the app's error handler is what the person saw as "Something went wrong".
        { provide: ErrorHandler, useValue: { handleError: (e: unknown) => errors.push(e) } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    const loaded = TestBed.inject(Session).load();
    reply(backend.expectOne('/api/me'), meSchema, grantedMe('principal'));
    await loaded;
    fixture = TestBed.createComponent(PeoplePage);
    // Not whenStable: it would wait for the three reads that each test answers.
    fixture.detectChanges();
  });

  afterEach(() => backend.verify());

  async function answerReads(total: number, items: ProjectListItem[]): Promise<void> {
    reply(backend.expectOne('/api/people'), personSchema.array(), [person]);
    reply(backend.expectOne('/api/client-organisations'), clientOrganisationSchema.array(), [FENWAY, MARLOW]);
    const list = backend.expectOne((r) => r.url === '/api/projects');
    // The API pages this list; the page asks for one large page in reference order.
    expect(list.request.params.get('pageSize')).toBe(String(INVITE_PROJECT_PAGE));
    expect(list.request.params.get('sort')).toBe('reference');
    reply(list, projectListSchema, { items, total, page: 1, pageSize: INVITE_PROJECT_PAGE });
    await fixture.whenStable();
  }

  it("offers the paged project list's projects in the invite dialog, with its labels, and nothing goes wrong", async () => {
    await answerReads(2, [item(1), item(2, MARLOW)]);
    (fixture.nativeElement as HTMLElement).querySelector<HTMLButtonElement>('[data-testid="invite-open"]')!.click();
    await fixture.whenStable();

    const root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    const dialog = await root.getHarness(MatDialogHarness);
    const text = await (await dialog.host()).text();
    for (const label of ['E-mail', 'Name', 'Role', 'Projects (optional)']) expect(text).toContain(label);

    const selects = await root.getAllHarnesses(MatSelectHarness);
    const projects = selects[selects.length - 1];
    await projects.open();
    const options = await Promise.all((await projects.getOptions()).map((o) => o.getText()));
    expect(options).toEqual(['QTH-1 · Block 1', 'QTH-2 · Block 2']);
    expect(errors).toEqual([]);
  });

  it('says how many projects the dialog leaves out when the firm has more than one page', async () => {
    await answerReads(INVITE_PROJECT_PAGE + 7, [item(1)]);
    (fixture.nativeElement as HTMLElement).querySelector<HTMLButtonElement>('[data-testid="invite-open"]')!.click();
    await fixture.whenStable();
    const note = document.querySelector('[data-testid="projects-left-out"]');
    expect(note?.textContent).toContain(`${INVITE_PROJECT_PAGE + 6} more projects are not listed here`);
    expect(errors).toEqual([]);
  });
});
