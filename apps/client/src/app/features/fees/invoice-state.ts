import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { InvoiceState } from '@trabeate/contracts';
import { StateMarker, type MarkerShape, type MarkerTone } from '../../shared/state-marker/state-marker';

/**
 * Each invoice state in words with its shape in the shared state marker, so it reads without
 * colour: a draft is an open ring, awaiting payment waits (diamond), part paid is half filled,
 * paid is the ticked square, void the barred square, overdue the clock in the alert colour.
 */
export const INVOICE_STATE_LABELS: Record<
  InvoiceState | 'overdue',
  { text: string; shape: MarkerShape; tone: MarkerTone }
> = {
  draft: { text: 'Draft', shape: 'open', tone: 'neutral' },
  issued: { text: 'Awaiting payment', shape: 'wait', tone: 'accent' },
  part_paid: { text: 'Part paid', shape: 'half', tone: 'accent' },
  paid: { text: 'Paid', shape: 'done', tone: 'neutral' },
  void: { text: 'Void', shape: 'stop', tone: 'neutral' },
  overdue: { text: 'Overdue', shape: 'late', tone: 'alert' },
};

@Component({
  selector: 'tb-invoice-state',
  imports: [StateMarker],
  template: `<tb-state-marker
    [shape]="label().shape"
    [tone]="label().tone"
    [attr.data-state]="key()"
    data-testid="invoice-state"
    >{{ label().text }}</tb-state-marker
  >`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InvoiceStateTag {
  readonly state = input.required<InvoiceState>();
  readonly overdue = input(false);
  protected readonly key = computed(() => (this.overdue() ? 'overdue' : this.state()));
  /** Overdue is shown with its own mark, and still says where the payment stands (part paid, say). */
  protected readonly label = computed(() =>
    this.overdue() && this.state() !== 'issued'
      ? { ...INVOICE_STATE_LABELS.overdue, text: `Overdue · ${INVOICE_STATE_LABELS[this.state()].text}` }
      : INVOICE_STATE_LABELS[this.key()],
  );
}
