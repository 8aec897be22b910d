import { HttpClient, provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ANIMATION_MODULE_TYPE, inject } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import {
  commentSchema,
  deliverableSchema,
  stageSchema,
  stageSubmissionListSchema,
  type ProjectPage,
  type Stage,
} from '@trabeate/contracts';
import { reply, replyError } from '../../../../testing/api-replies';
import { aProjectPage } from '../../../../testing/fixtures';
import { UPLOAD_HTTP } from '../projects-api';
import { provideFirmDates } from '../../../shared/dates/firm-date-adapter';
import { StagePanel } from './stage-panel';

const PROJECT_ID = '00000000-0000-4000-8000-000000000301';
const ENGINEER = { id: '00000000-0000-4000-8000-000000000202', displayName: 'Cato Brennagh' };
// Slab panels is submitted without a scheme; the scheme stages have their own specs below.
const BASE = `/api/projects/${PROJECT_ID}/stages/slab_panels`;

function stage(extra: Partial<Stage> = {}): Stage {
  return {
    key: 'slab_panels',
    title: 'Slab panels',
    position: 4,
    state: 'in_progress',
    assignee: ENGINEER,
    dueDate: '2026-04-01',
    late: false,
    submittedAt: null,
    approvedAt: null,
    deliverableCount: 0,
    commentCount: 0,
    allowedActions: [],
    ...extra,
  };
}

function project(manage: boolean, work = true, seeInternal = true): ProjectPage {
  return aProjectPage({
    id: PROJECT_ID,
    reference: 'QTH-1',
    name: 'Block one',
    clientOrganisation: { id: '00000000-0000-4000-8000-000000000101', name: 'Quillon Terrace Homes' },
    siteAddress: '',
    buildingUse: '',
    storeys: 5,
    storeyHeightM: 3,
    floorAreaM2: null,
    designBasis: null,
    archivedAt: null,
    finance: null,
    members: [
      { ...ENGINEER, role: 'engineer' },
      { id: '00000000-0000-4000-8000-000000000203', displayName: 'Maud Ferrier', role: 'client' },
    ],
    stages: [],
    abilities: { work, manage, seeFinance: manage, seeInternal, pay: false, acknowledge: false },
  });
}

