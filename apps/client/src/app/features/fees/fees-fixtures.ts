import {
  checkoutOutcomeSchema,
  invoiceListSchema,
  invoiceSchema,
  receivablesSchema,
  type CheckoutOutcome,
  type Invoice,
  type InvoiceList,
  type InvoiceSummary,
  type Receivables,
} from '@trabeate/contracts';

// Replies as the API sends them, built through the contract schemas: a fixture the server could
// never send fails here rather than passing a test. Invented firm, clients and projects.

export const PROJECT = { id: '00000000-0000-4000-8000-000000000301', reference: 'LPC-14', name: 'Corran Mill lofts' };
export const CLIENT_ORG = { id: '00000000-0000-4000-8000-000000000101', name: 'Quillon Terrace Homes' };

export function summary(n: number, over: Partial<InvoiceSummary> = {}): InvoiceSummary {
  return {
    id: `00000000-0000-4000-8000-0000000005${String(n).padStart(2, '0')}`,
    kind: 'invoice',
    number: `INV-2026-${String(n).padStart(4, '0')}`,
    project: PROJECT,
    client: CLIENT_ORG,
    state: 'issued',
    overdue: false,
    currency: 'EUR',
    totalMinor: 120_000,
    paidMinor: 0,
    creditedMinor: 0,
    dueMinor: 120_000,
    overpaidMinor: 0,
    issuedOn: '2026-11-02',
    dueOn: '2026-12-02',
    ...over,
  };
}

export const invoiceList = (items: InvoiceSummary[], total = items.length): InvoiceList =>
  invoiceListSchema.parse({ items, total, page: 1, pageSize: 25 });

export function invoice(n: number, over: Partial<Invoice> = {}): Invoice {
  return invoiceSchema.parse({
    ...summary(n),
    stageKey: 'column_layout',
    note: '',
    taxLabel: 'VAT',
    subtotalMinor: 100_000,
    taxMinor: 20_000,
    lines: [
      {
        id: '00000000-0000-4000-8000-000000000601',
        kind: 'stage_fee',
        description: 'Column layout: 20 % of the fee',
        stageKey: 'column_layout',
        netMinor: 100_000,
        taxRateBp: 2000,
        taxMinor: 20_000,
        totalMinor: 120_000,
      },
    ],
    payments: [],
    creditNotes: [],
    creditsInvoice: null,
    voidReason: null,
    remindersEnabled: true,
    hasPdf: true,
    ...over,
  });
}

export const receivables = (): Receivables =>
  receivablesSchema.parse({
    asOf: '2026-12-02',
    rows: [
      {
        client: CLIENT_ORG,
        currency: 'EUR',
        bands: { current: 120_000, d1_30: 0, d31_60: 45_050, d61_90: 0, over_90: 0 },
        totalMinor: 165_050,
      },
    ],
  });

export const outcome = (o: Partial<CheckoutOutcome>): CheckoutOutcome =>
  checkoutOutcomeSchema.parse({ outcome: 'paid', message: 'Paid.', invoice: invoice(1), ...o });
