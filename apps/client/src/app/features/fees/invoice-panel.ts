import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, output, signal } from '@angular/core';
import { FormArray, FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton } from '@angular/material/button';
import { MatOption } from '@angular/material/core';
import { MatError, MatFormField, MatLabel } from '@angular/material/form-field';
import { MatDatepicker, MatDatepickerInput, MatDatepickerToggle } from '@angular/material/datepicker';
import { MatInput } from '@angular/material/input';
import { MatSelect } from '@angular/material/select';
import { STAGE_TITLES, invoiceSchema, type Invoice, type LineKind } from '@trabeate/contracts';
import { errorMessage } from '../../core/auth/api-error';
import { asYouType } from '../../shared/forms/field-errors';
import { FeesApi, invoiceUrl } from './fees-api';
import { InvoiceStateTag } from './invoice-state';
import { DayPipe } from '../../shared/dates/app-dates';
import { formErrorFocus } from '../../shared/forms/form-error-focus';
import { fromIsoDay, toIsoDay } from '../../shared/dates/firm-date-adapter';
import { formatMinor, parseMajor } from './money';
import { StackOnPhone } from '../../shared/stacked-table/stack-on-phone';

const LINE_KINDS: Array<{ value: Exclude<LineKind, 'credit'>; label: string }> = [
  { value: 'stage_fee', label: 'Stage fee' },
  { value: 'additional_service', label: 'Additional service' },
  { value: 'expense', label: 'Reimbursable expense' },
];
const today = (): Date | null => fromIsoDay(new Date().toISOString().slice(0, 10));

type LineForm = FormGroup<{
  kind: FormControl<Exclude<LineKind, 'credit'>>;
  description: FormControl<string>;
  amount: FormControl<string>;
  stageKey: FormControl<string | null>;
}>;

