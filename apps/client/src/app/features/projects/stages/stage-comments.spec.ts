import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { LiveAnnouncer } from '@angular/cdk/a11y';
import { ANIMATION_MODULE_TYPE } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { commentSchema } from '@trabeate/contracts';
import { reply } from '../../../../testing/api-replies';
import { StageComments } from './stage-comments';

const PROJECT_ID = '00000000-0000-4000-8000-000000000301';
const URL = `/api/projects/${PROJECT_ID}/stages/column_layout/comments`;

describe('StageComments', () => {
  let fixture: ComponentFixture<StageComments>;
  let backend: HttpTestingController;
  let announced: string[];
  const el = () => fixture.nativeElement as HTMLElement;
  const settle = async (ms = 0) => {
    await new Promise((r) => setTimeout(r, ms));
    TestBed.tick();
  };

  beforeEach(async () => {
    announced = [];
    TestBed.configureTestingModule({
      imports: [StageComments],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: ANIMATION_MODULE_TYPE, useValue: 'NoopAnimations' },
        { provide: LiveAnnouncer, useValue: { announce: async (m: string) => void announced.push(m) } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(StageComments);
    fixture.componentRef.setInput('projectId', PROJECT_ID);
    fixture.componentRef.setInput('stageKey', 'column_layout');
    fixture.componentRef.setInput('canComment', true);
    fixture.detectChanges();
    TestBed.tick();
    reply(backend.expectOne(URL), commentSchema.array(), []);
    await settle();
  });

  it('asks for text on an empty post, and clears that message once a comment is posted', async () => {
    const post = el().querySelector('[data-testid="comment-post"]') as HTMLButtonElement;
    post.click();
    await settle();
    backend.expectNone((r) => r.method === 'POST');
    expect(el().querySelector('mat-error')?.textContent).toContain('Write something first.');

    const text = el().querySelector('[data-testid="comment-text"]') as HTMLTextAreaElement;
    text.value = 'Grid D spacing checked against the stair core.';
    text.dispatchEvent(new Event('input'));
    post.click();
    await settle();
    const req = backend.expectOne((r) => r.method === 'POST' && r.url === URL);
    reply(req, commentSchema, {
      id: '00000000-0000-4000-8000-000000000901',
      stageKey: 'column_layout',
      author: { id: '00000000-0000-4000-8000-000000000202', displayName: 'Cato Brennagh' },
      body: 'Grid D spacing checked against the stair core.',
      action: null,
      createdAt: '2026-03-02T08:00:00.000Z',
    });
    await settle();
    reply(backend.expectOne(URL), commentSchema.array(), []);
    await settle();
    expect(text.value).toBe('');
    expect(el().querySelector('mat-error')).toBeNull();
  });

  it('after an empty post, focus moves from the button to the comment box and the count is shown and announced', async () => {
    const post = el().querySelector('[data-testid="comment-post"]') as HTMLButtonElement;
    post.focus();
    post.click();
    await settle();
    expect(document.activeElement).toBe(el().querySelector('[data-testid="comment-text"]'));
    expect(el().querySelector('[data-testid="comment-error-count"]')?.textContent?.trim()).toBe(
      '1 field needs attention.',
    );
    expect(announced).toEqual(['1 field needs attention.']);
    backend.expectNone((r) => r.method === 'POST');
  });
});
