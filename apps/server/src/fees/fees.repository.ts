import type { Knex } from 'knex';
import { STAGE_KEYS, type StageKey, type StageShares } from '@trabeate/contracts';
import type { Db } from '../db/db';

type Q = Db | Knex.Transaction;

export interface AgreementRow {
  project_id: string;
  firm_id: string;
  basis: 'lump_sum' | 'percentage';
  lump_sum_minor: string | null;
  percentage_bp: number | null;
  construction_cost_minor: string | null;
  currency: string;
  tax_rate_bp: number;
  tax_label: string;
  payment_terms_days: number;
  billing_contact_id: string;
  contact_name: string;
  contact_email: string;
  stage_shares: StageShares;
}

export interface VariationRow {
  id: string;
  amount_minor: string;
  reason: string;
  effective_on: string;
  recorded_by_name: string | null;
  recorded_at: Date;
}

export async function getAgreement(db: Q, projectId: string, lock = false): Promise<AgreementRow | undefined> {
  const q = db('fee_agreements as a')
    .join('users as u', 'u.id', 'a.billing_contact_id')
    .where('a.project_id', projectId)
    .first('a.*', 'u.display_name as contact_name', 'u.email as contact_email');
  if (lock) q.forUpdate('a');
  return q;
}

export async function upsertAgreement(trx: Knex.Transaction, row: Record<string, unknown>): Promise<void> {
  await trx('fee_agreements')
    .insert(row)
    .onConflict('project_id')
    .merge({ ...row, updated_at: trx.fn.now() });
}

export async function listVariations(db: Q, projectId: string): Promise<VariationRow[]> {
  return db('fee_variations as v')
    .leftJoin('users as u', 'u.id', 'v.recorded_by')
    .where('v.project_id', projectId)
    .orderBy([
      { column: 'v.recorded_at', order: 'asc' },
      { column: 'v.id', order: 'asc' },
    ])
    .select(
      'v.id',
      'v.amount_minor',
      'v.reason',
      db.raw(`to_char(v.effective_on, 'YYYY-MM-DD') as effective_on`),
      'u.display_name as recorded_by_name',
      'v.recorded_at',
    );
}

export async function insertVariation(
  trx: Knex.Transaction,
  v: { projectId: string; amountMinor: number; reason: string; effectiveOn: string; recordedBy: string },
): Promise<string> {
  const [{ id }] = await trx('fee_variations')
    .insert({
      project_id: v.projectId,
      amount_minor: v.amountMinor,
      reason: v.reason,
      effective_on: v.effectiveOn,
      recorded_by: v.recordedBy,
    })
    .returning('id');
  return id;
}

/** Net stage-fee amounts on the project's numbered, not-void invoices, less credit notes, per stage. */
export async function invoicedByStage(db: Q, projectId: string): Promise<Record<StageKey, number>> {
  const rows: Array<{ stage_key: StageKey; net: string }> = await db('invoice_lines as l')
    .join('invoices as i', 'i.id', 'l.invoice_id')
    .where('i.project_id', projectId)
    .where('i.kind', 'invoice')
    .whereIn('i.state', ['issued', 'part_paid', 'paid'])
    .where('l.kind', 'stage_fee')
    .groupBy('l.stage_key')
    .select('l.stage_key', db.raw('sum(l.net_minor) as net'));
  const out = Object.fromEntries(STAGE_KEYS.map((k) => [k, 0])) as Record<StageKey, number>;
  for (const r of rows) out[r.stage_key] = Number(r.net);
  return out;
}

/** Has the project an invoice that has ever had a number (issued, paid or void after issue)? */
export async function hasIssuedInvoice(db: Q, projectId: string): Promise<boolean> {
  return Boolean(await db('invoices').where({ project_id: projectId }).whereNotNull('number').first('id'));
}
