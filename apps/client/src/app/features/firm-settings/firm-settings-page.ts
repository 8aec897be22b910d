import { HttpClient, HttpErrorResponse, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators, type AbstractControl } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatProgressSpinner } from '@angular/material/progress-spinner';
import { firmDateSettingsSchema, type FirmDateSettingsBody } from '@trabeate/contracts';
import { formatDayTime, isSupportedLocale, isSupportedTimeZone, zoneLabel } from '@trabeate/dates';
import { firstValueFrom, map } from 'rxjs';
import { errorMessage, fieldErrors } from '../../core/auth/api-error';
import { Session } from '../../core/auth/session';
import { Notice } from '../../core/notice';
import { applyServerErrors, asYouType, fieldErrorText } from '../../shared/forms/field-errors';
import { fieldCountText, formErrorFocus } from '../../shared/forms/form-error-focus';
import { fillOnce } from '../../shared/forms/fill-once';

/** The same rules the API applies (libs/dates), so the form says so while the principal types. */
const localeRule = (c: AbstractControl) =>
  typeof c.value === 'string' && c.value.trim() !== '' && !isSupportedLocale(c.value.trim())
    ? { hint: 'Use a language tag this browser knows, such as en-GB, en-US, en-IN or de-DE.' }
    : null;
const zoneRule = (c: AbstractControl) =>
  typeof c.value === 'string' && c.value.trim() !== '' && !isSupportedTimeZone(c.value.trim())
    ? { hint: 'Use an IANA time zone from the list, such as Europe/London or Asia/Kolkata.' }
    : null;

/** Language tags offered as suggestions; any other tag Intl knows is accepted too. */
const LOCALE_SUGGESTIONS = ['en-GB', 'en-US', 'en-IN', 'en-AU', 'en-IE', 'de-DE', 'fr-FR', 'es-ES', 'nl-NL'];
/** A fixed moment for the preview, so the example does not change while the principal reads it. */
const SAMPLE = new Date(Date.UTC(2026, 11, 20, 14, 5));

