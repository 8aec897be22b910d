import { LiveAnnouncer } from '@angular/cdk/a11y';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ANIMATION_MODULE_TYPE } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { drawingListSchema, meSchema, projectPageSchema, transmittalListSchema } from '@trabeate/contracts';
import { reply } from '../../../testing/api-replies';
import { aProjectPage } from '../../../testing/fixtures';
import { Session } from '../../core/auth/session';
import { grantedMe } from '../../core/auth/testing';
import { revisionCount, TransmittalsPanel } from './transmittals-panel';

const PROJECT = '00000000-0000-4000-8000-000000000301';
const CONTACT = '00000000-0000-4000-8000-000000000203';
const approvedItem = (n: number) => ({
  id: `00000000-0000-4000-8000-00000000050${n}`,
  number: `QT-S-10${n}`,
  title: `Level ${n} columns`,
  stageKey: 'column_layout' as const,
  sheetSize: 'A1' as const,
  scale: '1:100',
  current: {
    id: `00000000-0000-4000-8000-00000000060${n}`,
    code: 'P01',
    suitability: 'S2',
    state: 'approved' as const,
    date: '2026-03-01',
    issuedAt: null,
  },
  revisionCount: 1,
});

jest.setTimeout(30_000);

describe('TransmittalsPanel', () => {
  let fixture: ComponentFixture<TransmittalsPanel>;
  let backend: HttpTestingController;
  let announced: string[];
  const el = () => fixture.nativeElement as HTMLElement;
  const settle = async () => {
    await new Promise((r) => setTimeout(r));
    fixture.detectChanges();
    await new Promise((r) => setTimeout(r));
    fixture.detectChanges();
  };
  const by = (id: string) => el().querySelector(`[data-testid="${id}"]`) as HTMLElement;
  const submit = () => by('issue-submit') as HTMLButtonElement;

  beforeEach(async () => {
    announced = [];
    TestBed.configureTestingModule({
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: ANIMATION_MODULE_TYPE, useValue: 'NoopAnimations' },
        { provide: LiveAnnouncer, useValue: { announce: async (m: string) => void announced.push(m) } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    const loaded = TestBed.inject(Session).load();
    reply(backend.expectOne('/api/me'), meSchema, grantedMe('principal'));
    await loaded;
    fixture = TestBed.createComponent(TransmittalsPanel);
    fixture.componentRef.setInput('projectId', PROJECT);
    await settle();
    reply(backend.expectOne(`/api/projects/${PROJECT}/transmittals`), transmittalListSchema, []);
    reply(
      backend.expectOne((r) => r.url === `/api/projects/${PROJECT}/drawings` && r.params.get('state') === 'approved'),
      drawingListSchema,
      { items: [approvedItem(1), approvedItem(2)], total: 2, page: 1, pageSize: 100 },
    );
    reply(
      backend.expectOne(`/api/projects/${PROJECT}/full`),
      projectPageSchema,
      aProjectPage({ members: [{ id: CONTACT, displayName: 'Ilse Varga', role: 'client' }] }),
    );
    await settle();
  });

  afterEach(() => backend.verify());

  it('counts revisions in words: 1 revision, 2 revisions', async () => {
    expect([0, 1, 2].map(revisionCount)).toEqual(['0 revisions', '1 revision', '2 revisions']);
    (by('issue-QT-S-101').querySelector('input') as HTMLInputElement).click();
    await settle();
    expect(submit().textContent?.trim()).toBe('Issue 1 revision');
    (by('issue-QT-S-102').querySelector('input') as HTMLInputElement).click();
    await settle();
    expect(submit().textContent?.trim()).toBe('Issue 2 revisions');
  });

  it('after a failed issue, focus moves to the bad address and the count is shown and announced', async () => {
    (by('issue-QT-S-101').querySelector('input') as HTMLInputElement).click();
    const externals = by('issue-externals') as HTMLTextAreaElement;
    externals.value = 'site office at the yard';
    externals.dispatchEvent(new Event('input'));
    await settle();
    submit().focus();
    submit().click();
    await settle();
    expect(document.activeElement).toBe(externals);
    expect(by('issue-error-count')?.textContent?.trim()).toBe('1 field needs attention.');
    expect(announced).toEqual(['1 field needs attention.']);
    expect(el().querySelector('mat-error')?.textContent).toContain('Not an e-mail address');
    backend.expectNone((r) => r.method === 'POST');
  });
});
