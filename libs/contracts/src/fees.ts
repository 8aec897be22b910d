import { z } from 'zod';
import { pageOf, stageKeySchema, STAGE_KEYS } from './projects';

// Fee agreements, invoices, credit notes and payments. Every amount is an integer number of the
// currency's minor units (cents for EUR, yen for JPY); rates are basis points (1 % = 100).

const id = z.uuid();
const isoDate = z.iso.date();
/** An amount of money in minor units; never a float. */
export const minorSchema = z.number().int().min(-1e13).max(1e13);
const nonNegativeMinor = z.number().int().min(0).max(1e13);
const basisPoints = z.number().int().min(0).max(10_000);
export const currencySchema = z.string().regex(/^[A-Z]{3}$/, 'a three-letter currency code such as EUR');

/** Per-stage shares of the fee in basis points (100 = 1 %); the six must add up to exactly 10 000. */
export const stageSharesSchema = z
  .object(
    Object.fromEntries(STAGE_KEYS.map((k) => [k, basisPoints])) as Record<
      (typeof STAGE_KEYS)[number],
      typeof basisPoints
    >,
  )
  .refine((s) => Object.values(s).reduce((a, b) => a + b, 0) === 10_000, {
    message: 'the stage shares must add up to exactly 100 %',
  });
export type StageShares = z.infer<typeof stageSharesSchema>;

export const feeBasisSchema = z.enum(['lump_sum', 'percentage']);
export type FeeBasis = z.infer<typeof feeBasisSchema>;

/** PUT /api/projects/:projectId/fee-agreement (allowed until the first invoice is issued). */
export const feeAgreementWriteSchema = z
  .object({
    basis: feeBasisSchema,
    lumpSumMinor: nonNegativeMinor.nullable().default(null),
    /** Fee as a share of the estimated construction cost, in basis points (850 = 8.5 %). */
    percentageBp: basisPoints.nullable().default(null),
    constructionCostMinor: nonNegativeMinor.nullable().default(null),
    currency: currencySchema,
    taxRateBp: basisPoints,
    taxLabel: z.string().trim().min(1).max(40),
    paymentTermsDays: z.number().int().min(0).max(365),
    billingContactId: id,
    stageShares: stageSharesSchema,
  })
  .superRefine((v, ctx) => {
    if (v.basis === 'lump_sum' && v.lumpSumMinor === null)
      ctx.addIssue({ code: 'custom', path: ['lumpSumMinor'], message: 'a lump sum fee needs its amount' });
    if (v.basis === 'percentage') {
      if (v.percentageBp === null)
        ctx.addIssue({ code: 'custom', path: ['percentageBp'], message: 'a percentage fee needs its rate' });
      if (v.constructionCostMinor === null)
        ctx.addIssue({
          code: 'custom',
          path: ['constructionCostMinor'],
          message: 'a percentage fee needs the estimated construction cost',
        });
    }
  });
export type FeeAgreementWrite = z.input<typeof feeAgreementWriteSchema>;

export const feeVariationSchema = z.object({
  id,
  amountMinor: minorSchema,
  reason: z.string(),
  effectiveOn: isoDate,
  recordedBy: z.string(),
  recordedAt: z.iso.datetime({ offset: true }),
});
export type FeeVariation = z.infer<typeof feeVariationSchema>;

/** POST /api/projects/:projectId/fee-variations */
export const feeVariationCreateSchema = z.object({
  amountMinor: minorSchema.refine((v) => v !== 0, 'a variation changes the fee by some amount'),
  reason: z.string().trim().min(3, 'say why the fee changes').max(2000),
  effectiveOn: isoDate,
});
export type FeeVariationCreate = z.infer<typeof feeVariationCreateSchema>;

export const stageFeeSchema = z.object({
  stageKey: stageKeySchema,
  shareBp: basisPoints,
  amountMinor: nonNegativeMinor,
  invoicedMinor: minorSchema,
});