/** The principal's firm-wide date language: the locale dates are written in and the zone times are read in. */
@Component({
  selector: 'tb-firm-settings-page',
  imports: [ReactiveFormsModule, MatButton, MatFormField, MatLabel, MatHint, MatError, MatInput, MatProgressSpinner],
  template: `
    <header class="page-header">
      <h1 class="page-title">Dates and time</h1>
    </header>
    @if (settings.isLoading() && !settings.hasValue()) {
      <div class="state" role="status">
        <mat-progress-spinner diameter="32" mode="indeterminate" /> Loading the firm's settings…
      </div>
    } @else if (settings.error()) {
      <div class="state" role="alert">
        <p>The settings could not be loaded. {{ loadError() }}</p>
        <button mat-stroked-button type="button" (click)="settings.reload()">Try again</button>
      </div>
    } @else {
      <form [formGroup]="form" (ngSubmit)="save()" novalidate class="settings-form" data-testid="firm-dates-form">
        <p class="note">
          Every date in Trabeate follows these: the screens of everyone in the firm and its clients, e-mails, invoices,
          transmittal sheets and reports.
        </p>
        <mat-form-field>
          <mat-label>Date language</mat-label>
          <input
            matInput
            formControlName="dateLocale"
            [errorStateMatcher]="asYouType"
            autocomplete="off"
            list="tb-locale-suggestions"
          />
          <datalist id="tb-locale-suggestions">
            @for (l of locales; track l) {
              <option [value]="l"></option>
            }
          </datalist>
          <mat-hint>A language tag: en-GB writes 20 Dec 2026, de-DE 20. Dez. 2026.</mat-hint>
          <mat-error data-testid="locale-error">{{ errorText(form.controls.dateLocale, 'Date language') }}</mat-error>
        </mat-form-field>
        <mat-form-field>
          <mat-label>Time zone</mat-label>
          <input
            matInput
            formControlName="timeZone"
            [errorStateMatcher]="asYouType"
            autocomplete="off"
            list="tb-zone-suggestions"
          />
          <datalist id="tb-zone-suggestions">
            @for (z of zones; track z) {
              <option [value]="z"></option>
            }
          </datalist>
          <mat-hint>Where the firm works; times on screen and on paper are its local time.</mat-hint>
          <mat-error data-testid="zone-error">{{ errorText(form.controls.timeZone, 'Time zone') }}</mat-error>
        </mat-form-field>

        <p class="preview" aria-live="polite" data-testid="preview">
          @if (preview(); as p) {
            20 Dec 2026 at 14:05 UTC will read <strong>{{ p }}</strong>.
          } @else {
            The example appears once both fields are right.
          }
        </p>

        @if (formError()) {
          <p class="form-error" role="alert" data-testid="form-error">{{ formError() }}</p>
        }
        <div class="actions">
          <button mat-flat-button type="submit" [disabled]="saving()" data-testid="save-firm-dates">
            {{ saving() ? 'Saving…' : 'Save dates and time' }}
          </button>
          @if (errorCount()) {
            <span class="count" data-testid="error-count">{{ countText(errorCount()) }}</span>
          }
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
    .note {
      margin: 0;
    }
    .actions {
      display: flex;
      align-items: center;
      gap: 16px;
      flex-wrap: wrap;
    }
    .state {
      display: flex;
      align-items: center;
      gap: 12px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FirmSettingsPage {
  private readonly showErrors = formErrorFocus();
  private readonly http = inject(HttpClient);
  private readonly notice = inject(Notice);
  private readonly session = inject(Session);
  protected readonly asYouType = asYouType;
  protected readonly errorText = fieldErrorText;
  protected readonly countText = fieldCountText;
  protected readonly locales = LOCALE_SUGGESTIONS;
  protected readonly zones = Intl.supportedValuesOf('timeZone');

  protected readonly settings = httpResource(() => '/api/firm-settings', {
    parse: (x) => firmDateSettingsSchema.parse(x),
  });
  protected readonly form = inject(NonNullableFormBuilder).group({
    dateLocale: ['', [Validators.required, Validators.maxLength(35), localeRule]],
    timeZone: ['', [Validators.required, Validators.maxLength(64), zoneRule]],
  });
  private readonly values = toSignal(this.form.valueChanges, { initialValue: this.form.getRawValue() });
  protected readonly preview = computed(() => {
    const v = this.values();
    const locale = v.dateLocale?.trim() ?? '';
    const timeZone = v.timeZone?.trim() ?? '';
    if (!isSupportedLocale(locale) || !isSupportedTimeZone(timeZone)) return '';
    return `${formatDayTime(SAMPLE, { locale, timeZone })} ${zoneLabel(SAMPLE, { locale, timeZone })}`;
  });
  protected readonly saving = signal(false);
  protected readonly formError = signal('');
  protected readonly errorCount = signal(0);
  protected readonly loadError = computed(() => errorMessage(this.settings.error()));

  constructor() {
    fillOnce(this.settings, (stored) => this.form.setValue(stored));
  }

  async save(): Promise<void> {
    if (this.saving()) return;
    this.formError.set('');
    if (this.form.invalid) {
      this.errorCount.set(this.showErrors(this.form));
      return;
    }
    this.errorCount.set(0);
    this.saving.set(true);
    const v = this.form.getRawValue();
    const body: FirmDateSettingsBody = { dateLocale: v.dateLocale.trim(), timeZone: v.timeZone.trim() };
    try {
      const saved = await firstValueFrom(
        this.http.put('/api/firm-settings', body).pipe(map((x) => firmDateSettingsSchema.parse(x))),
      );
      this.form.setValue(saved);
      this.form.markAsPristine();
      // Screens take the firm's settings from the session: read it again so they follow at once.
      await this.session.reload();
      this.notice.show('Dates and time saved.', 4000);
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
