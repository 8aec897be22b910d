import type { Knex } from 'knex';
import type { z } from 'zod';
import type { invoiceListQuerySchema, InvoiceState, StageKey } from '@trabeate/contracts';

type InvoiceListQuery = z.output<typeof invoiceListQuerySchema>;
import type { Db } from '../db/db';
import type { Caller } from '../access/policy';
import { visibleTo } from '../projects/projects.repository';
import { firmTodaySql } from '../firms/firms.repository';

type Q = Db | Knex.Transaction;

export interface InvoiceRow {
  id: string;
  firm_id: string;
  project_id: string;
  project_reference: string;
  project_name: string;
  client_id: string;
  client_name: string;
  kind: 'invoice' | 'credit_note';
  credits_invoice_id: string | null;
  stage_key: StageKey | null;
  state: InvoiceState;
  number: string | null;
  issued_on: string | null;
  due_on: string | null;
  currency: string;
  tax_label: string;
  note: string;
  subtotal_minor: string;
  tax_minor: string;
  total_minor: string;
  paid_minor: string;
  credited_minor: string;
  overpaid_minor: string;
  overdue: boolean;
  void_reason: string | null;
  reminders_enabled: boolean;
  pdf_object_key: string | null;
}

export interface LineRow {
  id: string;
  kind: 'stage_fee' | 'additional_service' | 'expense' | 'credit';
  description: string;
  stage_key: StageKey | null;
  net_minor: string;
  tax_rate_bp: number;
  tax_minor: string;
}

/** Invoices with what has been paid and credited against them, and whether they are overdue today. */
export function invoicesQuery(db: Q, firmId: string, today?: string) {
  const day = today ? db.raw('?::date', [today]) : db.raw(firmTodaySql('?'), [firmId]);
  return db('invoices as i')
    .join('projects as p', 'p.id', 'i.project_id')
    .join('client_organisations as o', 'o.id', 'p.client_organisation_id')
    .where('i.firm_id', firmId)
    .select(
      'i.id',
      'i.firm_id',
      'i.project_id',
      'p.reference as project_reference',
      'p.name as project_name',
      'o.id as client_id',
      'o.name as client_name',
      'i.kind',
      'i.credits_invoice_id',
      'i.stage_key',
      'i.state',
      'i.number',
      db.raw(`to_char(i.issued_on, 'YYYY-MM-DD') as issued_on`),
      db.raw(`to_char(i.due_on, 'YYYY-MM-DD') as due_on`),
      'i.currency',
      'i.tax_label',
      'i.note',
      'i.subtotal_minor',
      'i.tax_minor',
      'i.total_minor',
      db.raw('coalesce(pay.paid, 0) as paid_minor'),
      db.raw('coalesce(pay.overpaid, 0) as overpaid_minor'),
      db.raw('coalesce(cr.credited, 0) as credited_minor'),
      db.raw(`(i.state in ('issued', 'part_paid') and i.due_on < ?) as overdue`, [day]),
      'i.void_reason',
      'i.reminders_enabled',
      'i.pdf_object_key',
    )
    .leftJoin(
      db('payments')
        .groupBy('invoice_id')
        .select('invoice_id', db.raw('sum(amount_minor) as paid'), db.raw('sum(overpaid_minor) as overpaid'))
        .as('pay'),
      'pay.invoice_id',
      'i.id',
    )
    .leftJoin(
      db('invoices')
        .where({ kind: 'credit_note' })
        .whereNot({ state: 'void' })
        .groupBy('credits_invoice_id')
        .select('credits_invoice_id', db.raw('sum(total_minor) as credited'))
        .as('cr'),
      'cr.credits_invoice_id',
      'i.id',
    );
}

export async function getInvoice(
  db: Q,
  firmId: string,
  projectId: string,
  id: string,
): Promise<InvoiceRow | undefined> {
  return invoicesQuery(db, firmId).where({ 'i.id': id, 'i.project_id': projectId }).first();
}

