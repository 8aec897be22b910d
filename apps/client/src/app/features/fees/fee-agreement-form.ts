import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule, Validators, type AbstractControl } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatOption } from '@angular/material/core';
import { MatError, MatFormField, MatHint, MatLabel, MatSuffix } from '@angular/material/form-field';
import { MatDatepicker, MatDatepickerInput, MatDatepickerToggle } from '@angular/material/datepicker';
import { MatInput } from '@angular/material/input';
import { MatSelect } from '@angular/material/select';
import {
  STAGE_KEYS,
  STAGE_TITLES,
  feeAgreementSchema,
  projectPageSchema,
  type FeeAgreement,
  type StageKey,
} from '@trabeate/contracts';
import { errorMessage } from '../../core/auth/api-error';
import { asYouType } from '../../shared/forms/field-errors';
import { FeesApi, agreementUrl } from './fees-api';
import { DayPipe } from '../../shared/dates/app-dates';
import { toIsoDay } from '../../shared/dates/firm-date-adapter';
import { formErrorFocus } from '../../shared/forms/form-error-focus';
import { formatMinor, parseMajor } from './money';
import { StackOnPhone } from '../../shared/stacked-table/stack-on-phone';

/** A share typed as a percentage with up to two decimals ("12.5"), kept as basis points. */
const toBp = (v: string): number | null => {
  const m = /^\s*(\d{1,3})(?:\.(\d{1,2}))?\s*$/.exec(v ?? '');
  return m ? Number(m[1]) * 100 + Number((m[2] ?? '').padEnd(2, '0')) : null;
};
/** A change of fee: "-1500" or "+2500.50", in the agreement's currency, never zero. */
const SIGNED = /^\s*([-+\u2212])?\s*(.+)$/;
export function parseSignedMajor(text: string, currency: string): number | null {
  const m = SIGNED.exec(text ?? '');
  if (!m) return null;
  const minor = parseMajor(m[2], currency);
  if (minor === null || minor === 0) return null;
  return m[1] === '-' || m[1] === '−' ? -minor : minor;
}

const pct = (bp: number) => (bp / 100).toFixed(bp % 100 === 0 ? 0 : 2);

const shareValid = (c: AbstractControl) => {
  const bp = toBp(c.value);
  return bp === null || bp > 10_000 ? { hint: 'A share from 0 to 100, at most two decimals.' } : null;
};
/** The six shares must add up to exactly 100 %: checked on every keystroke, as the server will. */
const sumsTo100 = (g: AbstractControl) => {
  const values = Object.values((g as FormGroup).controls).map((c) => toBp(c.value));
  if (values.some((v) => v === null)) return null;
  const sum = values.reduce((a, b) => a! + b!, 0)!;
  return sum === 10_000 ? null : { sum: { sum } };
};

type SharesForm = FormGroup<Record<StageKey, FormControl<string>>>;

