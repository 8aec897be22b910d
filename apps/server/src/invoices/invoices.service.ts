import { Readable } from 'node:stream';
import type { Knex } from 'knex';
import {
  AGE_BANDS,
  type AgeBand,
  type CreditNoteCreate,
  type Invoice,
  type InvoiceDraftWrite,
  type InvoiceLineInput,
  type InvoiceSummary,
  type PaymentCreate,
  type Receivables,
} from '@trabeate/contracts';
import type { Db } from '../db/db';
import type { Caller } from '../access/policy';
import { HttpError, notFound } from '../core/errors';
import type { Notices } from '../notices/notices';
import type { ObjectStore } from '../storage';
import { lockProject } from '../projects/projects.repository';
import { datesOf, firmToday } from '../firms/firms.repository';
import { getAgreement } from '../fees/fees.repository';
import { insertActivity } from '../activity/activity.repository';
import { formatMoney, lineTax, totalsOf } from './money';
import { longDate, renderInvoicePdf } from './invoice-pdf';
import {
  creditNotesOf,
  getInvoice,
  invoicesQuery,
  linesOf,
  lockInvoice,
  nextNumber,
  paymentsOf,
  type InvoiceRow,
  type LineRow,
} from './invoices.repository';

type Q = Db | Knex.Transaction;

export interface InvoiceDeps {
  db: Db;
  notices: Notices;
  store?: ObjectStore;
}

const STATE_WORDS = { draft: 'a draft', issued: 'issued', part_paid: 'part-paid', paid: 'paid', void: 'void' } as const;
const conflict = (message: string) => new HttpError(409, 'conflict', message);

export function summaryOf(r: InvoiceRow): InvoiceSummary {
  const total = Number(r.total_minor);
  const paid = Number(r.paid_minor);
  const overpaid = Number(r.overpaid_minor);
  const credited = Number(r.credited_minor);
  return {
    id: r.id,
    kind: r.kind,
    number: r.number,
    project: { id: r.project_id, reference: r.project_reference, name: r.project_name },
    client: { id: r.client_id, name: r.client_name },
    state: r.state,
    overdue: r.overdue,
    currency: r.currency.trim(),
    totalMinor: total,
    paidMinor: paid,
    creditedMinor: credited,
    dueMinor: r.kind === 'invoice' && r.state !== 'void' ? Math.max(total - credited - (paid - overpaid), 0) : 0,
    overpaidMinor: overpaid,
    issuedOn: r.issued_on,
    dueOn: r.due_on,
  };
}

export async function invoiceOf(db: Q, r: InvoiceRow): Promise<Invoice> {
  const [lines, payments, credits] = await Promise.all([
    linesOf(db, r.id),
    paymentsOf(db, r.id),
    creditNotesOf(db, r.id),
  ]);
  const credited = r.credits_invoice_id
    ? await db('invoices').where({ id: r.credits_invoice_id }).first('id', 'number')
    : null;
  return {
    ...summaryOf(r),
    stageKey: r.stage_key,
    note: r.note,
    taxLabel: r.tax_label,
    subtotalMinor: Number(r.subtotal_minor),
    taxMinor: Number(r.tax_minor),
    lines: lines.map((l) => {
      const net = Number(l.net_minor);
      const tax = Number(l.tax_minor);
      return {
        id: l.id,
        kind: l.kind,
        description: l.description,
        stageKey: l.stage_key,
        netMinor: net,
        taxRateBp: l.tax_rate_bp,
        taxMinor: tax,
        totalMinor: net + tax,
      };
    }),
    payments: payments.map((p) => ({
      id: p.id,
      method: p.method,
      amountMinor: Number(p.amount_minor),
      overpaidMinor: Number(p.overpaid_minor),
      receivedOn: p.received_on,
      reference: p.reference,
    })),
    creditNotes: credits.map((c) => ({ id: c.id, number: c.number, totalMinor: Number(c.total_minor) })),
    creditsInvoice: credited ? { id: credited.id, number: credited.number } : null,
    voidReason: r.void_reason,
    remindersEnabled: r.reminders_enabled,
    hasPdf: Boolean(r.pdf_object_key),
  };
}

/** One invoice as the caller may see it: a client never sees the firm's drafts (404, as if absent). */
export async function readInvoice(db: Q, caller: Caller, projectId: string, id: string): Promise<Invoice> {
  const row = await getInvoice(db, caller.firmId, projectId, id);
  if (!row || (caller.role === 'client' && row.state === 'draft')) throw notFound('No invoice with this id.');
  return invoiceOf(db, row);
}

