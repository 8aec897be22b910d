import type { Knex } from 'knex';
import {
  STAGE_KEYS,
  STAGE_TITLES,
  type FeeAgreement,
  type FeeAgreementWrite,
  type FeeVariationCreate,
  type StageKey,
} from '@trabeate/contracts';
import type { Db } from '../db/db';
import type { Caller } from '../access/policy';
import { HttpError, notFound } from '../core/errors';
import { lockProject } from '../projects/projects.repository';
import { insertActivity } from '../activity/activity.repository';
import { formatMoney } from '../invoices/money';
import { applyRate, lineTax, splitFee, totalsOf } from '../invoices/money';
import {
  getAgreement,
  hasIssuedInvoice,
  insertVariation,
  invoicedByStage,
  listVariations,
  upsertAgreement,
  type AgreementRow,
} from './fees.repository';

type Q = Db | Knex.Transaction;

export function originalFee(a: AgreementRow): number {
  return a.basis === 'lump_sum'
    ? Number(a.lump_sum_minor)
    : applyRate(Number(a.construction_cost_minor), a.percentage_bp ?? 0);
}

/** The fee now: as first agreed plus every variation since. */
export async function currentFee(db: Q, a: AgreementRow): Promise<number> {
  const [{ sum }] = await db('fee_variations')
    .where({ project_id: a.project_id })
    .sum<{ sum: string | null }[]>('amount_minor as sum');
  return originalFee(a) + Number(sum ?? 0);
}

/** Each stage's part of the current fee, by the agreed shares (parts add up to the fee exactly). */
export function stageAmounts(feeMinor: number, a: AgreementRow): Record<StageKey, number> {
  const parts = splitFee(
    Math.max(feeMinor, 0),
    STAGE_KEYS.map((k) => a.stage_shares[k]),
  );
  return Object.fromEntries(STAGE_KEYS.map((k, i) => [k, parts[i]])) as Record<StageKey, number>;
}

export async function readAgreement(db: Db, projectId: string): Promise<FeeAgreement> {
  const a = await getAgreement(db, projectId);
  if (!a) throw notFound('This project has no fee agreement yet.');
  const variations = await listVariations(db, projectId);
  const fee = await currentFee(db, a);
  const amounts = stageAmounts(fee, a);
  const invoiced = await invoicedByStage(db, projectId);
  return {
    projectId,
    basis: a.basis,
    lumpSumMinor: a.lump_sum_minor === null ? null : Number(a.lump_sum_minor),
    percentageBp: a.percentage_bp,
    constructionCostMinor: a.construction_cost_minor === null ? null : Number(a.construction_cost_minor),
    currency: a.currency.trim(),
    taxRateBp: a.tax_rate_bp,
    taxLabel: a.tax_label,
    paymentTermsDays: a.payment_terms_days,
    billingContact: { id: a.billing_contact_id, displayName: a.contact_name, email: a.contact_email },
    stageShares: a.stage_shares,
    originalFeeMinor: originalFee(a),
    variations: variations.map((v) => ({
      id: v.id,
      amountMinor: Number(v.amount_minor),
      reason: v.reason,
      effectiveOn: v.effective_on,
      recordedBy: v.recorded_by_name ?? 'someone no longer at the firm',
      recordedAt: new Date(v.recorded_at).toISOString(),
    })),
    currentFeeMinor: fee,
    stages: STAGE_KEYS.map((k) => ({
      stageKey: k,
      shareBp: a.stage_shares[k],
      amountMinor: amounts[k],
      invoicedMinor: invoiced[k],
    })),
    editable: !(await hasIssuedInvoice(db, projectId)),
  };
}

/**
 * Sets the agreement. Once an invoice has been issued the agreement is history: a change is a
 * variation with its reason, never an edit.
 */
