import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ANIMATION_MODULE_TYPE } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import {
  schemeListSchema,
  schemeVersionListSchema,
  schemeVersionSchema,
  stageSchema,
  type SchemeCheck,
  type SchemeVersion,
} from '@trabeate/contracts';
import { demoScheme } from '@trabeate/structural';
import { reply, replyError } from '../../../../testing/api-replies';
import { StageSubmitDialog, type StageSubmitDialogData } from './stage-submit-dialog';

const PROJECT_ID = '00000000-0000-4000-8000-000000000301';
const SCHEME_ID = '00000000-0000-4000-8000-000000000401';
const SCHEMES = `/api/projects/${PROJECT_ID}/schemes`;
const TRANSITIONS = `/api/projects/${PROJECT_ID}/stages/column_layout/transitions`;
const PERSON = { id: '00000000-0000-4000-8000-000000000202', displayName: 'Cato Brennagh' };
const AT = '2026-03-02T08:00:00.000Z';
const COUNTS = { engineVersion: '1.0.0', ok: true, errors: 2, warnings: 1 };

// Invented checks in the engine's shape; the dialog only needs their identity and words.
const check = (ruleId: string, elements: string[], severity: SchemeCheck['severity']): SchemeCheck => ({
  ruleId,
  severity,
  status: 'fail',
  elements,
  message: `${ruleId} fails at ${elements.join(', ')}`,
  value: 2,
  limit: 1,
  unit: '',
  sense: 'max',
  source: 'common practice',
  sourceKind: 'practice',
});

function version(checks: SchemeCheck[]): SchemeVersion {
  return schemeVersionSchema.parse({
    version: 3,
    savedAt: AT,
    savedBy: PERSON,
    restoredFrom: null,
    schemaVersion: 1,
    checks: COUNTS,
    document: { ...demoScheme(), id: SCHEME_ID, name: 'Courtyard grid' },
    results: { caution: 'Preliminary.', ok: true, problems: [], checks, passed: [] },
  });
}

// The first test compiles the dialog's templates, which takes seconds on a busy shared machine.
jest.setTimeout(30_000);

