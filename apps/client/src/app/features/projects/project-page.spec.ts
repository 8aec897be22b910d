import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ANIMATION_MODULE_TYPE } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { provideRouter, withComponentInputBinding } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import {
  activityListSchema,
  commentSchema,
  deliverableSchema,
  personSchema,
  projectPageSchema,
  type ProjectPage as ProjectPageData,
  type Stage,
  type StageKey,
} from '@trabeate/contracts';
import { reply, replyAll } from '../../../testing/api-replies';
import { provideFirmDates } from '../../shared/dates/firm-date-adapter';
import { ProjectPage } from './project-page';
import { STAGE_ORDER, STAGE_TITLES } from './project-labels';

const ID = '00000000-0000-4000-8000-000000000301';
const ENGINEER = { id: '00000000-0000-4000-8000-000000000202', displayName: 'Cato Brennagh' };

const stage = (key: StageKey, extra: Partial<Stage> = {}): Stage => ({
  key,
  title: STAGE_TITLES[key],
  position: STAGE_ORDER.indexOf(key) + 1,
  state: 'not_started',
  assignee: null,
  dueDate: null,
  late: false,
  submittedAt: null,
  approvedAt: null,
  deliverableCount: 0,
  commentCount: 0,
  allowedActions: [],
  ...extra,
});

function project(manage: boolean, archivedAt: string | null = null): ProjectPageData {
  return {
    id: ID,
    reference: 'QTH-1',
    name: 'Block one',
    clientOrganisation: { id: '00000000-0000-4000-8000-000000000101', name: 'Quillon Terrace Homes' },
    siteAddress: '4 Ferrow Lane',
    buildingUse: 'Apartments',
    storeys: 5,
    storeyHeightM: 3,
    floorAreaM2: null,
    designBasis: {
      codeFamily: 'EN1992',
      concreteMPa: 30,
      steelMPa: 500,
      imposedKPa: 2,
      superimposedDeadKPa: 1.5,
      bearingPressureKPa: 150,
      foundingDepthM: 1.5,
      rates: { concretePerM3: 145, steelPerKg: 1.35, formworkPerM2: 32 },
    },
    currency: 'EUR',
    archivedAt,
    finance: null,
    members: [{ ...ENGINEER, role: 'engineer' }],
    // Sent out of order on purpose: the page shows them in the design sequence.
    stages: [
      stage('foundations'),
      stage('design_basis', { state: 'approved' }),
      stage('column_layout', { state: 'returned', assignee: ENGINEER, dueDate: '2026-01-10', late: true }),
      stage('beam_framing'),
      stage('slab_panels'),
      stage('stairs'),
    ],
    abilities: { work: manage, manage, seeFinance: manage, seeInternal: true, pay: false, acknowledge: false },
  };
}