/** The fee agreement of one project: set until the first invoice, then read-only with its variations. */
@Component({
  selector: 'tb-fee-agreement-form',
  imports: [
    StackOnPhone,
    DayPipe,
    ReactiveFormsModule,
    MatButton,
    MatFormField,
    MatLabel,
    MatInput,
    MatDatepicker,
    MatDatepickerInput,
    MatDatepickerToggle,
    MatSelect,
    MatOption,
    MatError,
    MatHint,
    MatSuffix,
  ],
  templateUrl: './fee-agreement-form.html',
  styleUrl: './fee-agreement-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FeeAgreementForm {
  private readonly api = inject(FeesApi);
  readonly projectId = input.required<string>();

  protected readonly agreement = httpResource(() => agreementUrl(this.projectId()), {
    parse: (v) => feeAgreementSchema.parse(v),
  });
  protected readonly project = httpResource(() => `/api/projects/${encodeURIComponent(this.projectId())}/full`, {
    parse: (v) => projectPageSchema.parse(v),
  });
  protected readonly contacts = computed(() =>
    this.project.hasValue() ? this.project.value().members.filter((m) => m.role === 'client') : [],
  );
  /** 404 means "not set yet": the form starts empty rather than showing an error. */
  protected readonly missing = computed(() => {
    const e = this.agreement.error() as { status?: number } | undefined;
    return e?.status === 404;
  });

  protected readonly stages = STAGE_KEYS.map((k) => ({ key: k, title: STAGE_TITLES[k] }));
  protected readonly asYouType = asYouType;
  protected readonly shares: SharesForm = new FormGroup(
    Object.fromEntries(
      STAGE_KEYS.map((k) => [
        k,
        new FormControl('', { nonNullable: true, validators: [Validators.required, shareValid] }),
      ]),
    ) as Record<StageKey, FormControl<string>>,
    { validators: sumsTo100 },
  );
  protected readonly form = new FormGroup({
    basis: new FormControl<'lump_sum' | 'percentage'>('lump_sum', { nonNullable: true }),
    amount: new FormControl('', { nonNullable: true }),
    percentage: new FormControl('', { nonNullable: true }),
    constructionCost: new FormControl('', { nonNullable: true }),
    currency: new FormControl('EUR', {
      nonNullable: true,
      validators: [Validators.required, Validators.pattern(/^[A-Z]{3}$/)],
    }),
    taxRate: new FormControl('20', { nonNullable: true, validators: [Validators.required, shareValid] }),
    taxLabel: new FormControl('VAT', {
      nonNullable: true,
      validators: [Validators.required, Validators.maxLength(40)],
    }),
    paymentTermsDays: new FormControl(30, {
      nonNullable: true,
      validators: [Validators.required, Validators.min(0), Validators.max(365)],
    }),
    billingContactId: new FormControl('', { nonNullable: true, validators: [Validators.required] }),
    shares: this.shares,
  });

  private readonly sharesValue = toSignal(this.shares.valueChanges, { initialValue: this.shares.getRawValue() });
  /** The running total, shown in words beside the shares. */
  protected readonly shareTotal = computed(() => {
    const v = this.sharesValue();
    const bps = STAGE_KEYS.map((k) => toBp(v[k] ?? ''));
    if (bps.some((b) => b === null)) return null;
    return bps.reduce((a, b) => a! + b!, 0)!;
  });
  protected readonly pct = pct;
  protected readonly saving = signal(false);
  protected readonly saveError = signal<string | null>(null);
  protected readonly saved = signal(false);

  /** A variation: the change of fee (signed), why, and from when. */
  protected readonly variation = new FormGroup({
    amount: new FormControl('', { nonNullable: true, validators: [Validators.required] }),
    reason: new FormControl('', {
      nonNullable: true,
      validators: [Validators.required, Validators.minLength(3), Validators.maxLength(2000)],
    }),
    // a Date from the picker (it reads what people type in the firm's format, or YYYY-MM-DD)
    effectiveOn: new FormControl<Date | null>(null, { validators: [Validators.required] }),
  });
  private readonly variationValue = toSignal(this.variation.valueChanges, {
    initialValue: this.variation.getRawValue(),
  });
  /** What the typed change means, in words, or why it is not a change yet: shown as you type. */
  protected readonly variationPreview = computed(() => {
    const text = this.variationValue().amount ?? '';
    if (!text.trim() || !this.agreement.hasValue()) return null;
    const a = this.agreement.value();
    const minor = parseSignedMajor(text, a.currency);
    if (minor === null)
      return { ok: false, text: 'Enter the change, for example -1500 to reduce the fee or 2500.50 to add to it.' };
    const after = a.currentFeeMinor + minor;
    if (after < 0) return { ok: false, text: 'A variation cannot take the fee below zero.' };
    return {
      ok: true,
      text: `${minor < 0 ? 'Reduces' : 'Adds to'} the fee by ${formatMinor(Math.abs(minor), a.currency)}; the fee becomes ${formatMinor(after, a.currency)}.`,
    };
  });
  private readonly showErrors = formErrorFocus();
  protected readonly addingVariation = signal(false);
  protected readonly variationError = signal<string | null>(null);
  protected readonly variationAdded = signal(false);

  protected async addVariation(): Promise<void> {
    const preview = this.variationPreview();
    if (this.variation.invalid) {
      this.showErrors(this.variation);
      return;
    }
    this.variation.markAllAsTouched();
    if (this.variation.invalid || !preview?.ok || this.addingVariation() || !this.agreement.hasValue()) return;
    const v = this.variation.getRawValue();
    this.addingVariation.set(true);
    this.variationError.set(null);
    this.variationAdded.set(false);
    try {
      const a = await this.api.addVariation(this.projectId(), {
        amountMinor: parseSignedMajor(v.amount, this.agreement.value().currency)!,
        reason: v.reason.trim(),
        effectiveOn: toIsoDay(v.effectiveOn),
      });
      this.agreement.set(a);
      this.variation.reset();
      this.variationAdded.set(true);
    } catch (err) {
      this.variationError.set(errorMessage(err));
    } finally {
      this.addingVariation.set(false);
    }
  }

  constructor() {
    effect(() => {
      if (this.agreement.hasValue()) this.fill(this.agreement.value());
    });
  }

  private fill(a: FeeAgreement): void {
    const digits = (c: string) => new Intl.NumberFormat('en', { style: 'currency', currency: c }).resolvedOptions();
    const major = (m: number | null) =>
      m === null ? '' : (m / 10 ** (digits(a.currency).maximumFractionDigits ?? 2)).toString();
    this.form.reset({
      basis: a.basis,
      amount: major(a.lumpSumMinor),
      percentage: a.percentageBp === null ? '' : pct(a.percentageBp),
      constructionCost: major(a.constructionCostMinor),
      currency: a.currency,
      taxRate: pct(a.taxRateBp),
      taxLabel: a.taxLabel,
      paymentTermsDays: a.paymentTermsDays,
      billingContactId: a.billingContact.id,
      shares: Object.fromEntries(STAGE_KEYS.map((k) => [k, pct(a.stageShares[k])])) as Record<StageKey, string>,
    });
    if (!a.editable) this.form.disable();
    else this.form.enable();
  }

  protected money(minor: number, currency: string): string {
    return formatMinor(minor, currency);
  }
  /** A change of fee with its sign in words' place: "+ €2,500.00", "− €1,500.00". */
  protected change(minor: number, currency: string): string {
    return `${minor < 0 ? '−' : '+'} ${formatMinor(Math.abs(minor), currency)}`;
  }

  protected amountError(): string | null {
    const v = this.form.getRawValue();
    if (v.basis === 'lump_sum')
      return parseMajor(v.amount, v.currency) === null ? 'Enter the fee, for example 48000 or 48000.50.' : null;
    if (toBp(v.percentage) === null) return 'Enter the fee as a percentage, for example 8.5.';
    return parseMajor(v.constructionCost, v.currency) === null ? 'Enter the estimated construction cost.' : null;
  }

  protected async save(): Promise<void> {
    if (this.form.invalid) {
      this.showErrors(this.form);
      return;
    }
    this.form.markAllAsTouched();
    if (this.amountError() || this.saving()) return;
    const v = this.form.getRawValue();
    this.saving.set(true);
    this.saveError.set(null);
    this.saved.set(false);
    try {
      const a = await this.api.saveAgreement(this.projectId(), {
        basis: v.basis,
        lumpSumMinor: v.basis === 'lump_sum' ? parseMajor(v.amount, v.currency) : null,
        percentageBp: v.basis === 'percentage' ? toBp(v.percentage) : null,
        constructionCostMinor: v.basis === 'percentage' ? parseMajor(v.constructionCost, v.currency) : null,
        currency: v.currency,
        taxRateBp: toBp(v.taxRate)!,
        taxLabel: v.taxLabel.trim(),
        paymentTermsDays: Number(v.paymentTermsDays),
        billingContactId: v.billingContactId,
        stageShares: Object.fromEntries(STAGE_KEYS.map((k) => [k, toBp(v.shares[k])!])) as Record<StageKey, number>,
      });
      this.agreement.set(a);
      this.saved.set(true);
    } catch (err) {
      this.saveError.set(errorMessage(err));
    } finally {
      this.saving.set(false);
    }
  }
}