describe('StagePanel', () => {
  let fixture: ComponentFixture<StagePanel>;
  let backend: HttpTestingController;
  let changed: number;
  const el = () => fixture.nativeElement as HTMLElement;
  const actionButtons = () =>
    Array.from(el().querySelectorAll<HTMLButtonElement>('[data-testid^="action-"]')).map((b) => b.textContent?.trim());
  // Not whenStable: an open request (an upload, a reload) keeps the app "unstable" until answered.
  const settle = async (ms = 0) => {
    await new Promise((r) => setTimeout(r, ms));
    TestBed.tick();
  };

  async function open(s: Stage, manage: boolean, as: ProjectPage = project(manage)): Promise<void> {
    TestBed.configureTestingModule({
      imports: [StagePanel],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: UPLOAD_HTTP, useFactory: () => inject(HttpClient) },
        { provide: ANIMATION_MODULE_TYPE, useValue: 'NoopAnimations' },
        provideFirmDates(),
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(StagePanel);
    fixture.componentRef.setInput('project', as);
    fixture.componentRef.setInput('stage', s);
    changed = 0;
    fixture.componentInstance.changed.subscribe(() => changed++);
    fixture.detectChanges();
    TestBed.tick();
    if (as.abilities.seeInternal) {
      const base = `/api/projects/${PROJECT_ID}/stages/${s.key}`;
      reply(backend.expectOne(`${base}/deliverables`), deliverableSchema.array(), []);
      reply(backend.expectOne(`${base}/comments`), commentSchema.array(), []);
    }
    await settle();
  }

  it("shows a client contact the stage's progress without asking for, or showing, the firm's files and thread", async () => {
    await open(
      stage({
        state: 'under_review',
        submittedAt: '2026-03-02T08:00:00.000Z',
        deliverableCount: null,
        commentCount: null,
      }),
      false,
      project(false, false, false),
    );
    backend.expectNone(`${BASE}/deliverables`);
    backend.expectNone(`${BASE}/comments`);
    expect(el().querySelector('[data-testid="stage-state"]')?.textContent).toBe('Under review');
    expect(el().querySelector('tb-deliverables-panel')).toBeNull();
    expect(el().querySelector('tb-stage-comments')).toBeNull();
    expect(el().querySelector('[data-testid="outcome-note"]')?.textContent).toContain('drawings reach you once');
  });

  afterEach(() => {
    document.querySelectorAll('.cdk-overlay-container').forEach((n) => n.remove());
  });

  it('offers exactly the actions the server allows the caller, in working order', async () => {
    await open(stage({ state: 'under_review', allowedActions: ['return', 'approve'] }), true);
    expect(actionButtons()).toEqual(['Approve', 'Return with comments']);
  });

  it('offers no actions when the server allows none (a client contact, or someone not on the stage)', async () => {
    await open(stage({ allowedActions: [] }), false);
    expect(el().querySelector('[data-testid="stage-actions"]')).toBeNull();
    expect(el().querySelector('[data-testid="assignment"]')).toBeNull();
  });

  it('submits with one request and tells the page to read the project again', async () => {
    await open(stage({ allowedActions: ['submit'] }), false);
    (el().querySelector('[data-testid="action-submit"]') as HTMLButtonElement).click();
    const req = backend.expectOne(`${BASE}/transitions`);
    expect(req.request.body).toEqual({ action: 'submit' });
    reply(req, stageSchema, stage({ state: 'under_review' }));
    await settle();
    reply(backend.expectOne(`${BASE}/comments`), commentSchema.array(), []);
    expect(changed).toBe(1);
  });

  it('approves only after the principal confirms, and sends nothing when they keep it as is', async () => {
    await open(stage({ state: 'under_review', allowedActions: ['approve', 'return'] }), true);
    (el().querySelector('[data-testid="action-approve"]') as HTMLButtonElement).click();
    await settle(50);
    expect(document.querySelector('mat-dialog-container h2')?.textContent).toContain('Approve Slab panels?');
    backend.expectNone(`${BASE}/transitions`);
    (
      Array.from(document.querySelectorAll('mat-dialog-container button')).find((b) =>
        b.textContent?.includes('Keep as is'),
      ) as HTMLButtonElement
    ).click();
    await settle(50);
    backend.expectNone(`${BASE}/transitions`);

    (el().querySelector('[data-testid="action-approve"]') as HTMLButtonElement).click();
    await settle(50);
    (document.querySelector('[data-testid="confirm"]') as HTMLButtonElement).click();
    await settle(50);
    const req = backend.expectOne(`${BASE}/transitions`);
    expect(req.request.body).toEqual({ action: 'approve' });
    reply(req, stageSchema, stage({ state: 'approved' }));
    await settle(50);
    reply(backend.expectOne(`${BASE}/comments`), commentSchema.array(), []);
  });

  it('will not return a stage without a comment, then sends the comment with the return', async () => {
    await open(stage({ state: 'under_review', allowedActions: ['approve', 'return'] }), true);
    (el().querySelector('[data-testid="action-return"]') as HTMLButtonElement).click();
    await settle(50);
    const confirm = document.querySelector('[data-testid="action-confirm"]') as HTMLButtonElement;
    expect(confirm).not.toBeNull();
    confirm.click();
    await settle(50);
    expect(document.querySelector('mat-error')?.textContent).toContain('Say what needs changing.');
    backend.expectNone(`${BASE}/transitions`);

    const text = document.querySelector('[data-testid="action-text"]') as HTMLTextAreaElement;
    text.value = '   ';
    text.dispatchEvent(new Event('input'));
    confirm.click();
    await settle(50);
    backend.expectNone(`${BASE}/transitions`);

    text.value = 'Column C4 clashes with the stair core; move it to grid D.';
    text.dispatchEvent(new Event('input'));
    confirm.click();
    await settle(50);
    const req = backend.expectOne(`${BASE}/transitions`);
    expect(req.request.body).toEqual({
      action: 'return',
      comment: 'Column C4 clashes with the stair core; move it to grid D.',
    });
    reply(req, stageSchema, stage({ state: 'returned' }));
    await settle(50);
    reply(backend.expectOne(`${BASE}/comments`), commentSchema.array(), []);
  });

  it('reopening asks for a reason and sends it as the reason', async () => {
    await open(stage({ state: 'approved', allowedActions: ['reopen'] }), true);
    (el().querySelector('[data-testid="action-reopen"]') as HTMLButtonElement).click();
    await settle(50);
    const text = document.querySelector('[data-testid="action-text"]') as HTMLTextAreaElement;
    text.value = 'The architect moved the lift shaft.';
    text.dispatchEvent(new Event('input'));
    (document.querySelector('[data-testid="action-confirm"]') as HTMLButtonElement).click();
    await settle(50);
    expect(backend.expectOne(`${BASE}/transitions`).request.body).toEqual({
      action: 'reopen',
      reason: 'The architect moved the lift shaft.',
    });
  });

  it('shows the server’s reason when a transition is refused (409), and refreshes the stage', async () => {
    await open(stage({ allowedActions: ['submit'] }), false);
    (el().querySelector('[data-testid="action-submit"]') as HTMLButtonElement).click();
    replyError(backend.expectOne(`${BASE}/transitions`), 409, {
      code: 'conflict',
      message: 'Upload at least one deliverable before submitting.',
    });
    await settle();
    expect(el().querySelector('[data-testid="action-error"]')?.textContent).toContain(
      'Upload at least one deliverable before submitting.',
    );
    expect(changed).toBe(1);
  });

  it('on a stage that rests on a scheme, shows the firm its review and submits through the scheme dialog', async () => {
    const layout = `/api/projects/${PROJECT_ID}/stages/column_layout`;
    await open(stage({ key: 'column_layout', title: 'Column layout', position: 2, allowedActions: ['submit'] }), false);
    reply(backend.expectOne(`${layout}/submissions`), stageSubmissionListSchema, { items: [] });
    await settle();
    expect(el().querySelector('[data-testid="review-empty"]')?.textContent).toContain(
      'Nothing submitted with a scheme yet',
    );
    (el().querySelector('[data-testid="action-submit"]') as HTMLButtonElement).click();
    await settle(50);
    expect(document.querySelector('mat-dialog-container h2')?.textContent).toContain('Submit Column layout for review');
    // The dialog asks for the project's schemes; no transition goes out until the engineer submits there.
    backend.expectOne((r) => r.url.startsWith(`/api/projects/${PROJECT_ID}/schemes`));
    backend.expectNone(`${layout}/transitions`);
  });

  it('shows a client contact no review of a scheme stage, and never asks for it', async () => {
    await open(
      stage({ key: 'column_layout', title: 'Column layout', deliverableCount: null, commentCount: null }),
      false,
      project(false, false, false),
    );
    backend.expectNone(`/api/projects/${PROJECT_ID}/stages/column_layout/submissions`);
    expect(el().querySelector('tb-stage-review')).toBeNull();
  });

  it('lets the principal assign an engineer and set a due date', async () => {
    await open(stage({ assignee: null, dueDate: null }), true);
    // Typed the way the firm writes dates (en-GB, day first); the field then shows the app format.
    const due = el().querySelector('[data-testid="due-date"]') as HTMLInputElement;
    due.value = '15/05/2026';
    due.dispatchEvent(new Event('input'));
    due.dispatchEvent(new Event('change'));
    due.dispatchEvent(new Event('blur'));
    fixture.componentInstance['assigneeId'].set(ENGINEER.id);
    await settle();
    (el().querySelector('[data-testid="save-assignment"]') as HTMLButtonElement).click();
    const req = backend.expectOne(BASE);
    expect(req.request.method).toBe('PATCH');
    expect(req.request.body).toEqual({ assigneeId: ENGINEER.id, dueDate: '2026-05-15' });
    // Only engineers carry a stage: not the client contact on the project.
    expect(fixture.componentInstance['staff']().map((m: { displayName: string }) => m.displayName)).toEqual([
      'Cato Brennagh',
    ]);
    expect(due.value).toBe('15 May 2026');
    reply(req, stageSchema, stage());
    await settle();
    reply(backend.expectOne(`${BASE}/comments`), commentSchema.array(), []);
  });
});