function pricedLines(lines: Array<InvoiceLineInput & { netMinor: number }>, defaultRateBp: number) {
  return lines.map((l, i) => {
    const rate = l.taxRateBp ?? defaultRateBp;
    return {
      position: i + 1,
      kind: l.kind,
      description: l.description,
      stage_key: l.stageKey ?? null,
      net_minor: l.netMinor,
      tax_rate_bp: rate,
      tax_minor: lineTax(l.netMinor, rate),
    };
  });
}

async function writeLines(trx: Knex.Transaction, invoiceId: string, lines: ReturnType<typeof pricedLines>) {
  await trx('invoice_lines').where({ invoice_id: invoiceId }).delete();
  await trx('invoice_lines').insert(lines.map((l) => ({ ...l, invoice_id: invoiceId })));
  const totals = totalsOf(lines.map((l) => ({ netMinor: l.net_minor, taxMinor: l.tax_minor })));
  await trx('invoices').where({ id: invoiceId }).update({
    subtotal_minor: totals.subtotalMinor,
    tax_minor: totals.taxMinor,
    total_minor: totals.totalMinor,
    updated_at: trx.fn.now(),
  });
}

export async function createDraft(
  db: Db,
  caller: Caller,
  projectId: string,
  input: InvoiceDraftWrite,
): Promise<Invoice> {
  const id = await db.transaction(async (trx) => {
    const project = await lockProject(trx, projectId);
    if (project.archived_at) throw conflict('This project is archived; restore it before invoicing.');
    const a = await getAgreement(trx, projectId);
    if (!a) throw conflict('Set the fee agreement before invoicing this project.');
    const [{ id }] = await trx('invoices')
      .insert({
        firm_id: caller.firmId,
        project_id: projectId,
        currency: a.currency,
        tax_label: a.tax_label,
        note: input.note ?? '',
        created_by: caller.userId,
      })
      .returning('id');
    await writeLines(trx, id, pricedLines(input.lines as never, a.tax_rate_bp));
    return id as string;
  });
  return readInvoice(db, caller, projectId, id);
}

/** A draft is edited freely; anything issued is history and is corrected by a credit note. */
export async function updateDraft(
  db: Db,
  caller: Caller,
  projectId: string,
  id: string,
  input: InvoiceDraftWrite,
): Promise<Invoice> {
  await db.transaction(async (trx) => {
    const row = await lockInvoice(trx, projectId, id);
    if (!row) throw notFound('No invoice with this id.');
    if (row.state !== 'draft')
      throw conflict(
        `This invoice is ${STATE_WORDS[row.state]}: an issued invoice is never edited. Record a credit note to correct it.`,
      );
    const a = await getAgreement(trx, projectId);
    await writeLines(trx, id, pricedLines(input.lines as never, a?.tax_rate_bp ?? 0));
    await trx('invoices')
      .where({ id })
      .update({ note: input.note ?? '' });
  });
  return readInvoice(db, caller, projectId, id);
}

/** Today where the firm is: the date an invoice issued now carries, and its number's year. */
async function today(trx: Q, firmId: string): Promise<{ iso: string; year: number }> {
  const iso = await firmToday(trx, firmId);
  return { iso, year: Number(iso.slice(0, 4)) };
}

const numberOf = (prefix: string, year: number, seq: number) => `${prefix}-${year}-${String(seq).padStart(4, '0')}`;

async function storePdf(store: ObjectStore | undefined, invoiceId: string, pdf: Buffer): Promise<string> {
  if (!store) throw new HttpError(503, 'service_unavailable', 'File storage is not configured on this server.');
  // The key comes from the id alone; the number and names live in the database.
  const key = `invoices/${invoiceId}.pdf`;
  try {
    await store.putStream(key, Readable.from([pdf]), { contentType: 'application/pdf' });
  } catch (err) {
    throw Object.assign(
      new HttpError(503, 'service_unavailable', 'File storage is not answering; try again shortly.'),
      {
        cause: err,
      },
    );
  }
  return key;
}

type SheetDraft = {
  total_minor: unknown;
  subtotal_minor: unknown;
  tax_minor: unknown;
  currency: string;
  tax_label: string;
};

