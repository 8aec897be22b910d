import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, TestRequest, provideHttpClientTesting } from '@angular/common/http/testing';
import { ANIMATION_MODULE_TYPE } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { activityListSchema, type Activity } from '@trabeate/contracts';
import { reply } from '../../../testing/api-replies';
import { ActivityLog } from './activity-log';

const ID = '00000000-0000-4000-8000-000000000301';
const URL = `/api/projects/${ID}/activity`;

const entry = (n: number): Activity => ({
  id: `00000000-0000-4000-8000-0000000005${String(n).padStart(2, '0')}`,
  at: '2026-03-02T08:00:00.000Z',
  actor: { id: '00000000-0000-4000-8000-000000000202', displayName: 'Cato Brennagh' },
  action: 'stage.submitted',
  objectType: 'stage',
  objectId: 'column_layout',
  stageKey: 'column_layout',
  summary: `Entry ${n}`,
});

describe('ActivityLog', () => {
  let fixture: ComponentFixture<ActivityLog>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;
  const params = (req: TestRequest) =>
    Object.fromEntries(req.request.params.keys().map((k) => [k, req.request.params.get(k)]));
  const settle = async () => {
    await new Promise((r) => setTimeout(r));
    TestBed.tick();
  };

  /** Opens a Material select and picks the option with this text, as a person would. */
  async function pick(testId: string, option: string): Promise<void> {
    (el().querySelector(`[data-testid="${testId}"] .mat-mdc-select-trigger`) as HTMLElement).click();
    await settle();
    const opt = Array.from(document.querySelectorAll<HTMLElement>('mat-option')).find(
      (o) => o.textContent?.trim() === option,
    );
    opt!.click();
    await settle();
  }

  afterEach(() => document.querySelectorAll('.cdk-overlay-container').forEach((n) => n.remove()));

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [ActivityLog],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: ANIMATION_MODULE_TYPE, useValue: 'NoopAnimations' },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ActivityLog);
    fixture.componentRef.setInput('projectId', ID);
    fixture.detectChanges();
    TestBed.tick();
  });

  it('shows the newest entries first as the server sends them, one readable line each', async () => {
    const req = backend.expectOne((r) => r.url === URL);
    expect(params(req)).toEqual({ page: '1', pageSize: '20' });
    reply(req, activityListSchema, { items: [entry(2), entry(1)], total: 2, page: 1, pageSize: 20 });
    await settle();
    expect(Array.from(el().querySelectorAll('[data-testid="activity-entry"] span')).map((s) => s.textContent)).toEqual([
      'Entry 2',
      'Entry 1',
    ]);
  });

  it('filters by kind and stage on the server, back to the first page', async () => {
    reply(
      backend.expectOne((r) => r.url === URL),
      activityListSchema,
      { items: [entry(1)], total: 45, page: 1, pageSize: 20 },
    );
    await settle();
    (el().querySelector('button.mat-mdc-paginator-navigation-next') as HTMLButtonElement).click();
    await settle();
    expect(params(backend.expectOne((r) => r.url === URL))).toEqual({ page: '2', pageSize: '20' });

    await pick('activity-type', 'Deliverables');
    reply(
      backend.expectOne((r) => r.url === URL),
      activityListSchema,
      { items: [], total: 0, page: 1, pageSize: 20 },
    );
    await pick('activity-stage', 'Foundations');
    expect(params(backend.expectOne((r) => r.url === URL))).toEqual({
      page: '1',
      pageSize: '20',
      objectType: 'deliverable',
      stageKey: 'foundations',
    });
  });
});