/** One invoice for the principal: its lines, and what can be done in its state. */
@Component({
  selector: 'tb-invoice-panel',
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
    InvoiceStateTag,
  ],
  templateUrl: './invoice-panel.html',
  styleUrl: './invoice-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InvoicePanel {
  private readonly api = inject(FeesApi);
  private readonly showErrors = formErrorFocus();
  readonly projectId = input.required<string>();
  readonly invoiceId = input.required<string>();
  /** Tells the list to load again after a change. */
  readonly changed = output<Invoice>();

  protected readonly invoice = httpResource(() => invoiceUrl(this.projectId(), this.invoiceId()), {
    parse: (v) => invoiceSchema.parse(v),
  });
  protected readonly kinds = LINE_KINDS;
  protected readonly asYouType = asYouType;
  protected readonly busy = signal(false);
  protected readonly problem = signal<string | null>(null);
  protected readonly mode = signal<'view' | 'pay' | 'credit' | 'void'>('view');

  protected readonly lines = new FormArray<LineForm>([]);
  protected readonly payment = new FormGroup({
    amount: new FormControl('', { nonNullable: true, validators: [Validators.required] }),
    receivedOn: new FormControl<Date | null>(today(), { validators: [Validators.required] }),
    reference: new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.maxLength(200)] }),
  });
  protected readonly credit = new FormGroup({
    reason: new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.minLength(3)] }),
    description: new FormControl('', { nonNullable: true, validators: [Validators.required] }),
    amount: new FormControl('', { nonNullable: true, validators: [Validators.required] }),
  });
  protected readonly voidReason = new FormControl('', {
    nonNullable: true,
    validators: [Validators.required, Validators.minLength(3)],
  });

  protected readonly draftTotal = computed(() => (this.invoice.hasValue() ? this.invoice.value().totalMinor : 0));

  constructor() {
    effect(() => {
      if (this.invoice.hasValue()) this.fillLines(this.invoice.value());
    });
  }

  private fillLines(inv: Invoice): void {
    this.lines.clear();
    for (const l of inv.lines)
      if (l.kind !== 'credit')
        this.lines.push(this.lineForm(l.kind, l.description, this.major(l.netMinor, inv.currency), l.stageKey));
  }

  private lineForm(kind: Exclude<LineKind, 'credit'>, description = '', amount = '', stageKey: string | null = null) {
    return new FormGroup({
      kind: new FormControl(kind, { nonNullable: true }),
      description: new FormControl(description, {
        nonNullable: true,
        validators: [Validators.required, Validators.maxLength(300)],
      }),
      amount: new FormControl(amount, { nonNullable: true, validators: [Validators.required] }),
      stageKey: new FormControl<string | null>(stageKey),
    });
  }

  private major(minor: number, currency: string): string {
    const d = new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2;
    return (minor / 10 ** d).toFixed(d);
  }

  protected money(minor: number, currency: string): string {
    return formatMinor(minor, currency);
  }
  protected stageTitle(key: string | null): string {
    return key ? STAGE_TITLES[key as keyof typeof STAGE_TITLES] : '';
  }
  protected amountInvalid(text: string, currency: string): boolean {
    return text !== '' && (parseMajor(text, currency) ?? 0) <= 0;
  }

  protected addLine(): void {
    this.lines.push(this.lineForm('additional_service'));
  }
  protected removeLine(i: number): void {
    this.lines.removeAt(i);
  }

  private async run(work: () => Promise<Invoice>): Promise<void> {
    if (this.busy()) return;
    this.busy.set(true);
    this.problem.set(null);
    try {
      const inv = await work();
      this.invoice.set(inv);
      this.mode.set('view');
      this.changed.emit(inv);
    } catch (err) {
      this.problem.set(errorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }

  protected saveDraft(): void {
    const inv = this.invoice.value()!;
    if (this.lines.invalid) this.showErrors(this.lines);
    this.lines.markAllAsTouched();
    const parsed = this.lines.getRawValue().map((l) => ({ ...l, net: parseMajor(l.amount, inv.currency) }));
    if (this.lines.invalid || !parsed.length || parsed.some((l) => l.net === null)) {
      this.problem.set('Every line needs a description and an amount.');
      return;
    }
    void this.run(() =>
      this.api.updateDraft(this.projectId(), inv.id, {
        note: inv.note,
        lines: parsed.map((l) => ({
          kind: l.kind,
          description: l.description.trim(),
          netMinor: l.net!,
          stageKey: (l.stageKey as never) ?? null,
        })),
      }),
    );
  }
  protected issue(): void {
    void this.run(() => this.api.issue(this.projectId(), this.invoiceId()));
  }
  protected recordPayment(): void {
    const inv = this.invoice.value()!;
    if (this.payment.invalid) {
      this.showErrors(this.payment);
      return;
    }
    const v = this.payment.getRawValue();
    const amountMinor = parseMajor(v.amount, inv.currency);
    if (this.payment.invalid || !amountMinor) return;
    void this.run(() =>
      this.api.recordPayment(this.projectId(), inv.id, {
        amountMinor,
        receivedOn: toIsoDay(v.receivedOn),
        reference: v.reference.trim(),
      }),
    );
  }
  protected addCredit(): void {
    const inv = this.invoice.value()!;
    if (this.credit.invalid) {
      this.showErrors(this.credit);
      return;
    }
    const v = this.credit.getRawValue();
    const netMinor = parseMajor(v.amount, inv.currency);
    if (this.credit.invalid || !netMinor) return;
    void this.run(() =>
      this.api.creditNote(this.projectId(), inv.id, {
        reason: v.reason.trim(),
        lines: [{ description: v.description.trim(), netMinor }],
      }),
    );
  }
  protected voidIt(): void {
    if (this.voidReason.invalid) {
      this.showErrors(this.voidReason);
      return;
    }
    void this.run(() => this.api.void(this.projectId(), this.invoiceId(), this.voidReason.value.trim()));
  }
}
