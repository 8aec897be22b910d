import type { Knex } from 'knex';
import type { SchemeDocument } from '@trabeate/contracts';
import type { Analysis } from './scheme-document';

// All Knex code of schemes. Rows come back as the database has them; the service maps them.
type Q = Knex | Knex.Transaction;

export interface SchemeRow {
  id: string;
  firm_id: string;
  project_id: string;
  name: string;
  current_version: number;
  archived_at: Date | null;
  created_at: Date;
  updated_at: Date;
}

export interface VersionRow {
  scheme_id: string;
  version: number;
  schema_version: number;
  author_id: string | null;
  author_name: string | null;
  created_at: Date;
  restored_from: number | null;
  engine_version: string;
  results_ok: boolean;
  error_count: number;
  warning_count: number;
}

const versionColumns = [
  'v.scheme_id',
  'v.version',
  'v.schema_version',
  'v.author_id',
  'u.display_name as author_name',
  'v.created_at',
  'v.restored_from',
  'v.engine_version',
  'v.results_ok',
  'v.error_count',
  'v.warning_count',
];

export async function findScheme(db: Q, projectId: string, schemeId: string): Promise<SchemeRow | undefined> {
  return db('schemes').where({ id: schemeId, project_id: projectId }).first();
}

/** The scheme row, locked for the transaction: saves, renames and archiving take turns. */
export async function lockScheme(trx: Knex.Transaction, projectId: string, schemeId: string) {
  return trx('schemes').where({ id: schemeId, project_id: projectId }).forUpdate().first<SchemeRow | undefined>();
}

export async function insertScheme(
  trx: Knex.Transaction,
  row: { id: string; firm_id: string; project_id: string; name: string; created_by: string },
): Promise<void> {
  await trx('schemes').insert({ ...row, current_version: 1 });
}

export async function insertVersion(
  trx: Knex.Transaction,
  v: {
    schemeId: string;
    version: number;
    document: SchemeDocument;
    authorId: string;
    restoredFrom?: number;
    analysis: Analysis;
  },
): Promise<void> {
  await trx('scheme_versions').insert({
    scheme_id: v.schemeId,
    version: v.version,
    schema_version: v.document.schemaVersion,
    document: JSON.stringify(v.document),
    author_id: v.authorId,
    restored_from: v.restoredFrom ?? null,
    results: JSON.stringify(v.analysis.results),
    engine_version: v.analysis.engineVersion,
    results_ok: v.analysis.ok,
    error_count: v.analysis.errors,
    warning_count: v.analysis.warnings,
  });
}

export async function setCurrentVersion(trx: Knex.Transaction, schemeId: string, version: number): Promise<void> {
  await trx('schemes').where({ id: schemeId }).update({ current_version: version, updated_at: trx.fn.now() });
}

export async function updateScheme(
  trx: Knex.Transaction,
  schemeId: string,
  change: { name?: string; archived_at?: Date | null },
): Promise<void> {
  await trx('schemes')
    .where({ id: schemeId })
    .update({ ...change, updated_at: trx.fn.now() });
}

export async function getVersion(db: Q, schemeId: string, version: number): Promise<VersionRow | undefined> {
  return db('scheme_versions as v')
    .leftJoin('users as u', 'u.id', 'v.author_id')
    .where({ 'v.scheme_id': schemeId, 'v.version': version })
    .first(versionColumns);
}

export async function getVersionDocument(
  db: Q,
  schemeId: string,
  version: number,
): Promise<{ document: unknown; results: unknown } | undefined> {
  return db('scheme_versions').where({ scheme_id: schemeId, version }).first('document', 'results');
}

export async function listVersions(
  db: Q,
  schemeId: string,
  page: { page: number; pageSize: number },
): Promise<{ rows: VersionRow[]; total: number }> {
  const [{ n }] = await db('scheme_versions').where({ scheme_id: schemeId }).count<{ n: string }[]>('* as n');
  const rows = await db('scheme_versions as v')
    .leftJoin('users as u', 'u.id', 'v.author_id')
    .where('v.scheme_id', schemeId)
    .orderBy('v.version', 'desc')
    .limit(page.pageSize)
    .offset((page.page - 1) * page.pageSize)
    .select(versionColumns);
  return { rows, total: Number(n) };
}

export type ListRow = SchemeRow & VersionRow & { column_count: number };

const SORTS = { name: 's.name', updatedAt: 's.updated_at', createdAt: 's.created_at' } as const;

export async function listSchemes(
  db: Q,
  projectId: string,
  q: { page: number; pageSize: number; sort: keyof typeof SORTS; direction: 'asc' | 'desc'; status: string },
): Promise<{ rows: ListRow[]; total: number }> {
  const base = db('schemes as s').where('s.project_id', projectId);
  if (q.status === 'active') base.whereNull('s.archived_at');
  if (q.status === 'archived') base.whereNotNull('s.archived_at');
  const [{ n }] = await base.clone().count<{ n: string }[]>('* as n');
  // Both parts come from fixed lists (the query schema allows nothing else).
  const order = `${q.sort === 'name' ? 'lower(s.name)' : SORTS[q.sort]} ${q.direction === 'asc' ? 'asc' : 'desc'}`;
  const rows = await base
    .join('scheme_versions as v', (j) => j.on('v.scheme_id', 's.id').andOn('v.version', 's.current_version'))
    .leftJoin('users as u', 'u.id', 'v.author_id')
    .orderByRaw(order)
    .orderBy('s.id')
    .limit(q.pageSize)
    .offset((q.page - 1) * q.pageSize)
    .select('s.*', ...versionColumns, db.raw(`jsonb_array_length(v.document -> 'columns') as column_count`));
  return { rows, total: Number(n) };
}