/** Locks the invoice row: issue, void, credit and payments on one invoice take turns. */
export async function lockInvoice(
  trx: Knex.Transaction,
  projectId: string,
  id: string,
): Promise<{ state: InvoiceState } | undefined> {
  return trx('invoices').where({ id, project_id: projectId }).forUpdate().first('state', 'kind');
}

export async function linesOf(db: Q, invoiceId: string): Promise<LineRow[]> {
  return db('invoice_lines').where({ invoice_id: invoiceId }).orderBy('position').select('*');
}

export async function paymentsOf(db: Q, invoiceId: string) {
  return db('payments')
    .where({ invoice_id: invoiceId })
    .orderBy('created_at')
    .select(
      'id',
      'method',
      'amount_minor',
      'overpaid_minor',
      db.raw(`to_char(received_on, 'YYYY-MM-DD') as received_on`),
      'reference',
    );
}

export async function creditNotesOf(db: Q, invoiceId: string) {
  return db('invoices')
    .where({ credits_invoice_id: invoiceId, kind: 'credit_note' })
    .orderBy('created_at')
    .select('id', 'number', 'total_minor');
}

/**
 * The next number in a firm's series for a year: a counter row bumped in the caller's transaction.
 * The row lock holds other issuers until this transaction ends; a rollback returns the number.
 */
export async function nextNumber(trx: Knex.Transaction, firmId: string, series: string, year: number): Promise<number> {
  await trx('invoice_counters')
    .insert({ firm_id: firmId, series, year, last_number: 0 })
    .onConflict(['firm_id', 'series', 'year'])
    .ignore();
  const [{ last_number }] = await trx('invoice_counters')
    .where({ firm_id: firmId, series, year })
    .increment('last_number', 1)
    .returning('last_number');
  return last_number;
}

const SORT: Record<InvoiceListQuery['sort'], string> = {
  number: 'x.number',
  issuedOn: 'x.issued_on',
  dueOn: 'x.due_on',
  total: 'x.total_minor',
  due: 'due_minor',
  client: 'x.client_name',
  project: 'x.project_reference',
  state: 'x.state',
};

export type InvoiceFilters = Pick<InvoiceListQuery, 'page' | 'pageSize' | 'sort' | 'direction'> &
  Partial<Pick<InvoiceListQuery, 'state' | 'clientId' | 'projectId' | 'q'>>;

export async function listInvoices(
  db: Db,
  caller: Caller,
  f: InvoiceFilters,
): Promise<{ rows: InvoiceRow[]; total: number }> {
  const base = visibleTo(invoicesQuery(db, caller.firmId), caller);
  // Clients see what was sent to them, never the firm's drafts.
  if (caller.role === 'client') base.whereNot('i.state', 'draft');
  if (f.state === 'overdue')
    base
      .whereIn('i.state', ['issued', 'part_paid'])
      .andWhere('i.due_on', '<', db.raw(firmTodaySql('?'), [caller.firmId]));
  else if (f.state) base.where('i.state', f.state);
  if (f.clientId) base.where('o.id', f.clientId);
  if (f.projectId) base.where('p.id', f.projectId);
  if (f.q) {
    const like = `%${f.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    base.andWhere((w) =>
      w
        .whereILike('i.number', like)
        .orWhereILike('p.reference', like)
        .orWhereILike('p.name', like)
        .orWhereILike('o.name', like),
    );
  }
  const [{ n }] = await db.from(base.clone().as('x')).count<{ n: string }[]>('* as n');
  const rows: InvoiceRow[] = await db
    .from(base.clone().as('x'))
    .select('x.*', db.raw('(x.total_minor - x.paid_minor + x.overpaid_minor - x.credited_minor) as due_minor'))
    .orderByRaw(`${SORT[f.sort]} ${f.direction === 'asc' ? 'asc' : 'desc'} nulls last, x.id`)
    .limit(f.pageSize)
    .offset((f.page - 1) * f.pageSize);
  return { rows, total: Number(n) };
}
