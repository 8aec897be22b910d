import { DecimalPipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  input,
  linkedSignal,
  output,
  signal,
} from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormBuilder, ReactiveFormsModule, Validators, type AbstractControl } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatError, MatFormField, MatHint, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatRadioButton, MatRadioGroup } from '@angular/material/radio';
import type { FootingOption, SchemeDocument } from '@trabeate/contracts';
import { CAUTION, type SchemeResult } from '@trabeate/structural';
import { fieldCountText, formErrorFocus } from '../../shared/forms/form-error-focus';
import { StateMarker } from '../../shared/state-marker/state-marker';
import {
  FOOTING_OPTION_LABELS,
  footingSites,
  staleChoices,
  workableAtLine,
  workableForOverlap,
  type FootingChoice,
} from './footing-options-model';
import { StackOnPhone } from '../../shared/stacked-table/stack-on-phone';

export const REASON_MAX = 2000;

const notBlank = (c: AbstractControl<string>) => (c.value.trim() ? null : { blank: true });

/**
 * Footings at property lines: every column whose own pad would cross a property line or meet
 * another pad, the options the engine sized for it side by side, and the engineer's recorded
 * choice with its reason. A choice is a document edit (undoable, saved with the scheme); the
 * panel only emits it. The engine's sizes are preliminary and shown as such.
 */
@Component({
  selector: 'tb-footing-options',
  imports: [
    StackOnPhone,
    DecimalPipe,
    MatButton,
    MatError,
    MatFormField,
    MatHint,
    MatInput,
    MatLabel,
    MatRadioButton,
    MatRadioGroup,
    ReactiveFormsModule,
    StateMarker,
  ],
  templateUrl: './footing-options.html',
  styleUrl: './footing-options.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FootingOptions {
  readonly document = input.required<SchemeDocument>();
  /** the engine's latest result for the document; null while it runs */
  readonly result = input<SchemeResult | null>(null);
  readonly editable = input(false);
  /** a column to open (the inspector's selection); the engineer may open another from the list */
  readonly focus = input<{ columnId: string } | null>(null);

  readonly record = output<FootingChoice>();
  readonly clear = output<string>();

  protected readonly labels = FOOTING_OPTION_LABELS;
  protected readonly caution = CAUTION;
  protected readonly reasonMax = REASON_MAX;
  protected readonly workableAtLine = workableAtLine;
  protected readonly workableForOverlap = workableForOverlap;

  protected readonly sites = computed(() => {
    const r = this.result();
    return r?.ok ? footingSites(this.document(), r) : [];
  });
  protected readonly stale = computed(() => {
    const r = this.result();
    return r?.ok ? staleChoices(this.document(), this.sites()) : [];
  });
  /** the column whose options are open */
  protected readonly open = linkedSignal<string | null>(() => this.focus()?.columnId ?? null);
  protected readonly site = computed(() => this.sites().find((s) => s.columnId === this.open()) ?? null);

  private readonly fb = inject(FormBuilder).nonNullable;
  protected readonly form = this.fb.group({
    option: this.fb.control<FootingOption | ''>('', Validators.required),
    reason: this.fb.control('', [Validators.required, notBlank, Validators.maxLength(REASON_MAX)]),
  });
  private readonly reasonValue = toSignal(this.form.controls.reason.valueChanges, { initialValue: '' });
  protected readonly reasonLength = computed(() => this.reasonValue().trim().length);
  private readonly showErrors = formErrorFocus();
  protected readonly errorCount = signal(0);

  constructor() {
    // opening a column (or its choice changing, by undo say) puts its recorded choice in the form
    // (keyed by the record itself, so a fresh engine result does not wipe what is being typed)
    const shown = computed(() => {
      const s = this.site();
      return JSON.stringify([s?.columnId ?? null, s?.choice?.option ?? '', s?.choice?.reason ?? '']);
    });
    effect(() => {
      const [, option, reason] = JSON.parse(shown()) as [string | null, FootingOption | '', string];
      this.form.reset({ option, reason });
      this.errorCount.set(0);
      if (this.editable()) this.form.enable();
      else this.form.disable();
    });
  }

  protected toggle(columnId: string): void {
    this.open.set(this.open() === columnId ? null : columnId);
  }

  protected submit(): void {
    const s = this.site();
    if (!s || !this.editable()) return;
    if (this.form.invalid) {
      this.errorCount.set(this.showErrors(this.form));
      return;
    }
    this.errorCount.set(0);
    const { option, reason } = this.form.getRawValue();
    this.record.emit({ columnId: s.columnId, option: option as FootingOption, reason: reason.trim() });
  }

  protected fieldCountText = fieldCountText;
}
