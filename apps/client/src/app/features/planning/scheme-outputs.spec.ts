import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ANIMATION_MODULE_TYPE } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import {
  drawingListSchema,
  planSheetRegisteredSchema,
  schemeReportSchema,
  type SchemeReport,
} from '@trabeate/contracts';
import { reply, replyError } from '../../../testing/api-replies';
import { SchemeOutputs } from './scheme-outputs';

// The first test compiles the component's template, which takes seconds on a busy shared machine.
jest.setTimeout(60_000);

const PROJECT = '00000000-0000-4000-8000-000000000301';
const SCHEME = '00000000-0000-4000-8000-000000000401';
const REPORT = '00000000-0000-4000-8000-000000000901';
const DRAWING = '00000000-0000-4000-8000-000000000951';
const REVISION = '00000000-0000-4000-8000-000000000952';
const PERSON = '00000000-0000-4000-8000-000000000101';
const V = `/api/projects/${PROJECT}/schemes/${SCHEME}/versions/3`;
const SVG = '<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 420 297"><text>A1</text></svg>';

const report = (extra: Partial<SchemeReport>): SchemeReport => ({
  id: REPORT,
  projectId: PROJECT,
  schemeId: SCHEME,
  version: 3,
  state: 'queued',
  progress: { done: 0, total: 8 },
  stageKey: null,
  deliverableId: null,
  pages: null,
  sizeBytes: null,
  failure: null,
  requestedAt: '2026-12-02T10:00:00.000Z',
  finishedAt: null,
  ...extra,
});

