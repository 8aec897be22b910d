import type { Knex } from 'knex';
import type { Purpose, RevisionState } from '@trabeate/contracts';
import type { Db } from '../db/db';
import type { FirmDateSettings } from '@trabeate/dates';
import { datesOf } from '../firms/firms.repository';

type Q = Db | Knex.Transaction;

export interface TransmittalRow {
  id: string;
  project_id: string;
  number: number;
  purpose: Purpose;
  note: string;
  issued_by: string;
  issuer_name: string;
  issued_at: Date;
  links_expire_at: Date;
  sheet_object_key: string | null;
  sheet_size_bytes: string | null;
  project_reference: string;
}

function transmittalsQuery(db: Q) {
  return db('transmittals as t')
    .join('users as u', 'u.id', 't.issued_by')
    .join('projects as p', 'p.id', 't.project_id')
    .select('t.*', 'u.display_name as issuer_name', 'p.reference as project_reference');
}

/** A client contact sees only the transmittals they are a recipient of. */
function visibleTo(q: Knex.QueryBuilder, userId: string | null) {
  if (userId)
    q.whereExists((s) =>
      s.select(1).from('transmittal_recipients as tr').whereRaw('tr.transmittal_id = t.id').where('tr.user_id', userId),
    );
  return q;
}

export async function getTransmittal(
  db: Q,
  projectId: string,
  id: string,
  recipientUserId: string | null,
): Promise<TransmittalRow | undefined> {
  return visibleTo(transmittalsQuery(db).where({ 't.project_id': projectId, 't.id': id }), recipientUserId).first();
}

export async function getTransmittalById(db: Q, id: string): Promise<TransmittalRow | undefined> {
  return transmittalsQuery(db).where('t.id', id).first();
}

/** The date settings of the firm that sent the transmittal, or undefined when there is no such transmittal. */
export async function transmittalFirmDates(db: Q, id: string): Promise<FirmDateSettings | undefined> {
  const row = await db('transmittals as t')
    .join('projects as p', 'p.id', 't.project_id')
    .join('firms as f', 'f.id', 'p.firm_id')
    .where('t.id', id)
    .first('f.date_locale', 'f.time_zone');
  return row ? datesOf(row) : undefined;
}

export async function listTransmittals(db: Q, projectId: string, recipientUserId: string | null) {
  return visibleTo(
    transmittalsQuery(db)
      .where('t.project_id', projectId)
      .select(
        db.raw('(select count(*)::int from transmittal_items i where i.transmittal_id = t.id) as item_count'),
        db.raw('(select count(*)::int from transmittal_recipients r where r.transmittal_id = t.id) as recipient_count'),
        db.raw(
          '(select count(*)::int from transmittal_recipients r where r.transmittal_id = t.id and r.acknowledged_at is not null) as acknowledged_count',
        ),
      )
      .orderBy('t.number', 'desc'),
    recipientUserId,
  ) as Promise<Array<TransmittalRow & { item_count: number; recipient_count: number; acknowledged_count: number }>>;
}

export interface ItemRow {
  revision_id: string;
  drawing_id: string;
  number: string;
  title: string;
  code: string;
  suitability: string;
  purpose: Purpose;
  revision_date: string;
  state: RevisionState;
}

export async function itemsOf(db: Q, transmittalId: string): Promise<ItemRow[]> {
  return db('transmittal_items as i')
    .join('drawing_revisions as r', 'r.id', 'i.revision_id')
    .join('drawings as d', 'd.id', 'r.drawing_id')
    .where('i.transmittal_id', transmittalId)
    .orderBy('i.position')
    .select(
      'r.id as revision_id',
      'd.id as drawing_id',
      'd.number',
      'd.title',
      'r.code',
      'r.suitability',
      'r.purpose',
      db.raw(`to_char(r.revision_date, 'YYYY-MM-DD') as revision_date`),
      'r.state',
    );
}

export interface RecipientRow {
  id: string;
  transmittal_id: string;
  user_id: string | null;
  email: string;
  name: string;
  acknowledged_at: Date | null;
}

export async function recipientsOf(db: Q, transmittalId: string): Promise<RecipientRow[]> {
  return db('transmittal_recipients')
    .where({ transmittal_id: transmittalId })
    .orderByRaw('user_id is null, lower(email)');
}

export async function downloadsOf(db: Q, transmittalId: string) {
  return db('drawing_downloads as dl')
    .leftJoin('users as u', 'u.id', 'dl.user_id')
    .leftJoin('transmittal_recipients as tr', 'tr.id', 'dl.recipient_id')
    .leftJoin('revision_files as f', 'f.id', 'dl.revision_file_id')
    .where('dl.transmittal_id', transmittalId)
    .orWhereIn(
      'dl.revision_file_id',
      db('revision_files as f2')
        .join('transmittal_items as i', 'i.revision_id', 'f2.revision_id')
        .where('i.transmittal_id', transmittalId)
        .select('f2.id'),
    )
    .orderBy('dl.at', 'desc')
    .select(
      'dl.id',
      'dl.at',
      'dl.what',
      'dl.ip',
      'dl.recipient_id',
      'f.file_name',
      'u.display_name as user_name',
      'u.email as user_email',
      'tr.email as recipient_email',
    ) as Promise<
    Array<{
      id: string;
      at: Date;
      what: 'file' | 'zip' | 'sheet';
      ip: string | null;
      recipient_id: string | null;
      file_name: string | null;
      user_name: string | null;
      user_email: string | null;
      recipient_email: string | null;
    }>
  >;
}
