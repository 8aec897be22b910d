import { ChangeDetectionStrategy, Component, OnInit, inject, input, signal } from '@angular/core';
import { MatButton } from '@angular/material/button';
import { MatIcon } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { CheckoutOutcome } from '@trabeate/contracts';
import { errorMessage } from '../../core/auth/api-error';
import { CHECKOUT_KEY, FeesApi } from './fees-api';
import { InvoiceStateTag } from './invoice-state';
import { formatMinor } from './money';

const MARKS: Record<CheckoutOutcome['outcome'], string> = {
  paid: 'task_alt',
  declined: 'credit_card_off',
  pending: 'hourglass_top',
  expired: 'timer_off',
};

/**
 * Where the payment page sends the client back. The server asks the card processor what really
 * happened (the browser's word counts for nothing), records a payment if there was one, and says so.
 */
@Component({
  selector: 'tb-payment-return-page',
  imports: [MatButton, MatIcon, RouterLink, InvoiceStateTag],
  template: `
    <h1 class="page-title">Payment</h1>
    @if (problem(); as p) {
      <div class="state error" role="alert" data-testid="return-error">{{ p }}</div>
    } @else if (outcome(); as o) {
      <section class="outcome" [class]="o.outcome" data-testid="payment-outcome" role="status">
        <mat-icon aria-hidden="true">{{ marks[o.outcome] }}</mat-icon>
        <div>
          <p class="headline">{{ headline(o) }}</p>
          <p data-testid="outcome-message">{{ o.message }}</p>
          <p>
            Invoice {{ o.invoice.number }} ·
            <tb-invoice-state [state]="o.invoice.state" [overdue]="o.invoice.overdue" /> · still owed
            {{ money(o.invoice.dueMinor, o.invoice.currency) }}
          </p>
        </div>
      </section>
    } @else {
      <p class="state" role="status">Checking the payment with the card processor…</p>
    }
    <a mat-stroked-button routerLink="/fees" data-testid="back-to-fees">Back to Fees</a>
  `,
  styles: `
    .page-title {
      font: var(--mat-sys-headline-medium);
    }
    .outcome {
      display: flex;
      gap: 1rem;
      padding: 1rem;
      margin-bottom: 1rem;
      border: 2px solid var(--mat-sys-outline);
    }
    .declined,
    .expired {
      border-style: dashed;
      border-color: var(--mat-sys-error);
    }
    .headline {
      font: var(--mat-sys-title-large);
      margin: 0 0 0.5rem;
    }
    .state {
      padding: 1rem;
      border: 1px solid var(--mat-sys-outline-variant);
    }
    .error {
      border-left: 4px solid var(--mat-sys-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PaymentReturnPage implements OnInit {
  private readonly api = inject(FeesApi);
  // Route-bound query parameters, as the payment page sends them back.
  readonly project = input<string>();
  readonly invoice = input<string>();
  readonly session = input<string>();
  readonly cancelled = input<string>();

  protected readonly outcome = signal<CheckoutOutcome | null>(null);
  protected readonly problem = signal<string | null>(null);
  protected readonly marks = MARKS;

  async ngOnInit(): Promise<void> {
    const project = this.project();
    const invoice = this.invoice();
    // The way back from a cancelled page carries no session id; Pay remembered it in this tab.
    const session = this.session() ?? (invoice ? sessionStorage.getItem(CHECKOUT_KEY(invoice)) : null);
    if (!project || !invoice || !session) {
      this.problem.set('This address does not name a payment. Open Fees to see your invoices.');
      return;
    }
    try {
      this.outcome.set(await this.api.reconcile(project, invoice, session));
    } catch (err) {
      this.problem.set(errorMessage(err));
    }
  }

  protected headline(o: CheckoutOutcome): string {
    switch (o.outcome) {
      case 'paid':
        return 'Thank you: the invoice is paid.';
      case 'declined':
        return 'The card was declined.';
      case 'expired':
        return 'The payment page expired.';
      default:
        return this.cancelled() ? 'You left the payment page without paying.' : 'No payment yet.';
    }
  }

  protected money(minor: number, currency: string): string {
    return formatMinor(minor, currency);
  }
}
