import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { ErrorStateMatcher } from '@angular/material/core';
import {
  MAT_DIALOG_DATA,
  MatDialogActions,
  MatDialogClose,
  MatDialogContent,
  MatDialogRef,
  MatDialogTitle,
} from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { asYouType, fieldErrorText } from '../../../shared/forms/field-errors';
import { fieldCountText, formErrorFocus } from '../../../shared/forms/form-error-focus';

export interface StageActionDialogData {
  readonly action: 'return' | 'reopen';
  readonly stageTitle: string;
}

const notBlank = (c: { value: string }) => (c.value && !c.value.trim() ? { whitespace: true } : null);

/**
 * Returning a stage needs a comment (what must change), reopening an approved one needs a reason:
 * both go on the record. Closes with the text, or undefined when cancelled.
 */
@Component({
  selector: 'tb-stage-action-dialog',
  imports: [
    ReactiveFormsModule,
    MatButton,
    MatDialogActions,
    MatDialogClose,
    MatDialogContent,
    MatDialogTitle,
    MatError,
    MatFormField,
    MatHint,
    MatLabel,
    MatInput,
  ],
  providers: [{ provide: ErrorStateMatcher, useValue: asYouType }],
  template: `
    <h2 mat-dialog-title>{{ data.action === 'return' ? 'Return ' + data.stageTitle : 'Reopen ' + data.stageTitle }}</h2>
    <form [formGroup]="form" (ngSubmit)="confirm()" novalidate>
      <mat-dialog-content>
        <p>
          {{
            data.action === 'return'
              ? 'Say what needs changing. The engineer is told by e-mail and sees this in the stage’s thread.'
              : 'Reopening takes the approval back. Say why; it stays in the activity log.'
          }}
        </p>
        <mat-form-field class="text">
          <mat-label>{{ label }}</mat-label>
          <textarea
            matInput
            formControlName="text"
            rows="5"
            maxlength="4000"
            data-testid="action-text"
            cdkFocusInitial
          ></textarea>
          <mat-hint align="end">{{ form.controls.text.value.length }} / 4000</mat-hint>
          <mat-error>{{ error() }}</mat-error>
        </mat-form-field>
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        @if (invalidCount()) {
          <span class="count" data-testid="action-error-count">{{ countText(invalidCount()) }}</span>
        }
        <button mat-button type="button" [mat-dialog-close]="undefined">Cancel</button>
        <button mat-flat-button type="submit" data-testid="action-confirm">
          {{ data.action === 'return' ? 'Return the stage' : 'Reopen the stage' }}
        </button>
      </mat-dialog-actions>
    </form>
  `,
  styles: `
    .text {
      width: 100%;
      min-width: min(30rem, 80vw);
    }
    .count {
      margin-inline-end: auto;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StageActionDialog {
  protected readonly data = inject<StageActionDialogData>(MAT_DIALOG_DATA);
  private readonly ref = inject<MatDialogRef<StageActionDialog, string>>(MatDialogRef);
  protected readonly label = this.data.action === 'return' ? 'Comment' : 'Reason';
  private readonly reportInvalid = formErrorFocus();
  protected readonly invalidCount = signal(0);
  protected readonly countText = fieldCountText;
  protected readonly form = inject(NonNullableFormBuilder).group({
    text: ['', [Validators.required, Validators.maxLength(4000), notBlank]],
  });

  protected error(): string {
    const e = this.form.controls.text.errors;
    if (e?.['required'] || e?.['whitespace'])
      return this.data.action === 'return' ? 'Say what needs changing.' : 'Give a reason for reopening.';
    return fieldErrorText(this.form.controls.text, this.label);
  }

  protected confirm(): void {
    if (this.form.invalid) {
      // Focus goes to the text and the count is announced, rather than staying on the button.
      this.invalidCount.set(this.reportInvalid(this.form));
      return;
    }
    this.invalidCount.set(0);
    this.ref.close(this.form.controls.text.value.trim());
  }
}
