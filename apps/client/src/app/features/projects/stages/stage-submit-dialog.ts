import { HttpClient, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, effect, inject, signal } from '@angular/core';
import { FormControl, FormGroup, FormRecord, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { ErrorStateMatcher, MatOption } from '@angular/material/core';
import {
  MAT_DIALOG_DATA,
  MatDialogActions,
  MatDialogClose,
  MatDialogContent,
  MatDialogRef,
  MatDialogTitle,
} from '@angular/material/dialog';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatSelect } from '@angular/material/select';
import {
  checkKey,
  schemeListSchema,
  schemeVersionListSchema,
  schemeVersionSchema,
  stageSchema,
  type SchemeCheck,
  type Stage,
  type StageKey,
  type StageTransition,
} from '@trabeate/contracts';
import { firstValueFrom } from 'rxjs';
import { apiError, errorMessage } from '../../../core/auth/api-error';
import { asYouType, fieldErrorText } from '../../../shared/forms/field-errors';
import { fieldCountText, formErrorFocus } from '../../../shared/forms/form-error-focus';
import { StateMarker } from '../../../shared/state-marker/state-marker';
import { stageUrl } from '../projects-api';

export interface StageSubmitDialogData {
  readonly projectId: string;
  readonly stageKey: StageKey;
  readonly stageTitle: string;
}

const notBlank = (c: { value: string }) => (c.value && !c.value.trim() ? { whitespace: true } : null);
const LATEST = 0;

/**
 * Submits a stage that rests on a scheme: the engineer names the scheme and the save (the latest
 * by default), sees the error-level checks that save's stored results hold, and writes why each may
 * stand. The server applies the same gate; its refusals come back onto the fields. Closes with the
 * submitted stage, or undefined when cancelled.
 */
