import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { stageSubmissionListSchema, type StageSubmission } from '@trabeate/contracts';
import { reply, replyError } from '../../../../testing/api-replies';
import { provideFirmDates } from '../../../shared/dates/firm-date-adapter';
import { StageReview } from './stage-review';

jest.setTimeout(30_000);

const PROJECT_ID = '00000000-0000-4000-8000-000000000301';
const SCHEME_ID = '00000000-0000-4000-8000-000000000401';
const URL = `/api/projects/${PROJECT_ID}/stages/column_layout/submissions`;
const ENGINEER = { id: '00000000-0000-4000-8000-000000000202', displayName: 'Cato Brennagh' };
const PRINCIPAL = { id: '00000000-0000-4000-8000-000000000201', displayName: 'Ines Vardell' };

// Invented submission in the API's shape (parsed by the contract in reply()).
function submission(extra: Partial<StageSubmission> = {}): StageSubmission {
  return {
    id: '00000000-0000-4000-8000-000000000901',
    stageKey: 'column_layout',
    submittedAt: '2026-03-02T08:00:00.000Z',
    submittedBy: ENGINEER,
    comment: 'Courtyard column left out.',
    scheme: {
      id: SCHEME_ID,
      name: 'Courtyard grid',
      version: 3,
      currentVersion: 3,
      changedSinceSubmitted: false,
      report: null,
    },
    checks: {
      engineVersion: '1.0.0',
      errors: 1,
      warnings: 2,
      rules: [
        { ruleId: 'column.capacity', errors: 1, warnings: 0 },
        { ruleId: 'beam.span', errors: 0, warnings: 2 },
      ],
      failing: [
        {
          ruleId: 'column.capacity',
          severity: 'error',
          elements: ['B3'],
          message: 'Column B3 carries more than its section allows',
          source: 'common practice',
          sourceKind: 'practice',
        },
        {
          ruleId: 'beam.span',
          severity: 'warning',
          elements: ['B-3/B-D'],
          message: 'Span over the usual limit',
          source: 'common practice',
          sourceKind: 'practice',
        },
      ],
    },
    justifications: [{ ruleId: 'column.capacity', elements: ['B3'], text: 'B3 sits on a deepened transfer beam.' }],
    decision: null,
    ...extra,
  };
}