export async function writeAgreement(
  db: Db,
  caller: Caller,
  projectId: string,
  input: FeeAgreementWrite & {
    lumpSumMinor: number | null;
    percentageBp: number | null;
    constructionCostMinor: number | null;
  },
): Promise<FeeAgreement> {
  await db.transaction(async (trx) => {
    const project = await lockProject(trx, projectId);
    if (project.archived_at)
      throw new HttpError(409, 'conflict', 'This project is archived; restore it before changing it.');
    if (await hasIssuedInvoice(trx, projectId)) {
      throw new HttpError(
        409,
        'conflict',
        'An invoice has been issued under this agreement, so it can no longer be edited. Record a fee variation with its reason instead.',
      );
    }
    const contact = await trx('users')
      .where({ id: input.billingContactId, client_organisation_id: project.client_organisation_id })
      .whereNull('disabled_at')
      .first('id');
    if (!contact) {
      throw new HttpError(400, 'validation_failed', "The billing contact must be one of the client's contacts.", {
        'body.billingContactId': ["not a contact of this project's client"],
      });
    }
    const before = await getAgreement(trx, projectId, true);
    await upsertAgreement(trx, {
      project_id: projectId,
      firm_id: caller.firmId,
      basis: input.basis,
      lump_sum_minor: input.basis === 'lump_sum' ? input.lumpSumMinor : null,
      percentage_bp: input.basis === 'percentage' ? input.percentageBp : null,
      construction_cost_minor: input.basis === 'percentage' ? input.constructionCostMinor : null,
      currency: input.currency,
      tax_rate_bp: input.taxRateBp,
      tax_label: input.taxLabel,
      payment_terms_days: input.paymentTermsDays,
      billing_contact_id: input.billingContactId,
      stage_shares: JSON.stringify(input.stageShares),
    });
    // Drafts follow the agreement's currency (they have no number yet, so nothing is rewritten).
    await trx('invoices').where({ project_id: projectId, state: 'draft' }).update({ currency: input.currency });
    const terms =
      input.basis === 'lump_sum'
        ? `lump sum ${formatMoney(input.lumpSumMinor ?? 0, input.currency)}`
        : `${((input.percentageBp ?? 0) / 100).toFixed(2)} % of ${formatMoney(input.constructionCostMinor ?? 0, input.currency)}`;
    await insertActivity(trx, {
      firmId: caller.firmId,
      projectId,
      actorId: caller.userId,
      action: before ? 'fee_agreement.changed' : 'fee_agreement.set',
      objectType: 'fee_agreement',
      objectId: projectId,
      summary: `Fee agreement ${before ? 'changed' : 'set'}: ${terms}`,
      details: { basis: input.basis, currency: input.currency },
    });
  });
  return readAgreement(db, projectId);
}

export async function addVariation(
  db: Db,
  caller: Caller,
  projectId: string,
  input: FeeVariationCreate,
): Promise<FeeAgreement> {
  await db.transaction(async (trx) => {
    await lockProject(trx, projectId);
    const a = await getAgreement(trx, projectId, true);
    if (!a) throw new HttpError(409, 'conflict', 'Set the fee agreement before recording a variation.');
    if ((await currentFee(trx, a)) + input.amountMinor < 0) {
      throw new HttpError(409, 'conflict', 'A variation cannot take the fee below zero.');
    }
    const variationId = await insertVariation(trx, { projectId, ...input, recordedBy: caller.userId });
    const amount = formatMoney(Math.abs(input.amountMinor), a.currency.trim());
    await insertActivity(trx, {
      firmId: caller.firmId,
      projectId,
      actorId: caller.userId,
      action: 'fee_agreement.variation',
      objectType: 'fee_agreement',
      objectId: variationId,
      summary: `Fee variation ${input.amountMinor < 0 ? '−' : '+'}${amount}: ${input.reason}`,
      details: { amountMinor: input.amountMinor, effectiveOn: input.effectiveOn },
    });
  });
  return readAgreement(db, projectId);
}

/**
 * Offered when the principal approves a stage: a draft for the stage's share of the current fee,
 * less what was already invoiced against it. Nothing when there is no agreement, nothing left to
 * bill, or a draft for the stage is already open.
 */
export async function offerStageDraft(
  trx: Knex.Transaction,
  caller: Caller,
  projectId: string,
  stageKey: StageKey,
): Promise<string | null> {
  const a = await getAgreement(trx, projectId, true);
  if (!a) return null;
  const open = await trx('invoices').where({ project_id: projectId, stage_key: stageKey, state: 'draft' }).first('id');
  if (open) return null;
  const fee = await currentFee(trx, a);
  const remaining = stageAmounts(fee, a)[stageKey] - (await invoicedByStage(trx, projectId))[stageKey];
  if (remaining <= 0) return null;
  const line = {
    kind: 'stage_fee',
    description: `${STAGE_TITLES[stageKey]}: ${(a.stage_shares[stageKey] / 100).toFixed(2)} % of the fee`,
    stage_key: stageKey,
    net_minor: remaining,
    tax_rate_bp: a.tax_rate_bp,
    tax_minor: lineTax(remaining, a.tax_rate_bp),
  };
  const totals = totalsOf([{ netMinor: line.net_minor, taxMinor: line.tax_minor }]);
  const [{ id }] = await trx('invoices')
    .insert({
      firm_id: caller.firmId,
      project_id: projectId,
      stage_key: stageKey,
      currency: a.currency,
      tax_label: a.tax_label,
      subtotal_minor: totals.subtotalMinor,
      tax_minor: totals.taxMinor,
      total_minor: totals.totalMinor,
      created_by: caller.userId,
    })
    .returning('id');
  await trx('invoice_lines').insert({ ...line, invoice_id: id, position: 1 });
  return id;
}