/** The invoice's PDF from its stored lines and totals (one layout for issue and for the demo's files). */
async function invoicePdf(
  trx: Q,
  projectId: string,
  inv: { number: string; issuedOn: string; dueOn: string; draft: SheetDraft; lines: LineRow[]; contactName: string },
): Promise<Buffer> {
  const facts = await sheetFacts(trx, projectId);
  const { draft } = inv;
  return renderInvoicePdf({
    kind: 'invoice',
    number: inv.number,
    issuedOn: inv.issuedOn,
    dueOn: inv.dueOn,
    currency: draft.currency.trim(),
    firm: { name: facts.firm_name },
    dates: datesOf(facts),
    client: { name: facts.client_name, address: facts.client_address, contactName: inv.contactName },
    project: { reference: facts.reference, name: facts.name },
    lines: inv.lines.map((l) => ({
      description: l.description,
      stageKey: l.stage_key,
      netMinor: Number(l.net_minor),
      taxRateBp: l.tax_rate_bp,
      taxMinor: Number(l.tax_minor),
    })),
    taxLabel: draft.tax_label,
    subtotalMinor: Number(draft.subtotal_minor),
    taxMinor: Number(draft.tax_minor),
    totalMinor: Number(draft.total_minor),
    paymentReference: inv.number,
  });
}

/**
 * Stores a PDF for every issued invoice that has none (rows written straight into the database,
 * such as the demo's); answers how many were stored.
 */
export async function storeMissingInvoicePdfs(db: Db, store: ObjectStore): Promise<number> {
  const rows = await db('invoices')
    .where({ series: 'invoice' })
    .whereNotNull('number')
    .whereNull('pdf_object_key')
    .select(
      'id',
      'project_id',
      'number',
      'issued_on',
      'due_on',
      'currency',
      'tax_label',
      'total_minor',
      'subtotal_minor',
      'tax_minor',
    );
  let stored = 0;
  for (const r of rows) {
    const a = await getAgreement(db, r.project_id);
    const iso = (d: unknown) => (d instanceof Date ? d.toISOString().slice(0, 10) : String(d));
    const pdf = await invoicePdf(db, r.project_id, {
      number: r.number,
      issuedOn: iso(r.issued_on),
      dueOn: iso(r.due_on),
      draft: r,
      lines: await linesOf(db, r.id),
      contactName: a?.contact_name ?? '',
    });
    const key = await storePdf(store, r.id, pdf);
    await db('invoices').where({ id: r.id }).update({ pdf_object_key: key });
    stored++;
  }
  return stored;
}

async function sheetFacts(trx: Q, projectId: string) {
  return trx('projects as p')
    .join('client_organisations as o', 'o.id', 'p.client_organisation_id')
    .join('firms as f', 'f.id', 'p.firm_id')
    .where('p.id', projectId)
    .first(
      'p.reference',
      'p.name',
      'o.name as client_name',
      'o.address as client_address',
      'f.name as firm_name',
      'f.date_locale',
      'f.time_zone',
    );
}

/**
 * Issues a draft: the number is taken from the counter row in this transaction (a rollback gives
 * it back, so numbers stay gapless), the PDF is stored, and the e-mail with it is queued, all or
 * nothing.
 */