/** GET /api/projects/:projectId/fee-agreement */
export const feeAgreementSchema = z.object({
  projectId: id,
  basis: feeBasisSchema,
  lumpSumMinor: nonNegativeMinor.nullable(),
  percentageBp: basisPoints.nullable(),
  constructionCostMinor: nonNegativeMinor.nullable(),
  currency: currencySchema,
  taxRateBp: basisPoints,
  taxLabel: z.string(),
  paymentTermsDays: z.number().int(),
  billingContact: z.object({ id, displayName: z.string(), email: z.string() }),
  stageShares: stageSharesSchema,
  /** The fee as first agreed (before variations). */
  originalFeeMinor: nonNegativeMinor,
  variations: z.array(feeVariationSchema),
  currentFeeMinor: minorSchema,
  stages: z.array(stageFeeSchema),
  /** False once an invoice has been issued: from then on changes are variations. */
  editable: z.boolean(),
});
export type FeeAgreement = z.infer<typeof feeAgreementSchema>;

export const invoiceStateSchema = z.enum(['draft', 'issued', 'part_paid', 'paid', 'void']);
export type InvoiceState = z.infer<typeof invoiceStateSchema>;
export const invoiceKindSchema = z.enum(['invoice', 'credit_note']);
export const lineKindSchema = z.enum(['stage_fee', 'additional_service', 'expense', 'credit']);
export type LineKind = z.infer<typeof lineKindSchema>;

export const invoiceLineInputSchema = z.object({
  kind: lineKindSchema.exclude(['credit']),
  description: z.string().trim().min(1, 'describe the line').max(300),
  stageKey: stageKeySchema.nullable().default(null),
  netMinor: nonNegativeMinor,
  /** Defaults to the agreement's rate. */
  taxRateBp: basisPoints.optional(),
});
export type InvoiceLineInput = z.input<typeof invoiceLineInputSchema>;

export const invoiceLineSchema = z.object({
  id,
  kind: lineKindSchema,
  description: z.string(),
  stageKey: stageKeySchema.nullable(),
  netMinor: minorSchema,
  taxRateBp: basisPoints,
  taxMinor: minorSchema,
  totalMinor: minorSchema,
});
export type InvoiceLine = z.infer<typeof invoiceLineSchema>;

/** POST /api/projects/:projectId/invoices (a draft) and PATCH of a draft. */
export const invoiceDraftWriteSchema = z.object({
  lines: z.array(invoiceLineInputSchema).min(1, 'an invoice needs at least one line').max(100),
  note: z.string().trim().max(2000).default(''),
});
export type InvoiceDraftWrite = z.input<typeof invoiceDraftWriteSchema>;

export const invoiceVoidSchema = z.object({ reason: z.string().trim().min(3, 'say why it is void').max(2000) });
export const creditNoteCreateSchema = z.object({
  reason: z.string().trim().min(3, 'say what the credit corrects').max(2000),
  lines: z
    .array(
      z.object({
        description: z.string().trim().min(1).max(300),
        netMinor: z.number().int().min(1).max(1e13),
        taxRateBp: basisPoints.optional(),
      }),
    )
    .min(1)
    .max(100),
});
export type CreditNoteCreate = z.input<typeof creditNoteCreateSchema>;

export const paymentMethodSchema = z.enum(['bank_transfer', 'card']);
/** POST /api/projects/:projectId/invoices/:invoiceId/payments (money received by other means). */
export const paymentCreateSchema = z.object({
  amountMinor: z.number().int().min(1).max(1e13),
  receivedOn: isoDate,
  reference: z.string().trim().min(1, 'the bank reference').max(200),
});
export type PaymentCreate = z.infer<typeof paymentCreateSchema>;

export const paymentSchema = z.object({
  id,
  method: paymentMethodSchema,
  amountMinor: minorSchema,
  /** The part of this payment beyond what was due (kept, and flagged to the principal). */
  overpaidMinor: minorSchema,
  receivedOn: isoDate,
  reference: z.string(),
});
export type Payment = z.infer<typeof paymentSchema>;

