import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter, withComponentInputBinding } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { checkoutOutcomeSchema } from '@trabeate/contracts';
import { reply } from '../../../testing/api-replies';
import { PaymentReturnPage } from './payment-return-page';
import { PROJECT, invoice, outcome, summary } from './fees-fixtures';

// The first render in a file compiles the components; on a busy two-core machine that alone can pass 5 s.
jest.setTimeout(20_000);
describe('PaymentReturnPage', () => {
  let backend: HttpTestingController;
  let harness: RouterTestingHarness;
  const el = () => harness.routeNativeElement as HTMLElement;
  const settle = async () => {
    await new Promise((r) => setTimeout(r));
    harness.detectChanges();
  };
  const inv = summary(1);
  const reconcileUrl = (session: string) =>
    `/api/projects/${PROJECT.id}/invoices/${inv.id}/checkout/${session}/reconcile`;

  async function open(url: string) {
    TestBed.configureTestingModule({
      providers: [
        provideRouter([{ path: 'fees/return', component: PaymentReturnPage }], withComponentInputBinding()),
        provideHttpClient(),
        provideHttpClientTesting(),
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    harness = await RouterTestingHarness.create();
    void harness.navigateByUrl(url);
    await settle();
  }
  afterEach(() => backend.verify());

  it('asks the server to confirm the payment and shows the invoice paid', async () => {
    await open(`/fees/return?project=${PROJECT.id}&invoice=${inv.id}&session=cs_test_ok`);
    reply(
      backend.expectOne(reconcileUrl('cs_test_ok')),
      checkoutOutcomeSchema,
      outcome({
        outcome: 'paid',
        message: 'Paid: €1,200.00 by card. A receipt is on its way by e-mail.',
        invoice: invoice(1, { state: 'paid', paidMinor: 120_000, dueMinor: 0 }),
      }),
    );
    await settle();
    const box = el().querySelector('[data-testid="payment-outcome"]')!.textContent!;
    expect(box).toContain('the invoice is paid');
    expect(box).toContain('Paid');
    expect(box).toContain('still owed €0.00');
  });

  it('shows why a card was declined, after coming back without a session in the address', async () => {
    sessionStorage.setItem(`trabeate.checkout.${inv.id}`, 'cs_test_remembered');
    await open(`/fees/return?project=${PROJECT.id}&invoice=${inv.id}&cancelled=1`);
    reply(
      backend.expectOne(reconcileUrl('cs_test_remembered')),
      checkoutOutcomeSchema,
      outcome({
        outcome: 'declined',
        message: 'The card was declined, so nothing was charged: Your card was declined. (card_declined)',
        invoice: invoice(1),
      }),
    );
    await settle();
    expect(el().querySelector('[data-testid="outcome-message"]')?.textContent).toContain('(card_declined)');
    expect(el().textContent).toContain('Awaiting payment');
    expect(el().textContent).toContain('still owed €1,200.00');
  });

  it('says so when the address names no payment, without asking the server', async () => {
    await open('/fees/return');
    expect(el().querySelector('[data-testid="return-error"]')?.textContent).toContain('does not name a payment');
  });
});
