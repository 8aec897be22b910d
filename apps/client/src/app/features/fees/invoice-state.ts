import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIcon } from '@angular/material/icon';
import type { InvoiceState } from '@trabeate/contracts';

/** Each state in words and with its own mark, so it reads without colour. */
export const INVOICE_STATE_LABELS: Record<InvoiceState | 'overdue', { text: string; icon: string }> = {
  draft: { text: 'Draft', icon: 'edit_note' },
  issued: { text: 'Awaiting payment', icon: 'hourglass_top' },
  part_paid: { text: 'Part paid', icon: 'pie_chart' },
  paid: { text: 'Paid', icon: 'task_alt' },
  void: { text: 'Void', icon: 'block' },
  overdue: { text: 'Overdue', icon: 'warning' },
};

@Component({
  selector: 'tb-invoice-state',
  imports: [MatIcon],
  template: `<span class="tag" [class]="key()" data-testid="invoice-state"
    ><mat-icon aria-hidden="true" inline>{{ label().icon }}</mat-icon
    >{{ label().text }}</span
  >`,
  styles: `
    .tag {
      display: inline-flex;
      align-items: center;
      gap: 0.25rem;
      padding: 0 0.4rem;
      border: 1px solid var(--mat-sys-outline);
      font: var(--mat-sys-label-medium);
      white-space: nowrap;
    }
    .overdue {
      border: 2px dashed var(--mat-sys-error);
      color: var(--mat-sys-error);
      font-weight: 700;
    }
    .paid {
      border-style: double;
      border-width: 3px;
    }
    .void {
      text-decoration: line-through;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InvoiceStateTag {
  readonly state = input.required<InvoiceState>();
  readonly overdue = input(false);
  protected readonly key = computed(() => (this.overdue() ? 'overdue' : this.state()));
  /** Overdue is shown with its own mark, and still says where the payment stands (part paid, say). */
  protected readonly label = computed(() =>
    this.overdue() && this.state() !== 'issued'
      ? { icon: INVOICE_STATE_LABELS.overdue.icon, text: `Overdue · ${INVOICE_STATE_LABELS[this.state()].text}` }
      : INVOICE_STATE_LABELS[this.key()],
  );
}
