import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, TestRequest, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import {
  checkoutStartSchema,
  clientOrganisationSchema,
  invoiceListSchema,
  meSchema,
  projectListSchema,
  receivablesSchema,
} from '@trabeate/contracts';
import { provideRouter, withComponentInputBinding } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { PageLocation } from '../../core/auth/page-location';
import { Session } from '../../core/auth/session';
import { grantedMe } from '../../core/auth/testing';
import { reply, replyError } from '../../../testing/api-replies';
import { FeesPage } from './fees-page';
import { CLIENT_ORG, PROJECT, invoiceList, receivables, summary } from './fees-fixtures';

// The first render in a file compiles the components; on a busy two-core machine that alone can pass 5 s.
jest.setTimeout(20_000);
describe('FeesPage', () => {
  let backend: HttpTestingController;
  let harness: RouterTestingHarness;
  const assigned: string[] = [];
  const el = () => harness.routeNativeElement as HTMLElement;
  const params = (req: TestRequest) =>
    Object.fromEntries(req.request.params.keys().map((k) => [k, req.request.params.get(k)]));
  const settle = async () => {
    await new Promise((r) => setTimeout(r));
    harness.detectChanges();
    await new Promise((r) => setTimeout(r));
    harness.detectChanges();
  };

  async function open(url: string, role: 'principal' | 'client'): Promise<void> {
    assigned.length = 0;
    TestBed.configureTestingModule({
      providers: [
        provideRouter([{ path: 'fees', component: FeesPage }], withComponentInputBinding()),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: PageLocation, useValue: { assign: (u: string) => assigned.push(u) } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    const loaded = TestBed.inject(Session).load();
    reply(backend.expectOne('/api/me'), meSchema, grantedMe(role));
    await loaded;
    harness = await RouterTestingHarness.create();
    void harness.navigateByUrl(url);
    await settle();
  }
  const principalSideRequests = () => {
    reply(backend.expectOne('/api/receivables'), receivablesSchema, receivables());
    reply(backend.expectOne('/api/client-organisations'), clientOrganisationSchema.array(), [CLIENT_ORG]);
    reply(
      backend.expectOne((r) => r.url === '/api/projects'),
      projectListSchema,
      { items: [], total: 0, page: 1, pageSize: 100 },
    );
  };

  afterEach(() => backend.verify());

  it('asks the server for the newest invoices first and shows amounts in the currency, states in words', async () => {
    await open('/fees', 'principal');
    const req = backend.expectOne((r) => r.url === '/api/invoices');
    expect(params(req)).toEqual({ page: '1', pageSize: '25', sort: 'issuedOn', direction: 'desc' });
    reply(
      req,
      invoiceListSchema,
      invoiceList([
        summary(1),
        summary(2, { overdue: true, dueOn: '2026-10-01', paidMinor: 20_050, dueMinor: 99_950, state: 'part_paid' }),
      ]),
    );
    principalSideRequests();
    await settle();
    const rows = el().querySelectorAll('[data-testid="invoices-table"] tr.mat-mdc-row');
    expect(rows.length).toBe(2);
    expect(rows[0].textContent).toContain('INV-2026-0001');
    expect(rows[0].textContent).toContain('€1,200.00');
    expect(rows[0].textContent).toContain('Awaiting payment');
    expect(rows[0].textContent).toContain('2 Dec 2026');
    // Overdue is said in words (and drawn with its own mark), not only coloured.
    expect(rows[1].querySelector('[data-testid="invoice-state"]')?.textContent).toContain('Overdue · Part paid');
    expect(rows[1].querySelector('[data-testid="owed"]')?.textContent).toContain('€999.50');
    const owed = el().querySelector('[data-testid="receivables-table"]')!.textContent!;
    expect(owed).toContain('Quillon Terrace Homes');
    expect(owed).toContain('€450.50');
    expect(owed).toContain('€1,650.50');
  });

  it('sends filters, search and sort to the server from the address', async () => {
    await open(`/fees?state=overdue&client=${CLIENT_ORG.id}&q=mill&sort=due&direction=asc&page=2`, 'principal');
    const req = backend.expectOne((r) => r.url === '/api/invoices');
    expect(params(req)).toEqual({
      page: '2',
      pageSize: '25',
      sort: 'due',
      direction: 'asc',
      state: 'overdue',
      clientId: CLIENT_ORG.id,
      q: 'mill',
    });
    reply(req, invoiceListSchema, invoiceList([], 0));
    principalSideRequests();
    await settle();
    expect(el().textContent).toContain('No invoices match');
  });

  it('shows an error, not a half-drawn table, when the answer does not match the contract', async () => {
    await open('/fees', 'principal');
    // An amount in major units (a float) is something the API never sends: deliberately not the
    // API's shape, so it stays a raw flush instead of going through the contract schema.
    backend
      .expectOne((r) => r.url === '/api/invoices')
      .flush({ items: [{ ...summary(1), totalMinor: 1200.5 }], total: 1, page: 1, pageSize: 25 });
    principalSideRequests();
    await settle();
    expect(el().querySelector('[data-testid="invoices-error"]')).not.toBeNull();
    expect(el().querySelector('[data-testid="invoices-table"]')).toBeNull();
  });

  it("lets a client pay what is owed: the server's payment page address is opened", async () => {
    await open('/fees', 'client');
    reply(
      backend.expectOne((r) => r.url === '/api/invoices'),
      invoiceListSchema,
      invoiceList([summary(3), summary(4, { state: 'paid', paidMinor: 120_000, dueMinor: 0 })]),
    );
    await settle();
    const pay = el().querySelectorAll<HTMLButtonElement>('[data-testid="pay"]');
    expect(pay.length).toBe(1);
    expect(pay[0].textContent).toContain('Pay €1,200.00');
    pay[0].click();
    const req = backend.expectOne(`/api/projects/${PROJECT.id}/invoices/${summary(3).id}/checkout`);
    expect(req.request.method).toBe('POST');
    reply(req, checkoutStartSchema, { url: 'http://127.0.0.1:4315/checkout/cs_test_a1', sessionId: 'cs_test_a1' });
    await settle();
    expect(assigned).toEqual(['http://127.0.0.1:4315/checkout/cs_test_a1']);
    expect(sessionStorage.getItem(`trabeate.checkout.${summary(3).id}`)).toBe('cs_test_a1');
  });

  it('tells the client why Pay did not open, beside the invoice', async () => {
    await open('/fees', 'client');
    reply(
      backend.expectOne((r) => r.url === '/api/invoices'),
      invoiceListSchema,
      invoiceList([summary(5)]),
    );
    await settle();
    el().querySelector<HTMLButtonElement>('[data-testid="pay"]')!.click();
    replyError(
      backend.expectOne(`/api/projects/${PROJECT.id}/invoices/${summary(5).id}/checkout`),
      503,
      { code: 'service_unavailable', message: 'The card processor is not answering; try again in a minute.' },
      'Service Unavailable',
    );
    await settle();
    expect(el().querySelector('[role="alert"]')?.textContent).toContain('card processor is not answering');
    expect(assigned).toEqual([]);
  });
});