describe('StageSubmitDialog', () => {
  let backend: HttpTestingController;
  let closedWith: unknown;
  let host: HTMLElement;
  const settle = async (ms = 0) => {
    await new Promise((r) => setTimeout(r, ms));
    TestBed.tick();
  };
  const q = <T extends Element>(sel: string) => host.querySelector<T>(sel);
  const type = (el: HTMLTextAreaElement, text: string) => {
    el.value = text;
    el.dispatchEvent(new Event('input'));
  };

  async function open(checks: SchemeCheck[]): Promise<void> {
    closedWith = 'not closed';
    TestBed.configureTestingModule({
      imports: [StageSubmitDialog],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: ANIMATION_MODULE_TYPE, useValue: 'NoopAnimations' },
        {
          provide: MAT_DIALOG_DATA,
          useValue: {
            projectId: PROJECT_ID,
            stageKey: 'column_layout',
            stageTitle: 'Column layout',
          } satisfies StageSubmitDialogData,
        },
        { provide: MatDialogRef, useValue: { close: (v: unknown) => (closedWith = v) } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(StageSubmitDialog);
    host = fixture.nativeElement as HTMLElement;
    document.body.appendChild(host);
    fixture.detectChanges();
    TestBed.tick();
    reply(
      backend.expectOne((r) => r.url.startsWith(SCHEMES) && r.url.includes('pageSize')),
      schemeListSchema,
      {
        items: [
          {
            id: SCHEME_ID,
            name: 'Courtyard grid',
            version: 3,
            archived: false,
            createdAt: AT,
            updatedAt: AT,
            savedBy: PERSON,
            columns: 20,
            checks: COUNTS,
          },
        ],
        total: 1,
        page: 1,
        pageSize: 100,
        canEdit: true,
      },
    );
    await settle();
    const lists = backend.match((r) => r.url.startsWith(`${SCHEMES}/${SCHEME_ID}/versions?`));
    for (const l of lists)
      reply(l, schemeVersionListSchema, {
        items: [{ version: 3, savedAt: AT, savedBy: PERSON, restoredFrom: null, schemaVersion: 1, checks: COUNTS }],
        total: 1,
        page: 1,
        pageSize: 100,
      });
    await settle();
    const latest = backend.expectOne(`${SCHEMES}/${SCHEME_ID}/versions/3`);
    reply(latest, schemeVersionSchema, version(checks));
    await settle();
  }

  afterEach(() => host?.remove());

  it('asks a justification for each error-level check of the latest save, not for warnings', async () => {
    await open([
      check('column.capacity', ['B3'], 'error'),
      check('beam.span', ['B-3/B-D'], 'warning'),
      check('column.spacing', ['C2', 'C4'], 'error'),
    ]);
    expect(q('[data-testid="justification-0"]')).not.toBeNull();
    expect(q('[data-testid="justification-1"]')).not.toBeNull();
    expect(q('[data-testid="justification-2"]')).toBeNull();
    expect(q('[data-testid="justifications"]')?.textContent).toContain('2 error-level checks to justify');
    expect(q('[data-testid="justifications"]')?.textContent).not.toContain('beam.span');
  });

  it('shows a blank justification as an error as soon as it is typed, before any submit', async () => {
    await open([check('column.capacity', ['B3'], 'error')]);
    const field = q<HTMLTextAreaElement>('[data-testid="justification-0"]')!;
    type(field, '   ');
    await settle();
    expect(host.querySelector('mat-error')?.textContent).toContain('Say why this check may stand.');
    type(field, 'Carried on a transfer beam.');
    await settle();
    expect(host.querySelector('mat-error')).toBeNull();
  });

  it('on a submit with a justification missing, sends nothing, focuses the first one and counts the fields', async () => {
    await open([check('column.capacity', ['B3'], 'error'), check('column.spacing', ['C2', 'C4'], 'error')]);
    type(q<HTMLTextAreaElement>('[data-testid="justification-1"]')!, 'Agreed with the architect.');
    await settle();
    q<HTMLButtonElement>('[data-testid="submit-confirm"]')!.click();
    await settle();
    backend.expectNone(TRANSITIONS);
    expect(document.activeElement).toBe(q('[data-testid="justification-0"]'));
    expect(q('[data-testid="invalid-count"]')?.textContent).toContain('1 field needs attention.');
  });

  it('submits the scheme, its version and the trimmed justifications, and closes with the stage', async () => {
    await open([check('column.capacity', ['B3'], 'error')]);
    type(q<HTMLTextAreaElement>('[data-testid="justification-0"]')!, '  B3 sits on a transfer beam.  ');
    await settle();
    q<HTMLButtonElement>('[data-testid="submit-confirm"]')!.click();
    await settle();
    const req = backend.expectOne(TRANSITIONS);
    expect(req.request.body).toEqual({
      action: 'submit',
      scheme: { schemeId: SCHEME_ID, version: 3 },
      justifications: [{ ruleId: 'column.capacity', elements: ['B3'], text: 'B3 sits on a transfer beam.' }],
    });
    const submitted = {
      key: 'column_layout' as const,
      title: 'Column layout',
      position: 2,
      state: 'under_review' as const,
      assignee: PERSON,
      dueDate: null,
      late: false,
      submittedAt: AT,
      approvedAt: null,
      deliverableCount: 0,
      commentCount: 0,
      allowedActions: [],
    };
    reply(req, stageSchema, submitted);
    await settle();
    expect(closedWith).toEqual(submitted);
  });

  it("puts the server's refusal of a check on its field and keeps the dialog open", async () => {
    await open([check('column.capacity', ['B3'], 'error')]);
    type(q<HTMLTextAreaElement>('[data-testid="justification-0"]')!, 'Fine.');
    await settle();
    q<HTMLButtonElement>('[data-testid="submit-confirm"]')!.click();
    await settle();
    replyError(backend.expectOne(TRANSITIONS), 409, {
      code: 'conflict',
      message: 'Column layout cannot be submitted while an error-level check stands without a justification.',
      fields: { 'column.capacity @ B3': ['justify or resolve: column.capacity fails at B3'] },
    });
    await settle();
    expect(closedWith).toBe('not closed');
    expect(q('[data-testid="submit-error"]')?.textContent).toContain('cannot be submitted');
    expect(host.querySelector('mat-error')?.textContent).toContain('justify or resolve');
  });

  it('says so when the save has no error-level checks, and submits without justifications', async () => {
    await open([check('beam.span', ['B-3/B-D'], 'warning')]);
    expect(q('[data-testid="no-errors"]')?.textContent).toContain('No error-level checks');
    q<HTMLButtonElement>('[data-testid="submit-confirm"]')!.click();
    await settle();
    expect(backend.expectOne(TRANSITIONS).request.body).toEqual({
      action: 'submit',
      scheme: { schemeId: SCHEME_ID, version: 3 },
      justifications: [],
    });
  });
});