export async function issueInvoice(deps: InvoiceDeps, caller: Caller, projectId: string, id: string): Promise<Invoice> {
  const { db, notices, store } = deps;
  await db.transaction(async (trx) => {
    const project = await lockProject(trx, projectId);
    if (project.archived_at) throw conflict('This project is archived; restore it before invoicing.');
    const row = await lockInvoice(trx, projectId, id);
    if (!row) throw notFound('No invoice with this id.');
    if (row.state !== 'draft')
      throw conflict(`This invoice is already ${STATE_WORDS[row.state]}; only a draft can be issued.`);
    const a = await getAgreement(trx, projectId);
    if (!a) throw conflict('Set the fee agreement before invoicing this project.');
    const lines = await linesOf(trx, id);
    const draft = await trx('invoices')
      .where({ id })
      .first('total_minor', 'subtotal_minor', 'tax_minor', 'currency', 'tax_label');
    if (!lines.length || Number(draft.total_minor) <= 0)
      throw conflict('This draft has nothing to bill: add a line with an amount first.');
    const { iso, year } = await today(trx, caller.firmId);
    const seq = await nextNumber(trx, caller.firmId, 'invoice', year);
    const number = numberOf('INV', year, seq);
    const { rows } = await trx.raw(`select to_char(?::date + ?::int, 'YYYY-MM-DD') as due`, [
      iso,
      a.payment_terms_days,
    ]);
    const dueOn: string = rows[0].due;
    await trx('invoices').where({ id }).update({
      state: 'issued',
      series: 'invoice',
      year,
      seq,
      number,
      issued_on: iso,
      due_on: dueOn,
      updated_at: trx.fn.now(),
    });
    const pdf = await invoicePdf(trx, projectId, {
      number,
      issuedOn: iso,
      dueOn,
      draft,
      lines,
      contactName: a.contact_name,
    });
    const currency = draft.currency.trim();
    const facts = await sheetFacts(trx, projectId);
    const key = await storePdf(store, id, pdf);
    await trx('invoices').where({ id }).update({ pdf_object_key: key });
    await insertActivity(trx, {
      firmId: caller.firmId,
      projectId,
      actorId: caller.userId,
      action: 'invoice.issued',
      objectType: 'invoice',
      objectId: id,
      summary: `Invoice ${number} issued for ${formatMoney(Number(draft.total_minor), currency)}, due ${longDate(dueOn, datesOf(facts))}`,
      details: { number, totalMinor: Number(draft.total_minor), dueOn },
    });
    await notices.send(trx, {
      to: a.contact_email,
      template: 'invoice-issued',
      data: {
        recipientName: a.contact_name,
        firmName: facts.firm_name,
        projectName: facts.name,
        number,
        total: formatMoney(Number(draft.total_minor), currency),
        dueOn: longDate(dueOn, datesOf(facts)),
        link: notices.link('/fees'),
      },
      attachments: [
        { filename: `${number}.pdf`, contentType: 'application/pdf', contentBase64: pdf.toString('base64') },
      ],
    });
  });
  return readInvoice(db, caller, projectId, id);
}

export async function voidInvoice(
  db: Db,
  caller: Caller,
  projectId: string,
  id: string,
  reason: string,
): Promise<Invoice> {
  await db.transaction(async (trx) => {
    const row = await lockInvoice(trx, projectId, id);
    if (!row) throw notFound('No invoice with this id.');
    if (row.state === 'void') throw conflict('This invoice is already void.');
    if (row.state === 'part_paid' || row.state === 'paid')
      throw conflict(
        'Money has been received against this invoice, so it cannot be voided. Record a credit note instead.',
      );
    const credited = await trx('invoices').where({ credits_invoice_id: id }).whereNot({ state: 'void' }).first('id');
    if (credited) throw conflict('A credit note references this invoice, so it cannot be voided.');
    // Its number, if it had one, stays used: the counter is never wound back.
    await trx('invoices')
      .where({ id })
      .update({ state: 'void', void_reason: reason, voided_at: trx.fn.now(), updated_at: trx.fn.now() });
    const { number } = await trx('invoices').where({ id }).first('number');
    await insertActivity(trx, {
      firmId: caller.firmId,
      projectId,
      actorId: caller.userId,
      action: 'invoice.voided',
      objectType: 'invoice',
      objectId: id,
      summary: `${number ? `Invoice ${number}` : 'A draft invoice'} voided: ${reason}`,
      details: { number: number ?? null },
    });
  });
  return readInvoice(db, caller, projectId, id);
}

/** What is still owed on an invoice, from its rows (call inside the transaction holding its lock). */
async function balanceOf(trx: Knex.Transaction, firmId: string, projectId: string, id: string) {
  const row = await getInvoice(trx, firmId, projectId, id);
  if (!row) throw notFound('No invoice with this id.');
  const s = summaryOf(row);
  return { row, summary: s };
}

/** Paid when nothing is owed any more, part-paid when money came in and some is still owed. */
async function settleState(trx: Knex.Transaction, firmId: string, projectId: string, id: string): Promise<void> {
  const { row, summary } = await balanceOf(trx, firmId, projectId, id);
  if (row.kind !== 'invoice' || row.state === 'void' || row.state === 'draft') return;
  const state = summary.dueMinor <= 0 ? 'paid' : summary.paidMinor > 0 ? 'part_paid' : 'issued';
  if (state !== row.state) await trx('invoices').where({ id }).update({ state, updated_at: trx.fn.now() });
}