describe('SchemeOutputs', () => {
  let fixture: ComponentFixture<SchemeOutputs>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;
  const q = (id: string) => el().querySelector(`[data-testid="${id}"]`);
  const settle = async (ms = 0) => {
    await new Promise((r) => setTimeout(r, ms));
    fixture.detectChanges();
    // open requests keep the app unstable (whenStable would wait for them): a tick lets signals settle
    await new Promise((r) => setTimeout(r, 0));
    fixture.detectChanges();
  };

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: ANIMATION_MODULE_TYPE, useValue: 'NoopAnimations' },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(SchemeOutputs);
    fixture.componentRef.setInput('projectId', PROJECT);
    fixture.componentRef.setInput('schemeId', SCHEME);
    fixture.componentRef.setInput('version', 3);
    await settle();
    reply(backend.expectOne(`/api/projects/${PROJECT}/drawings?pageSize=100`), drawingListSchema, {
      items: [
        {
          id: DRAWING,
          number: 'S-002',
          title: 'Ground floor column layout',
          stageKey: 'column_layout',
          sheetSize: 'A1',
          scale: '1:100',
          current: null,
          revisionCount: 1,
        },
      ],
      total: 1,
      page: 1,
      pageSize: 100,
    });
  });
  afterEach(() => backend.verify());

  it('previews the plan sheet of the chosen size and scale', async () => {
    // The sheet is an SVG document, not JSON: raw flush is the API's own answer here.
    backend.expectOne(`${V}/sheet.svg?size=A3&scale=200`).flush(SVG);
    await settle();
    const img = q('sheet-preview') as HTMLImageElement;
    expect(img.getAttribute('src')).toContain('data:image/svg+xml');
    expect(decodeURIComponent(img.getAttribute('src')!)).toContain('<text>A1</text>');
    expect(img.alt).toBe('Plan sheet of version 3 at A3, 1:200');
    expect(q('sheet-pdf')?.getAttribute('href')).toBe(`${V}/sheet.pdf?size=A3&scale=200`);
    expect(el().textContent).toContain('licensed structural engineer');
  });

  it("shows the server's refusal when the plan does not fit, naming the smallest scale", async () => {
    // Read as text, so the error body comes back as the JSON string the API sent.
    backend.expectOne(`${V}/sheet.svg?size=A3&scale=200`).flush(
      JSON.stringify({
        error: {
          code: 'validation_failed',
          message: 'The plan does not fit an A3 sheet at 1:200; the smallest scale that fits is 1:250.',
        },
      }),
      { status: 400, statusText: 'Bad Request' },
    );
    await settle();
    expect(q('sheet-error')?.textContent).toContain('the smallest scale that fits is 1:250');
    expect(q('sheet-preview')).toBeNull();
  });

  it('asks for the report, shows its progress by sections, then offers to open it', async () => {
    backend.expectOne(`${V}/sheet.svg?size=A3&scale=200`).flush(SVG);
    await settle();
    (q('report-generate') as HTMLButtonElement).click();
    await settle();
    const post = backend.expectOne(`${V}/reports`);
    expect(post.request.method).toBe('POST');
    expect(post.request.body).toEqual({});
    reply(post, schemeReportSchema, report({}), { status: 202, statusText: 'Accepted' });
    await settle();
    expect(q('report-status')?.textContent).toContain('Waiting in the queue');
    expect((q('report-generate') as HTMLButtonElement).disabled).toBe(true);

    await settle(1100);
    reply(
      backend.expectOne(`/api/projects/${PROJECT}/scheme-reports/${REPORT}`),
      schemeReportSchema,
      report({ state: 'running', progress: { done: 3, total: 8 } }),
    );
    await settle();
    expect(q('report-status')?.textContent).toContain('3 of 8 sections');

    await settle(1100);
    reply(
      backend.expectOne(`/api/projects/${PROJECT}/scheme-reports/${REPORT}`),
      schemeReportSchema,
      report({
        state: 'done',
        progress: { done: 8, total: 8 },
        pages: 9,
        sizeBytes: 40_000,
        finishedAt: '2026-12-02T10:00:05.000Z',
      }),
    );
    await settle();
    expect(q('report-status')?.textContent).toContain('Ready');
    expect(q('report-open')?.getAttribute('href')).toBe(`/api/projects/${PROJECT}/scheme-reports/${REPORT}/file`);
    await settle(1100);
    backend.expectNone(`/api/projects/${PROJECT}/scheme-reports/${REPORT}`);
  });

  it('refuses to register a new drawing without a title, then registers the sheet as a draft revision', async () => {
    backend.expectOne(`${V}/sheet.svg?size=A3&scale=200`).flush(SVG);
    await settle();
    const title = q('register-title') as HTMLInputElement;
    title.value = '';
    title.dispatchEvent(new Event('input'));
    (q('register-submit') as HTMLButtonElement).click();
    await settle();
    backend.expectNone(`${V}/sheet/revisions`);
    expect(el().textContent).toContain('Give the drawing a title.');

    title.value = 'Column layout, scheme A';
    title.dispatchEvent(new Event('input'));
    (q('register-submit') as HTMLButtonElement).click();
    await settle();
    const post = backend.expectOne(`${V}/sheet/revisions`);
    expect(post.request.body).toEqual({
      size: 'A3',
      scale: 200,
      suitability: 'S2',
      purpose: 'information',
      newDrawing: { title: 'Column layout, scheme A', stageKey: 'column_layout' },
    });
    reply(
      post,
      planSheetRegisteredSchema,
      {
        drawingId: DRAWING,
        drawingNumber: 'S-004',
        schemeId: SCHEME,
        version: 3,
        revision: {
          id: REVISION,
          drawingId: DRAWING,
          code: 'P01',
          series: 'preliminary',
          suitability: 'S2',
          purpose: 'information',
          description: 'Column layout from scheme Wide bays, version 3',
          date: '2026-12-02',
          state: 'draft',
          drawnBy: { id: PERSON, displayName: 'Tomas Brell' },
          checkedBy: null,
          approvedBy: null,
          issuedAt: null,
          fromScheme: { id: SCHEME, name: 'Wide bays', version: 3 },
          files: [],
          allowedActions: ['check'],
        },
      },
      { status: 201, statusText: 'Created' },
    );
    await settle();
    reply(backend.expectOne(`/api/projects/${PROJECT}/drawings?pageSize=100`), drawingListSchema, {
      items: [],
      total: 0,
      page: 1,
      pageSize: 100,
    });
    await settle();
    expect(q('register-done')?.textContent).toContain('Revision P01 of S-004 registered from version 3');
  });

  it("shows the register's refusal in its words", async () => {
    backend.expectOne(`${V}/sheet.svg?size=A3&scale=200`).flush(SVG);
    await settle();
    (q('register-submit') as HTMLButtonElement).click();
    await settle();
    replyError(backend.expectOne(`${V}/sheet/revisions`), 409, {
      code: 'conflict',
      message: 'Revision P02 of S-002 is still draft; issue it before registering the next revision.',
    });
    await settle();
    expect(q('register-error')?.textContent).toContain('Revision P02 of S-002 is still draft');
  });
});