@Component({
  selector: 'tb-stage-submit-dialog',
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
    MatIcon,
    MatInput,
    MatLabel,
    MatOption,
    MatSelect,
    StateMarker,
  ],
  providers: [{ provide: ErrorStateMatcher, useValue: asYouType }],
  templateUrl: './stage-submit-dialog.html',
  styleUrl: './stage-submit-dialog.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StageSubmitDialog {
  protected readonly data = inject<StageSubmitDialogData>(MAT_DIALOG_DATA);
  private readonly ref = inject<MatDialogRef<StageSubmitDialog, Stage>>(MatDialogRef);
  private readonly http = inject(HttpClient);
  private readonly reportInvalid = formErrorFocus();
  private readonly base = `/api/projects/${encodeURIComponent(this.data.projectId)}/schemes`;

  protected readonly schemes = httpResource(() => `${this.base}?pageSize=100&sort=updatedAt&direction=desc`, {
    parse: (v) => schemeListSchema.parse(v),
  });
  protected readonly form = new FormGroup({
    schemeId: new FormControl('', { nonNullable: true, validators: Validators.required }),
    version: new FormControl(LATEST, { nonNullable: true }),
    comment: new FormControl('', { nonNullable: true, validators: Validators.maxLength(4000) }),
    justifications: new FormRecord<FormControl<string>>({}),
  });
  private readonly schemeId = signal('');
  private readonly version = signal(LATEST);

  protected readonly versions = httpResource(
    () => (this.schemeId() ? `${this.base}/${encodeURIComponent(this.schemeId())}/versions?pageSize=100` : undefined),
    { parse: (v) => schemeVersionListSchema.parse(v) },
  );
  /** The save the stage would be submitted with: the chosen one, or the scheme's latest. */
  protected readonly effectiveVersion = computed(() => {
    const chosen = this.version();
    if (chosen !== LATEST) return chosen;
    return this.schemes.value()?.items.find((s) => s.id === this.schemeId())?.version ?? null;
  });
  protected readonly results = httpResource(
    () => {
      const v = this.effectiveVersion();
      return this.schemeId() && v
        ? `${this.base}/${encodeURIComponent(this.schemeId())}/versions/${encodeURIComponent(v)}`
        : undefined;
    },
    { parse: (v) => schemeVersionSchema.parse(v) },
  );
  /** Error-level checks of that save, one per rule and elements (as the server counts them). */
  protected readonly errorChecks = computed<SchemeCheck[]>(() => {
    const r = this.results.value()?.results;
    if (!r) return [];
    const seen = new Map<string, SchemeCheck>();
    for (const c of r.checks) if (c.status === 'fail' && c.severity === 'error') seen.set(checkKey(c), c);
    return [...seen.values()];
  });
  protected readonly warningCount = computed(
    () =>
      this.results.value()?.results.checks.filter((c) => c.status === 'fail' && c.severity === 'warning').length ?? 0,
  );
  protected readonly inputProblems = computed(() => this.results.value()?.results.problems.length ?? 0);

  protected readonly sending = signal(false);
  protected readonly formError = signal<string | null>(null);
  protected readonly invalidCount = signal(0);
  protected readonly key = checkKey;
  protected readonly errorText = fieldErrorText;

  constructor() {
    this.form.controls.schemeId.valueChanges.subscribe((id) => {
      this.schemeId.set(id);
      this.form.controls.version.setValue(LATEST);
    });
    this.form.controls.version.valueChanges.subscribe((v) => this.version.set(v));
    // The first scheme in the list (the most recently saved) is the likely one.
    effect(() => {
      const first = this.schemes.value()?.items[0];
      if (first && !this.form.controls.schemeId.value) this.form.controls.schemeId.setValue(first.id);
    });
    // One justification field per error-level check; text already typed for a check is kept.
    effect(() => {
      const group = this.form.controls.justifications;
      const wanted = new Set(this.errorChecks().map((c) => checkKey(c)));
      for (const name of Object.keys(group.controls)) if (!wanted.has(name)) group.removeControl(name);
      for (const name of wanted)
        if (!group.contains(name))
          group.addControl(
            name,
            new FormControl('', {
              nonNullable: true,
              validators: [Validators.required, Validators.maxLength(4000), notBlank],
            }),
          );
    });
  }

  protected control(check: SchemeCheck): FormControl<string> | null {
    return this.form.controls.justifications.controls[checkKey(check)] ?? null;
  }

  protected justificationError(check: SchemeCheck): string {
    const c = this.control(check);
    if (c?.errors?.['required'] || c?.errors?.['whitespace']) return 'Say why this check may stand.';
    return fieldErrorText(c, 'The justification');
  }

  protected async submit(): Promise<void> {
    if (this.sending()) return;
    const ready = !this.results.isLoading() && this.results.hasValue() && this.inputProblems() === 0;
    if (this.form.invalid || !ready) {
      this.invalidCount.set(this.reportInvalid(this.form));
      if (!ready && this.form.valid)
        this.formError.set(
          this.inputProblems()
            ? 'This save has input problems the checks could not get past; fix them in planning first.'
            : 'The checks of this save are still loading.',
        );
      return;
    }
    this.invalidCount.set(0);
    this.formError.set(null);
    this.sending.set(true);
    const v = this.form.getRawValue();
    const body: StageTransition = {
      action: 'submit',
      ...(v.comment.trim() ? { comment: v.comment.trim() } : {}),
      scheme: { schemeId: v.schemeId, version: this.effectiveVersion()! },
      justifications: this.errorChecks().map((c) => ({
        ruleId: c.ruleId,
        elements: c.elements,
        text: v.justifications[checkKey(c)].trim(),
      })),
    };
    try {
      const stage = await firstValueFrom(
        this.http.post(`${stageUrl(this.data.projectId, this.data.stageKey)}/transitions`, body),
      );
      this.ref.close(stageSchema.parse(stage));
    } catch (err) {
      // A check the server still finds unanswered (a newer reading of the save) lands on its field.
      const fields = apiError(err)?.fields ?? {};
      for (const [name, messages] of Object.entries(fields)) {
        const c = this.form.controls.justifications.controls[name];
        if (c) {
          c.setErrors({ server: messages[0] });
          c.markAsTouched();
        }
      }
      this.formError.set(errorMessage(err));
    } finally {
      this.sending.set(false);
    }
  }

  protected fieldCount(n: number): string {
    return fieldCountText(n);
  }
}