describe('ProjectPage', () => {
  let harness: RouterTestingHarness;
  let backend: HttpTestingController;
  const el = () => harness.routeNativeElement as HTMLElement;
  const settle = async (ms = 0) => {
    await new Promise((r) => setTimeout(r, ms));
    harness.detectChanges();
  };
  const answerPanel = (key: StageKey) => {
    replyAll(backend.match(`/api/projects/${ID}/stages/${key}/deliverables`), deliverableSchema.array(), []);
    replyAll(backend.match(`/api/projects/${ID}/stages/${key}/comments`), commentSchema.array(), []);
    replyAll(
      backend.match((r) => r.url === `/api/projects/${ID}/activity`),
      activityListSchema,
      { items: [], total: 0, page: 1, pageSize: 20 },
    );
  };

  async function open(url: string, data: ProjectPageData): Promise<void> {
    TestBed.configureTestingModule({
      providers: [
        provideRouter([{ path: 'projects/:projectId', component: ProjectPage }], withComponentInputBinding()),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: ANIMATION_MODULE_TYPE, useValue: 'NoopAnimations' },
        provideFirmDates(),
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    harness = await RouterTestingHarness.create();
    void harness.navigateByUrl(url);
    await settle();
    reply(backend.expectOne(`/api/projects/${ID}/full`), projectPageSchema, data);
    await settle();
    replyAll(backend.match('/api/people'), personSchema.array(), []);
    await settle();
  }

  afterEach(() => document.querySelectorAll('.cdk-overlay-container').forEach((n) => n.remove()));

  it('shows the six stages in design order, with state, assignee, due date and a late marker', async () => {
    await open(`/projects/${ID}`, project(false));
    answerPanel('column_layout');
    await settle();
    const bays = Array.from(el().querySelectorAll('[data-testid="stage-timeline"] > li'));
    expect(bays.map((b) => b.querySelector('.bay-title')?.textContent)).toEqual([
      'Design basis',
      'Column layout',
      'Beam framing',
      'Slab panels',
      'Stairs',
      'Foundations',
    ]);
    expect(bays[1].textContent).toContain('Returned');
    expect(bays[1].textContent).toContain('Cato Brennagh');
    expect(bays[1].querySelector('[data-testid="late-marker"]')?.textContent).toContain('Late');
    expect(el().querySelectorAll('[data-testid="late-marker"]').length).toBe(1);
  });

  it('shows the principal how long a stage under review has waited, and never calls it late', async () => {
    const data = project(true);
    const submittedAt = new Date(Date.now() - 3 * 86_400_000 - 3_600_000).toISOString();
    data.stages[4] = stage('slab_panels', { state: 'under_review', dueDate: '2026-01-01', late: false, submittedAt });
    await open(`/projects/${ID}`, data);
    answerPanel('column_layout');
    await settle();
    const bay = el().querySelector('[data-testid="stage-slab_panels"]')!;
    expect(bay.querySelector('[data-testid="waiting-marker"]')?.textContent).toContain('Waiting 3 days');
    expect(bay.querySelector('[data-testid="late-marker"]')).toBeNull();
  });

  it('does not show a client how long a review has waited', async () => {
    const data = project(false);
    data.stages[4] = stage('slab_panels', {
      state: 'under_review',
      submittedAt: new Date(Date.now() - 3 * 86_400_000).toISOString(),
    });
    await open(`/projects/${ID}`, data);
    answerPanel('column_layout');
    await settle();
    expect(el().querySelector('[data-testid="waiting-marker"]')).toBeNull();
  });

  it("shows the project's unit rates in its currency, and says when there are none", async () => {
    await open(`/projects/${ID}`, project(true));
    // en-GB, the firm's locale (Intl currency format)
    expect(el().querySelector('[data-testid="unit-rates"]')?.textContent?.replace(/\s+/g, ' ').trim()).toBe(
      'concrete €145.00/m³ · reinforcement €1.35/kg · formwork €32.00/m²',
    );
  });

  it('says when a project has no unit rates yet', async () => {
    const p = project(true);
    await open(`/projects/${ID}`, { ...p, designBasis: { ...p.designBasis!, rates: undefined } });
    expect(el().querySelector('[data-testid="unit-rates"]')?.textContent).toContain('Not set');
  });

  it('writes due dates in the one app format', async () => {
    await open(`/projects/${ID}`, project(false));
    answerPanel('column_layout');
    await settle();
    expect(el().querySelector('[data-testid="stage-column_layout"]')?.textContent).toContain('Due 10 Jan 2026');
    expect(el().querySelector('[data-testid="stage-panel"]')?.textContent).toContain('Due 10 Jan 2026');
  });

  it('opens the first stage not yet approved, and the stage named in the address when there is one', async () => {
    await open(`/projects/${ID}`, project(false));
    answerPanel('column_layout');
    await settle();
    expect(el().querySelector('[data-testid="stage-panel"] h2')?.textContent).toContain('Column layout');
    expect(el().querySelector('[data-testid="stage-column_layout"]')?.getAttribute('aria-pressed')).toBe('true');
  });

  it('offers Edit and Archive only to those who manage the project', async () => {
    await open(`/projects/${ID}?stage=stairs`, project(false));
    answerPanel('stairs');
    await settle();
    expect(el().querySelector('[data-testid="stage-panel"] h2')?.textContent).toContain('Stairs');
    expect(el().querySelector('[data-testid="edit-project"]')).toBeNull();
    expect(el().querySelector('[data-testid="archive-project"]')).toBeNull();
  });

  it('archives only after confirmation, and brings an archived project back with restore', async () => {
    await open(`/projects/${ID}`, project(true));
    answerPanel('column_layout');
    await settle();
    (el().querySelector('[data-testid="archive-project"]') as HTMLButtonElement).click();
    await settle(50);
    backend.expectNone(`/api/projects/${ID}/archive`);
    (document.querySelector('[data-testid="confirm"]') as HTMLButtonElement).click();
    await settle(50);
    reply(
      backend.expectOne(`/api/projects/${ID}/archive`),
      projectPageSchema,
      project(true, '2026-03-02T08:00:00.000Z'),
    );
    await settle();
    reply(backend.expectOne(`/api/projects/${ID}/full`), projectPageSchema, project(true, '2026-03-02T08:00:00.000Z'));
    await settle();
    answerPanel('column_layout');
    await settle();
    expect(el().querySelector('[data-testid="archived"]')?.textContent).toContain('Archived');

    (el().querySelector('[data-testid="archive-project"]') as HTMLButtonElement).click();
    await settle(50);
    (document.querySelector('[data-testid="confirm"]') as HTMLButtonElement).click();
    await settle(50);
    reply(backend.expectOne(`/api/projects/${ID}/restore`), projectPageSchema, project(true));
  });
});