export async function createCreditNote(
  deps: InvoiceDeps,
  caller: Caller,
  projectId: string,
  id: string,
  input: CreditNoteCreate,
): Promise<Invoice> {
  const { db, store } = deps;
  const creditId = await db.transaction(async (trx) => {
    const row = await lockInvoice(trx, projectId, id);
    if (!row) throw notFound('No invoice with this id.');
    const { row: original, summary } = await balanceOf(trx, caller.firmId, projectId, id);
    if (original.kind !== 'invoice') throw conflict('A credit note corrects an invoice, not another credit note.');
    if (row.state === 'draft') throw conflict('This invoice is still a draft: edit it instead of crediting it.');
    if (row.state === 'void') throw conflict('This invoice is void; there is nothing to credit.');
    const lines = input.lines.map((l, i) => {
      const rate = l.taxRateBp ?? 0;
      return {
        position: i + 1,
        kind: 'credit',
        description: l.description,
        stage_key: null,
        net_minor: l.netMinor,
        tax_rate_bp: rate,
        tax_minor: lineTax(l.netMinor, rate),
      };
    });
    const totals = totalsOf(lines.map((l) => ({ netMinor: l.net_minor, taxMinor: l.tax_minor })));
    const creditable = Number(original.total_minor) - summary.creditedMinor;
    if (totals.totalMinor > creditable)
      throw conflict(
        `A credit note cannot exceed what the invoice still bills (${formatMoney(creditable, summary.currency)}).`,
      );
    const { iso, year } = await today(trx, caller.firmId);
    const seq = await nextNumber(trx, caller.firmId, 'credit_note', year);
    const number = numberOf('CN', year, seq);
    const [{ id: cid }] = await trx('invoices')
      .insert({
        firm_id: caller.firmId,
        project_id: projectId,
        kind: 'credit_note',
        credits_invoice_id: id,
        state: 'issued',
        series: 'credit_note',
        year,
        seq,
        number,
        issued_on: iso,
        due_on: iso,
        currency: summary.currency,
        tax_label: original.tax_label,
        note: input.reason,
        subtotal_minor: totals.subtotalMinor,
        tax_minor: totals.taxMinor,
        total_minor: totals.totalMinor,
        created_by: caller.userId,
      })
      .returning('id');
    await trx('invoice_lines').insert(lines.map((l) => ({ ...l, invoice_id: cid })));
    const facts = await sheetFacts(trx, projectId);
    const a = await getAgreement(trx, projectId);
    const pdf = await renderInvoicePdf({
      kind: 'credit_note',
      number,
      issuedOn: iso,
      dueOn: iso,
      currency: summary.currency,
      firm: { name: facts.firm_name },
      dates: datesOf(facts),
      client: { name: facts.client_name, address: facts.client_address, contactName: a?.contact_name ?? '' },
      project: { reference: facts.reference, name: facts.name },
      creditsNumber: original.number,
      reason: input.reason,
      lines: lines.map((l) => ({
        description: l.description,
        stageKey: null,
        netMinor: l.net_minor,
        taxRateBp: l.tax_rate_bp,
        taxMinor: l.tax_minor,
      })),
      taxLabel: original.tax_label,
      ...totals,
      paymentReference: number,
    });
    await trx('invoices')
      .where({ id: cid })
      .update({ pdf_object_key: await storePdf(store, cid, pdf) });
    await settleState(trx, caller.firmId, projectId, id);
    await insertActivity(trx, {
      firmId: caller.firmId,
      projectId,
      actorId: caller.userId,
      action: 'invoice.credited',
      objectType: 'invoice',
      objectId: cid,
      summary: `Credit note ${number} for ${formatMoney(totals.totalMinor, summary.currency)} against invoice ${original.number}: ${input.reason}`,
      details: { number, creditsInvoiceId: id, totalMinor: totals.totalMinor },
    });
    return cid as string;
  });
  return readInvoice(db, caller, projectId, creditId);
}

/**
 * Records money received against an invoice, under the invoice's row lock. The part beyond what
 * was still owed is kept as an overpayment (flagged to the principal), never lost.
 */
