import type { Knex } from 'knex';
import { DEMO } from './demo-data';

// The demo's fees, on Alder Lane (Harbourlight's school block): an agreement and a handful of
// invoices in the states the Fees page shows (a draft, one awaiting payment, one overdue, one part
// paid, one paid) with the bank transfers against them. Invented amounts and wording. Kestrel Yard
// is left without an agreement so it can be set up by hand (and by the browser tests).

const DAY = 86_400_000;
const dayIn = (days: number) => new Date(Date.now() + days * DAY).toISOString().slice(0, 10);
const SHARES = {
  design_basis: 1000,
  column_layout: 2000,
  beam_framing: 2500,
  slab_panels: 2000,
  stairs: 500,
  foundations: 2000,
};
const TAX_BP = 2000;
/** Tax per line, rounded half up (amounts here are all exact in cents). */
const tax = (net: number) => Math.floor((net * TAX_BP + 5_000) / 10_000);

interface SeedInvoice {
  description: string;
  kind: 'stage_fee' | 'additional_service' | 'expense';
  netMinor: number;
  /** Days from today; null for the draft. */
  issuedIn: number | null;
  paid?: Array<{ minor: number; in: number; reference: string }>;
}

const INVOICES: SeedInvoice[] = [
  {
    description: 'Measured survey of the existing hall',
    kind: 'additional_service',
    netMinor: 240_000,
    issuedIn: -95,
    paid: [{ minor: 288_000, in: -70, reference: 'HST-TRF-0412' }],
  },
  {
    description: 'Review of the ground investigation report',
    kind: 'additional_service',
    netMinor: 180_000,
    issuedIn: -75,
  },
  {
    description: 'Feasibility study: three options for the hall extension',
    kind: 'additional_service',
    netMinor: 300_000,
    issuedIn: -40,
    paid: [{ minor: 150_000, in: -12, reference: 'HST-TRF-0468' }],
  },
  { description: 'Site visits in October and November', kind: 'expense', netMinor: 42_500, issuedIn: -5 },
  { description: 'Printed drawing sets for the trustees’ meeting', kind: 'expense', netMinor: 8_500, issuedIn: null },
];

/** Adds the demo's fees once; a second run finds the agreement and changes nothing. */
export async function seedDemoFees(db: Knex): Promise<void> {
  const projectId = DEMO.projects.alder.id;
  if (await db('fee_agreements').where({ project_id: projectId }).first('project_id')) return;
  await db.transaction(async (trx) => {
    await trx('fee_agreements').insert({
      project_id: projectId,
      firm_id: DEMO.firm.id,
      basis: 'percentage',
      percentage_bp: 850,
      construction_cost_minor: 230_000_000,
      lump_sum_minor: null,
      currency: 'EUR',
      tax_rate_bp: TAX_BP,
      tax_label: 'VAT',
      payment_terms_days: 30,
      billing_contact_id: DEMO.users.harbourlightContact.id,
      stage_shares: JSON.stringify(SHARES),
    });
    for (const inv of INVOICES) {
      const issuedOn = inv.issuedIn === null ? null : dayIn(inv.issuedIn);
      let numbering = {};
      if (issuedOn) {
        // Numbers come from the same counter rows the API uses, so the series stays gapless.
        const year = Number(issuedOn.slice(0, 4));
        await trx('invoice_counters')
          .insert({ firm_id: DEMO.firm.id, series: 'invoice', year, last_number: 0 })
          .onConflict(['firm_id', 'series', 'year'])
          .ignore();
        const [{ last_number: seq }] = await trx('invoice_counters')
          .where({ firm_id: DEMO.firm.id, series: 'invoice', year })
          .increment('last_number', 1)
          .returning('last_number');
        numbering = {
          series: 'invoice',
          year,
          seq,
          number: `INV-${year}-${String(seq).padStart(4, '0')}`,
          issued_on: issuedOn,
          due_on: dayIn(inv.issuedIn! + 30),
        };
      }
      const paid = (inv.paid ?? []).reduce((a, p) => a + p.minor, 0);
      const total = inv.netMinor + tax(inv.netMinor);
      const state = !issuedOn ? 'draft' : paid >= total ? 'paid' : paid > 0 ? 'part_paid' : 'issued';
      const [{ id }] = await trx('invoices')
        .insert({
          firm_id: DEMO.firm.id,
          project_id: projectId,
          state,
          currency: 'EUR',
          tax_label: 'VAT',
          subtotal_minor: inv.netMinor,
          tax_minor: tax(inv.netMinor),
          total_minor: total,
          created_by: DEMO.users.principal.id,
          ...numbering,
        })
        .returning('id');
      await trx('invoice_lines').insert({
        invoice_id: id,
        position: 1,
        kind: inv.kind,
        description: inv.description,
        net_minor: inv.netMinor,
        tax_rate_bp: TAX_BP,
        tax_minor: tax(inv.netMinor),
      });
      for (const p of inv.paid ?? [])
        await trx('payments').insert({
          firm_id: DEMO.firm.id,
          invoice_id: id,
          method: 'bank_transfer',
          amount_minor: p.minor,
          received_on: dayIn(p.in),
          reference: p.reference,
          recorded_by: DEMO.users.principal.id,
        });
    }
  });
}