export const invoiceSummarySchema = z.object({
  id,
  kind: invoiceKindSchema,
  number: z.string().nullable(),
  project: z.object({ id, reference: z.string(), name: z.string() }),
  client: z.object({ id, name: z.string() }),
  state: invoiceStateSchema,
  overdue: z.boolean(),
  currency: currencySchema,
  totalMinor: minorSchema,
  paidMinor: minorSchema,
  creditedMinor: minorSchema,
  dueMinor: minorSchema,
  overpaidMinor: minorSchema,
  issuedOn: isoDate.nullable(),
  dueOn: isoDate.nullable(),
});
export type InvoiceSummary = z.infer<typeof invoiceSummarySchema>;

export const invoiceSchema = invoiceSummarySchema.extend({
  stageKey: stageKeySchema.nullable(),
  note: z.string(),
  taxLabel: z.string(),
  subtotalMinor: minorSchema,
  taxMinor: minorSchema,
  lines: z.array(invoiceLineSchema),
  payments: z.array(paymentSchema),
  creditNotes: z.array(z.object({ id, number: z.string().nullable(), totalMinor: minorSchema })),
  creditsInvoice: z.object({ id, number: z.string().nullable() }).nullable(),
  voidReason: z.string().nullable(),
  remindersEnabled: z.boolean(),
  hasPdf: z.boolean(),
});
export type Invoice = z.infer<typeof invoiceSchema>;

export const invoiceSortSchema = z.enum(['number', 'issuedOn', 'dueOn', 'total', 'due', 'client', 'project', 'state']);
/** GET /api/invoices: across projects (the principal all, a client their organisation's). */
export const invoiceListQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
  sort: invoiceSortSchema.default('issuedOn'),
  direction: z.enum(['asc', 'desc']).default('desc'),
  state: z.union([invoiceStateSchema, z.literal('overdue')]).optional(),
  clientId: id.optional(),
  projectId: id.optional(),
  q: z.string().trim().max(100).optional(),
});
export type InvoiceListQuery = z.input<typeof invoiceListQuerySchema>;
export const invoiceListSchema = pageOf(invoiceSummarySchema);
export type InvoiceList = z.infer<typeof invoiceListSchema>;

export const AGE_BANDS = ['current', 'd1_30', 'd31_60', 'd61_90', 'over_90'] as const;
export const ageBandSchema = z.enum(AGE_BANDS);
export type AgeBand = z.infer<typeof ageBandSchema>;
export const AGE_BAND_LABELS: Record<AgeBand, string> = {
  current: 'Not yet due',
  d1_30: '1–30 days late',
  d31_60: '31–60 days late',
  d61_90: '61–90 days late',
  over_90: 'Over 90 days late',
};
/** GET /api/receivables: what clients owe, by client and by age, per currency. */
export const receivablesSchema = z.object({
  asOf: isoDate,
  rows: z.array(
    z.object({
      client: z.object({ id, name: z.string() }),
      currency: currencySchema,
      bands: z.object(
        Object.fromEntries(AGE_BANDS.map((b) => [b, minorSchema])) as Record<AgeBand, typeof minorSchema>,
      ),
      totalMinor: minorSchema,
    }),
  ),
});
export type Receivables = z.infer<typeof receivablesSchema>;

/** POST …/invoices/:invoiceId/checkout: where to send the browser. */
export const checkoutStartSchema = z.object({ url: z.url(), sessionId: z.string() });
export type CheckoutStart = z.infer<typeof checkoutStartSchema>;
/** POST …/invoices/:invoiceId/checkout/:sessionId/reconcile */
export const checkoutOutcomeSchema = z.object({
  outcome: z.enum(['paid', 'pending', 'declined', 'expired']),
  message: z.string(),
  invoice: invoiceSchema,
});
export type CheckoutOutcome = z.infer<typeof checkoutOutcomeSchema>;

export const remindersToggleSchema = z.object({ enabled: z.boolean() });