export async function applyPayment(
  trx: Knex.Transaction,
  firmId: string,
  projectId: string,
  id: string,
  p: {
    method: 'bank_transfer' | 'card';
    amountMinor: number;
    receivedOn: string;
    reference: string;
    stripeSessionId?: string;
    recordedBy?: string | null;
  },
): Promise<{ overpaidMinor: number }> {
  const { summary } = await balanceOf(trx, firmId, projectId, id);
  const overpaidMinor = Math.max(p.amountMinor - summary.dueMinor, 0);
  await trx('payments').insert({
    firm_id: firmId,
    invoice_id: id,
    method: p.method,
    amount_minor: p.amountMinor,
    overpaid_minor: overpaidMinor,
    received_on: p.receivedOn,
    reference: p.reference,
    stripe_session_id: p.stripeSessionId ?? null,
    recorded_by: p.recordedBy ?? null,
  });
  await settleState(trx, firmId, projectId, id);
  return { overpaidMinor };
}

export async function recordPayment(
  db: Db,
  caller: Caller,
  projectId: string,
  id: string,
  input: PaymentCreate,
): Promise<Invoice> {
  await db.transaction(async (trx) => {
    const row = await lockInvoice(trx, projectId, id);
    if (!row) throw notFound('No invoice with this id.');
    const { summary } = await balanceOf(trx, caller.firmId, projectId, id);
    if (summary.kind !== 'invoice') throw conflict('Payments are recorded against invoices, not credit notes.');
    if (row.state === 'draft') throw conflict('This invoice is still a draft: issue it before recording a payment.');
    if (row.state === 'void') throw conflict('This invoice is void; payments cannot be recorded against it.');
    if (row.state === 'paid') throw conflict('This invoice is already paid in full.');
    if (input.amountMinor > summary.dueMinor)
      throw conflict(
        `The payment is more than the ${formatMoney(summary.dueMinor, summary.currency)} still owed on this invoice.`,
      );
    await applyPayment(trx, caller.firmId, projectId, id, {
      method: 'bank_transfer',
      ...input,
      recordedBy: caller.userId,
    });
    await insertActivity(trx, {
      firmId: caller.firmId,
      projectId,
      actorId: caller.userId,
      action: 'payment.recorded',
      objectType: 'payment',
      objectId: id,
      summary: `${formatMoney(input.amountMinor, summary.currency)} received by bank transfer on invoice ${summary.number}`,
      details: { amountMinor: input.amountMinor, receivedOn: input.receivedOn, reference: input.reference },
    });
  });
  return readInvoice(db, caller, projectId, id);
}

export async function setReminders(
  db: Db,
  caller: Caller,
  projectId: string,
  id: string,
  enabled: boolean,
): Promise<Invoice> {
  const n = await db('invoices')
    .where({ id, project_id: projectId, kind: 'invoice' })
    .update({ reminders_enabled: enabled });
  if (!n) throw notFound('No invoice with this id.');
  return readInvoice(db, caller, projectId, id);
}

const BAND_OF = (daysLate: number): AgeBand =>
  daysLate <= 0
    ? 'current'
    : daysLate <= 30
      ? 'd1_30'
      : daysLate <= 60
        ? 'd31_60'
        : daysLate <= 90
          ? 'd61_90'
          : 'over_90';

/** What each client owes, in age bands by days past the due date (per currency: no conversion). */
export async function receivables(db: Db, caller: Caller, asOf?: string): Promise<Receivables> {
  const day = asOf ?? (await today(db, caller.firmId)).iso;
  const rows: Array<InvoiceRow & { days_late: number }> = await db
    .from(
      invoicesQuery(db, caller.firmId, day)
        .where('i.kind', 'invoice')
        .whereIn('i.state', ['issued', 'part_paid'])
        .as('x'),
    )
    .select('x.*', db.raw('(?::date - x.due_on::date) as days_late', [day]));
  const byKey = new Map<string, Receivables['rows'][number]>();
  for (const r of rows) {
    const s = summaryOf(r);
    if (s.dueMinor <= 0) continue;
    const key = `${s.client.id}:${s.currency}`;
    const entry =
      byKey.get(key) ??
      ({
        client: s.client,
        currency: s.currency,
        bands: Object.fromEntries(AGE_BANDS.map((b) => [b, 0])) as Record<AgeBand, number>,
        totalMinor: 0,
      } as Receivables['rows'][number]);
    entry.bands[BAND_OF(Number(r.days_late))] += s.dueMinor;
    entry.totalMinor += s.dueMinor;
    byKey.set(key, entry);
  }
  return {
    asOf: day,
    rows: [...byKey.values()].sort(
      (a, b) => a.client.name.localeCompare(b.client.name) || a.currency.localeCompare(b.currency),
    ),
  };
}
