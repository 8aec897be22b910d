import type { Knex } from 'knex';
import type { StageKey } from '@trabeate/contracts';
import type { Db } from '../db/db';

type Q = Db | Knex.Transaction;

export interface DeliverableRow {
  id: string;
  project_id: string;
  stage_key: StageKey;
  file_name: string;
  version: number;
  object_key: string;
  size_bytes: string;
  sha256: string;
  content_type: string;
  uploaded_by: string;
  uploader_name: string;
  uploaded_at: Date;
}

function deliverablesQuery(db: Q) {
  return db('deliverables as d')
    .join('users as u', 'u.id', 'd.uploaded_by')
    .select(
      'd.id',
      'd.project_id',
      'd.stage_key',
      'd.file_name',
      'd.version',
      'd.object_key',
      'd.size_bytes',
      'd.sha256',
      'd.content_type',
      'd.uploaded_by',
      'u.display_name as uploader_name',
      'd.uploaded_at',
    );
}

/** A stage's files, every version, newest version of each name first. */
export async function listDeliverables(db: Q, projectId: string, key: StageKey): Promise<DeliverableRow[]> {
  return deliverablesQuery(db)
    .where({ 'd.project_id': projectId, 'd.stage_key': key })
    .orderByRaw('lower(d.file_name) asc, d.version desc');
}

export async function getDeliverable(db: Q, projectId: string, id: string): Promise<DeliverableRow | undefined> {
  return deliverablesQuery(db).where({ 'd.project_id': projectId, 'd.id': id }).first();
}

/** The version the next file of this name gets (names compare without case, as people read them). */
export async function nextVersion(
  trx: Knex.Transaction,
  projectId: string,
  key: StageKey,
  fileName: string,
): Promise<number> {
  const row = await trx('deliverables')
    .where({ project_id: projectId, stage_key: key })
    .whereRaw('lower(file_name) = lower(?)', [fileName])
    .max<{ v: number | null }>('version as v')
    .first();
  return (row?.v ?? 0) + 1;
}

export async function insertDeliverable(trx: Knex.Transaction, row: Record<string, unknown>): Promise<string> {
  const [{ id }] = await trx('deliverables').insert(row).returning('id');
  return id;
}