describe('StageReview', () => {
  let fixture: ComponentFixture<StageReview>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;
  const text = (id: string) => el().querySelector(`[data-testid="${id}"]`)?.textContent ?? null;
  const settle = async () => {
    await new Promise((r) => setTimeout(r, 0));
    TestBed.tick();
  };

  async function open(canBill = true): Promise<void> {
    TestBed.configureTestingModule({
      imports: [StageReview],
      providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([]), provideFirmDates()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(StageReview);
    fixture.componentRef.setInput('projectId', PROJECT_ID);
    fixture.componentRef.setInput('stageKey', 'column_layout');
    fixture.componentRef.setInput('canBill', canBill);
    fixture.detectChanges();
    TestBed.tick();
  }

  afterEach(() => backend.verify());

  it('shows loading, then the scheme version with a link to it, the summary per rule and the justification beside its check', async () => {
    await open();
    expect(text('review-loading')).toContain('Loading');
    reply(backend.expectOne(URL), stageSubmissionListSchema, { items: [submission()] });
    await settle();
    expect(text('review-scheme')).toContain('Courtyard grid, version 3');
    const link = el().querySelector<HTMLAnchorElement>('[data-testid="review-scheme-link"]')!;
    expect(link.getAttribute('href')).toBe(`/projects/${PROJECT_ID}/schemes/${SCHEME_ID}`);
    expect(text('review-counts')).toContain('1 error(s), 2 warning(s)');
    const rows = Array.from(el().querySelectorAll('[data-testid="review-rules"] tbody tr')).map((r) =>
      Array.from(r.querySelectorAll('td')).map((c) => c.textContent?.trim()),
    );
    expect(rows).toEqual([
      ['column.capacity', '1', '0'],
      ['beam.span', '0', '2'],
    ]);
    const item = el().querySelector('[data-testid="review-justifications"] li')!;
    expect(item.textContent).toContain('column.capacity at B3');
    expect(item.querySelector('[data-testid="review-justification"]')?.textContent).toBe(
      'B3 sits on a deepened transfer beam.',
    );
    // Warnings are counted, not listed for justification.
    expect(text('review-justifications')).not.toContain('beam.span');
    expect(el().querySelector('[data-testid="scheme-outputs-spot"]')).not.toBeNull();
    expect(text('review-changed')).toBeNull();
  });

  it('links the report already written for the submitted version, and offers none when there is none', async () => {
    const REPORT_ID = '00000000-0000-4000-8000-000000000971';
    const fileUrl = `/api/projects/${PROJECT_ID}/scheme-reports/${REPORT_ID}/file`;
    await open();
    reply(backend.expectOne(URL), stageSubmissionListSchema, {
      items: [
        submission({
          scheme: {
            id: SCHEME_ID,
            name: 'Courtyard grid',
            version: 3,
            currentVersion: 3,
            changedSinceSubmitted: false,
            report: { id: REPORT_ID, pages: 9, finishedAt: '2026-03-02T08:05:00.000Z', fileUrl },
          },
        }),
      ],
    });
    await settle();
    const link = el().querySelector<HTMLAnchorElement>('[data-testid="review-report-link"]')!;
    expect(link.getAttribute('href')).toBe(fileUrl);
    expect(link.textContent?.replace(/\s+/g, ' ').trim()).toBe('Calculation report of version 3');
    expect(text('review-report')).toContain('9 pages');

    fixture.destroy();
    TestBed.resetTestingModule();
    await open();
    reply(backend.expectOne(URL), stageSubmissionListSchema, { items: [submission()] });
    await settle();
    expect(el().querySelector('[data-testid="review-report-link"]')).toBeNull();
    expect(text('review-no-report')).toContain('No calculation report of version 3 yet');
  });

  it('marks a scheme saved again since submission as changed, naming the version it is at now', async () => {
    await open();
    reply(backend.expectOne(URL), stageSubmissionListSchema, {
      items: [
        submission({
          scheme: {
            id: SCHEME_ID,
            name: 'Courtyard grid',
            version: 3,
            currentVersion: 5,
            changedSinceSubmitted: true,
            report: null,
          },
        }),
      ],
    });
    await settle();
    expect(text('review-changed')).toContain('Changed since submitted: now version 5');
  });

  it('after approval shows the decision by version and the offered draft invoice with a way to it', async () => {
    await open();
    reply(backend.expectOne(URL), stageSubmissionListSchema, {
      items: [
        submission({
          decision: {
            outcome: 'approved',
            by: PRINCIPAL,
            at: '2026-03-03T09:30:00.000Z',
            comment: null,
            offeredInvoice: {
              id: '00000000-0000-4000-8000-000000000951',
              number: null,
              state: 'draft',
              totalMinor: 1_152_000,
              currency: 'EUR',
            },
          },
        }),
        submission({ id: '00000000-0000-4000-8000-000000000900', justifications: [] }),
      ],
    });
    await settle();
    expect(text('review-decision')).toContain('Approved by Ines Vardell');
    expect(text('review-decision')).toContain('(version 3)');
    expect(text('review-invoice')).toContain('A draft invoice for this stage');
    expect(text('review-invoice')).toContain('€11,520.00');
    expect(el().querySelector('[data-testid="review-invoice-link"]')?.getAttribute('href')).toBe(
      `/fees?project=${PROJECT_ID}`,
    );
    expect(text('review-history')).toContain('Earlier submissions (1)');
  });

  it('offers no way to Fees to someone who does not bill (an engineer)', async () => {
    await open(false);
    reply(backend.expectOne(URL), stageSubmissionListSchema, {
      items: [
        submission({
          decision: {
            outcome: 'approved',
            by: PRINCIPAL,
            at: '2026-03-03T09:30:00.000Z',
            comment: null,
            offeredInvoice: {
              id: '00000000-0000-4000-8000-000000000951',
              number: null,
              state: 'draft',
              totalMinor: 100,
              currency: 'EUR',
            },
          },
        }),
      ],
    });
    await settle();
    expect(el().querySelector('[data-testid="review-invoice-link"]')).toBeNull();
  });

  it('says when the stage has not been submitted yet', async () => {
    await open();
    reply(backend.expectOne(URL), stageSubmissionListSchema, { items: [] });
    await settle();
    expect(text('review-empty')).toContain('Nothing submitted with a scheme yet');
  });

  it('shows an error with a retry when the submission cannot be read', async () => {
    await open();
    replyError(backend.expectOne(URL), 503, { code: 'service_unavailable', message: 'The database is unavailable.' });
    await settle();
    expect(text('review-error')).toContain('could not be loaded');
    (el().querySelector('[data-testid="review-error"] button') as HTMLButtonElement).click();
    await settle();
    reply(backend.expectOne(URL), stageSubmissionListSchema, { items: [] });
    await settle();
    expect(text('review-empty')).toContain('Nothing submitted with a scheme yet');
  });
});
