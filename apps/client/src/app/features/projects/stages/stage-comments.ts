import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject, input, output, signal, viewChild } from '@angular/core';
import { FormGroupDirective, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { ErrorStateMatcher } from '@angular/material/core';
import { MatError, MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import type { Comment, StageAction, StageKey } from '@trabeate/contracts';
import { errorMessage } from '../../../core/auth/api-error';
import { asYouType, fieldErrorText } from '../../../shared/forms/field-errors';
import { fieldCountText, formErrorFocus } from '../../../shared/forms/form-error-focus';
import { ProjectsApi, stageUrl } from '../projects-api';
import { DayTimePipe } from '../../../shared/dates/app-dates';

const notBlank = (c: { value: string }) => (c.value && !c.value.trim() ? { whitespace: true } : null);

const ACTION_NOTES: Readonly<Record<StageAction, string>> = {
  start: 'started work',
  submit: 'submitted for review',
  approve: 'approved',
  return: 'returned',
  reopen: 'reopened',
};

/** The stage's thread: notes between the engineer and the principal, with the comments that came with decisions. */
@Component({
  selector: 'tb-stage-comments',
  imports: [DayTimePipe, ReactiveFormsModule, MatButton, MatError, MatFormField, MatLabel, MatInput],
  providers: [{ provide: ErrorStateMatcher, useValue: asYouType }],
  template: `
    <section aria-labelledby="thread-heading" data-testid="comments">
      <h3 id="thread-heading">Thread</h3>
      @if (thread.error(); as err) {
        <p class="failure" role="alert">The thread could not be loaded. {{ message(err) }}</p>
      } @else if (!thread.hasValue()) {
        <p class="muted" role="status">Loading the thread…</p>
      } @else if (thread.value().length === 0) {
        <p class="muted">No comments yet.</p>
      } @else {
        <ol class="thread">
          @for (c of thread.value(); track c.id) {
            <li [class.decision]="c.action" data-testid="comment">
              <div class="meta">
                <strong>{{ c.author.displayName }}</strong>
                @if (c.action) {
                  <span class="tag">{{ note(c.action) }}</span>
                }
                <time [attr.datetime]="c.createdAt">{{ c.createdAt | tbDayTime }}</time>
              </div>
              <p class="body">{{ c.body }}</p>
            </li>
          }
        </ol>
      }
      @if (canComment()) {
        <form [formGroup]="form" (ngSubmit)="post()" novalidate class="new">
          <mat-form-field class="text" subscriptSizing="dynamic">
            <mat-label>Add a comment</mat-label>
            <textarea matInput formControlName="body" rows="3" maxlength="4000" data-testid="comment-text"></textarea>
            <mat-error>{{ bodyError() }}</mat-error>
          </mat-form-field>
          <button mat-stroked-button type="submit" data-testid="comment-post" [disabled]="posting()">
            {{ posting() ? 'Posting…' : 'Post' }}
          </button>
          @if (invalidCount()) {
            <span class="count" data-testid="comment-error-count">{{ countText(invalidCount()) }}</span>
          }
          @if (postError()) {
            <p class="failure" role="alert">{{ postError() }}</p>
          }
        </form>
      }
    </section>
  `,
  styles: `
    h3 {
      font: var(--mat-sys-title-small);
      margin: 1.25rem 0 0.5rem;
    }
    .muted {
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
    }
    .thread {
      list-style: none;
      margin: 0 0 0.75rem;
      padding: 0;
    }
    .thread li {
      padding: 0.5rem 0.75rem;
      margin-bottom: 0.5rem;
      border-left: 3px solid var(--mat-sys-outline-variant);
      background: var(--mat-sys-surface-container-low);
    }
    .thread li.decision {
      border-left-color: var(--tb-accent);
    }
    .meta {
      display: flex;
      gap: 0.6rem;
      align-items: baseline;
      flex-wrap: wrap;
      font: var(--mat-sys-body-small);
    }
    .tag {
      padding: 0 0.35rem;
      border: 1px solid var(--mat-sys-outline);
      font: var(--mat-sys-label-small);
    }
    time {
      color: var(--mat-sys-on-surface-variant);
    }
    .body {
      margin: 0.25rem 0 0;
      white-space: pre-wrap;
    }
    .new {
      display: flex;
      gap: 0.75rem;
      align-items: flex-start;
      flex-wrap: wrap;
    }
    .text {
      flex: 1 1 20rem;
    }
    .count {
      align-self: center;
    }
    .failure {
      flex-basis: 100%;
      margin: 0;
      padding: 0.5rem 0.75rem;
      border-left: 4px solid var(--mat-sys-error);
      background: var(--mat-sys-error-container);
      color: var(--mat-sys-on-error-container);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StageComments {
  private readonly api = inject(ProjectsApi);
  readonly projectId = input.required<string>();
  readonly stageKey = input.required<StageKey>();
  readonly canComment = input(false);
  readonly posted = output<Comment>();

  protected readonly thread = httpResource<Comment[]>(() => `${stageUrl(this.projectId(), this.stageKey())}/comments`);
  private readonly formDirective = viewChild(FormGroupDirective);
  protected readonly form = inject(NonNullableFormBuilder).group({
    body: ['', [Validators.required, Validators.maxLength(4000), notBlank]],
  });
  protected readonly posting = signal(false);
  protected readonly postError = signal('');
  private readonly reportInvalid = formErrorFocus();
  protected readonly invalidCount = signal(0);
  protected readonly countText = fieldCountText;

  reload(): void {
    this.thread.reload();
  }

  protected note(action: StageAction): string {
    return ACTION_NOTES[action];
  }

  protected message(err: unknown): string {
    return errorMessage(err);
  }

  protected bodyError(): string {
    const e = this.form.controls.body.errors;
    return e?.['required'] || e?.['whitespace']
      ? 'Write something first.'
      : fieldErrorText(this.form.controls.body, 'A comment');
  }

  protected async post(): Promise<void> {
    if (this.posting()) return;
    if (this.form.invalid) {
      // Focus goes to the comment box and the count is announced, rather than staying on Post.
      this.invalidCount.set(this.reportInvalid(this.form));
      return;
    }
    this.invalidCount.set(0);
    this.posting.set(true);
    this.postError.set('');
    try {
      const c = await this.api.addComment(this.projectId(), this.stageKey(), this.form.controls.body.value.trim());
      // resetForm, not reset: it also clears "submitted", so the empty box shows no error after a post.
      this.formDirective()?.resetForm();
      this.thread.reload();
      this.posted.emit(c);
    } catch (err) {
      this.postError.set(errorMessage(err));
    } finally {
      this.posting.set(false);
    }
  }
}
