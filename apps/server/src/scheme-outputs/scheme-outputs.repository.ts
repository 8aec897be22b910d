import type { Knex } from 'knex';
import type { Db } from '../db/db';

// All Knex code of scheme outputs (reports and the facts a sheet's title panel needs).
type Q = Db | Knex.Transaction;

export interface ReportRow {
  id: string;
  firm_id: string;
  project_id: string;
  scheme_id: string;
  scheme_version: number;
  state: 'queued' | 'running' | 'done' | 'failed';
  sections_done: number;
  sections_total: number;
  stage_key: string | null;
  deliverable_id: string | null;
  object_key: string | null;
  size_bytes: string | null;
  pages: number | null;
  failure: string | null;
  requested_by: string;
  requested_at: Date;
  finished_at: Date | null;
}

export interface VersionFacts {
  scheme_name: string;
  project_reference: string;
  project_name: string;
  firm_name: string;
  /** The firm's date language: outputs print their dates in it. */
  date_locale: string;
  time_zone: string;
  document: unknown;
  results: unknown;
  engine_version: string;
  saved_at: Date;
  saved_by: string | null;
}

/** One saved version with the names its outputs print; undefined when the scheme or version is not this project's. */
export async function versionFacts(
  db: Q,
  projectId: string,
  schemeId: string,
  version: number,
): Promise<VersionFacts | undefined> {
  return db('scheme_versions as v')
    .join('schemes as s', 's.id', 'v.scheme_id')
    .join('projects as p', 'p.id', 's.project_id')
    .join('firms as f', 'f.id', 'p.firm_id')
    .leftJoin('users as u', 'u.id', 'v.author_id')
    .where({ 's.project_id': projectId, 's.id': schemeId, 'v.version': version })
    .first(
      's.name as scheme_name',
      'p.reference as project_reference',
      'p.name as project_name',
      'f.name as firm_name',
      'f.date_locale',
      'f.time_zone',
      'v.document',
      'v.results',
      'v.engine_version',
      'v.created_at as saved_at',
      'u.display_name as saved_by',
    );
}

export async function insertReport(trx: Q, row: Partial<ReportRow>): Promise<ReportRow> {
  const [r] = await trx('scheme_reports').insert(row).returning('*');
  return r;
}

export async function getReport(db: Q, projectId: string, id: string): Promise<ReportRow | undefined> {
  return db('scheme_reports').where({ project_id: projectId, id }).first();
}

export async function reportById(db: Q, id: string): Promise<ReportRow | undefined> {
  return db('scheme_reports').where({ id }).first();
}

export async function updateReport(
  db: Q,
  id: string,
  change: Partial<Omit<ReportRow, 'size_bytes' | 'finished_at'>> & { size_bytes?: number; finished_at?: unknown },
): Promise<void> {
  await db('scheme_reports').where({ id }).update(change);
}

export async function userRow(db: Q, id: string) {
  return db('users')
    .where({ id })
    .first('id', 'firm_id', 'email', 'display_name', 'firm_role', 'client_organisation_id');
}
