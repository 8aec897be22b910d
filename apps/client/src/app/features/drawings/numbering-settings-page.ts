import { HttpClient, HttpErrorResponse, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators, type AbstractControl } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatProgressSpinner } from '@angular/material/progress-spinner';
import { MatRadioButton, MatRadioGroup } from '@angular/material/radio';
import { RouterLink } from '@angular/router';
import {
  drawingSettingsSchema,
  numberPatternSchema,
  type DrawingSettings,
  type RevisionScheme,
} from '@trabeate/contracts';
import { firstValueFrom, map } from 'rxjs';
import { errorMessage, fieldErrors } from '../../core/auth/api-error';
import { Notice } from '../../core/notice';
import { applyServerErrors, asYouType, fieldErrorText } from '../../shared/forms/field-errors';
import { formErrorFocus } from '../../shared/forms/form-error-focus';
import { fillOnce } from '../../shared/forms/fill-once';

/** The pattern rule the server applies, so the form says the same thing while the principal types. */
const patternRule = (c: AbstractControl) => {
  if (typeof c.value !== 'string' || c.value.trim() === '') return null;
  const parsed = numberPatternSchema.safeParse(c.value);
  const m = parsed.success ? '' : parsed.error.issues[0].message;
  return parsed.success ? null : { hint: `${m.charAt(0).toUpperCase()}${m.slice(1)}.` };
};

/** What a pattern gives for the first drawing of a project whose reference is `reference`. */
export function patternExample(pattern: string, reference: string): string {
  return pattern
    .trim()
    .replaceAll('{project}', reference)
    .replace(/\{seq:([1-6])\}/, (_m, n: string) => '1'.padStart(Number(n), '0'));
}

export const SCHEME_CHOICES: ReadonlyArray<{ value: RevisionScheme; label: string; example: string }> = [
  {
    value: 'iso19650',
    label: 'Numbered by series (ISO 19650 practice)',
    example: 'P01, P02 … while preliminary; C01, C02 … once contractual',
  },
  {
    value: 'letters_numbers',
    label: 'Letters, then numbers',
    example: 'A, B, C … while preliminary; 0, 1, 2 … once contractual',
  },
];

/** The principal's numbering for the whole firm: drawing number pattern and revision code scheme. */
@Component({
  selector: 'tb-numbering-settings-page',
  imports: [
    ReactiveFormsModule,
    RouterLink,
    MatButton,
    MatFormField,
    MatLabel,
    MatHint,
    MatError,
    MatInput,
    MatRadioGroup,
    MatRadioButton,
    MatProgressSpinner,
  ],
  template: `
    <header class="page-header">
      <h1 class="page-title">Drawing numbering</h1>
      <a mat-stroked-button routerLink="/drawings">Back to drawings</a>
    </header>
    @if (settings.isLoading() && !settings.hasValue()) {
      <div class="state" role="status">
        <mat-progress-spinner diameter="32" mode="indeterminate" /> Loading the firm's numbering…
      </div>
    } @else if (settings.error()) {
      <div class="state" role="alert">
        <p>The numbering settings could not be loaded. {{ loadError() }}</p>
        <button mat-stroked-button type="button" (click)="settings.reload()">Try again</button>
      </div>
    } @else {
      <form [formGroup]="form" (ngSubmit)="save()" novalidate class="settings-form" data-testid="numbering-form">
        <mat-form-field appearance="outline">
          <mat-label>Drawing number pattern</mat-label>
          <input matInput formControlName="numberPattern" [errorStateMatcher]="asYouType" autocomplete="off" />
          <mat-hint>
            {{ '{' }}project{{ '}' }} is the project reference, {{ '{' }}seq:3{{ '}' }} a 3-digit sequence. First
            drawing: <strong data-testid="pattern-example">{{ example() }}</strong>
          </mat-hint>
          <mat-error data-testid="pattern-error">{{ errorText(form.controls.numberPattern, 'Pattern') }}</mat-error>
        </mat-form-field>

        <fieldset class="scheme">
          <legend>Revision codes</legend>
          <mat-radio-group formControlName="revisionScheme" aria-label="Revision codes">
            @for (choice of schemes; track choice.value) {
              <mat-radio-button [value]="choice.value" [attr.data-testid]="'scheme-' + choice.value">
                {{ choice.label }} <span class="example">({{ choice.example }})</span>
              </mat-radio-button>
            }
          </mat-radio-group>
        </fieldset>
        <p class="note">
          Existing drawings and revisions keep their numbers and codes; the new settings apply to what is registered
          next.
        </p>

        @if (formError()) {
          <p class="form-error" role="alert" data-testid="form-error">{{ formError() }}</p>
        }
        <div class="actions">
          <button mat-flat-button type="submit" [disabled]="saving()" data-testid="save-numbering">
            {{ saving() ? 'Saving…' : 'Save numbering' }}
          </button>
        </div>
      </form>
    }
  `,
  styleUrls: ['../../shared/page/page.scss'],
  styles: `
    .settings-form {
      display: flex;
      flex-direction: column;
      gap: 16px;
      max-width: 640px;
    }
    .scheme {
      border: 1px solid currentColor;
      border-radius: 4px;
      padding: 8px 16px;
    }
    mat-radio-group {
      display: flex;
      flex-direction: column;
      gap: 4px;
    }
    .example,
    .note {
      opacity: 0.8;
    }
    .state {
      display: flex;
      align-items: center;
      gap: 12px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class NumberingSettingsPage {
  private readonly showErrors = formErrorFocus();
  private readonly http = inject(HttpClient);
  private readonly notice = inject(Notice);
  protected readonly asYouType = asYouType;
  protected readonly schemes = SCHEME_CHOICES;
  protected readonly errorText = fieldErrorText;

  protected readonly settings = httpResource(() => '/api/drawing-settings', {
    parse: (x) => drawingSettingsSchema.parse(x),
  });
  protected readonly form = inject(NonNullableFormBuilder).group({
    numberPattern: ['', [Validators.required, Validators.maxLength(80), patternRule]],
    revisionScheme: ['iso19650' as RevisionScheme, Validators.required],
  });
  private readonly pattern = toSignal(this.form.controls.numberPattern.valueChanges, { initialValue: '' });
  protected readonly example = computed(() => patternExample(this.pattern() ?? '', 'REF'));
  protected readonly saving = signal(false);
  protected readonly formError = signal('');
  protected readonly loadError = computed(() => errorMessage(this.settings.error()));

  constructor() {
    fillOnce(this.settings, (stored) => this.form.setValue(stored));
  }

  async save(): Promise<void> {
    if (this.saving()) return;
    this.formError.set('');
    if (this.form.invalid) {
      this.showErrors(this.form);
      this.formError.set('The pattern needs attention before the numbering can be saved.');
      return;
    }
    this.saving.set(true);
    const body: DrawingSettings = { ...this.form.getRawValue() };
    body.numberPattern = body.numberPattern.trim();
    try {
      const saved = await firstValueFrom(
        this.http.put('/api/drawing-settings', body).pipe(map((x) => drawingSettingsSchema.parse(x))),
      );
      this.form.setValue(saved);
      this.form.markAsPristine();
      this.notice.show('Numbering saved.', 4000);
    } catch (err) {
      const unmatched = applyServerErrors(this.form.controls, fieldErrors(err));
      const status = err instanceof HttpErrorResponse ? err.status : 0;
      // 401 and 403 are announced by the interceptor.
      if (status !== 401 && status !== 403) this.formError.set(unmatched[0] ?? errorMessage(err));
    } finally {
      this.saving.set(false);
    }
  }
}
