import type { Knex } from 'knex';
import type { z } from 'zod';
import type {
  drawingListQuerySchema,
  Purpose,
  RevisionScheme,
  RevisionSeries,
  RevisionState,
  SheetSize,
  StageKey,
} from '@trabeate/contracts';
import type { Db } from '../db/db';

type Q = Db | Knex.Transaction;

export type DrawingListFilters = z.output<typeof drawingListQuerySchema>;

/** What a client contact may see of the register: revisions that have gone out. */
export const OUT_STATES = ['issued', 'superseded'] as const;
export const OPEN_STATES = ['draft', 'checked', 'approved'] as const;

export interface SettingsRow {
  revision_scheme: RevisionScheme;
  number_pattern: string;
}

export async function getSettings(db: Q, firmId: string): Promise<SettingsRow> {
  const row = await db('drawing_settings').where({ firm_id: firmId }).first('revision_scheme', 'number_pattern');
  return row ?? { revision_scheme: 'iso19650', number_pattern: 'S-{seq:3}' };
}

export async function putSettings(db: Q, firmId: string, s: SettingsRow): Promise<void> {
  await db('drawing_settings')
    .insert({ firm_id: firmId, ...s })
    .onConflict('firm_id')
    .merge({ ...s, updated_at: db.fn.now() });
}

export interface DrawingRow {
  id: string;
  project_id: string;
  number: string;
  title: string;
  stage_key: StageKey;
  sheet_size: SheetSize;
  scale: string;
  r_id: string | null;
  r_code: string | null;
  r_suitability: string | null;
  r_state: RevisionState | null;
  r_date: string | null;
  r_issued_at: Date | null;
  revision_count: number;
}

const SORTS: Record<DrawingListFilters['sort'], string> = {
  number: 'lower(d.number)',
  title: 'lower(d.title)',
  stage: 's.position',
  revision: 'r.seq',
  date: 'r.revision_date',
};

/**
 * The register with each drawing's current revision: the newest one, or for a client contact the
 * newest that went out (drawings with none are not theirs to see). Each drawing points at both
 * (current_revision_id, out_revision_id), kept by triggers on drawing_revisions, so this is a
 * plain join rather than a search for every drawing's newest revision.
 */
function registerQuery(db: Q, projectId: string, outOnly: boolean) {
  const visible = outOnly ? `and x.state in ('issued', 'superseded')` : '';
  const pointer = outOnly ? 'd.out_revision_id' : 'd.current_revision_id';
  return db('drawings as d')
    .join('stages as s', function () {
      this.on('s.project_id', 'd.project_id').andOn('s.key', 'd.stage_key');
    })
    .leftJoin('drawing_revisions as r', 'r.id', pointer)
    .where('d.project_id', projectId)
    .modify((q) => {
      if (outOnly) q.whereNotNull('d.out_revision_id');
    })
    .select(
      'd.id',
      'd.project_id',
      'd.number',
      'd.title',
      'd.stage_key',
      'd.sheet_size',
      'd.scale',
      'r.id as r_id',
      'r.code as r_code',
      'r.suitability as r_suitability',
      'r.state as r_state',
      db.raw(`to_char(r.revision_date, 'YYYY-MM-DD') as r_date`),
      'r.issued_at as r_issued_at',
      // Kept as a select-list subquery on purpose: PostgreSQL evaluates it only for the rows the
      // page returns (after sort and limit).
      db.raw(`(select count(*)::int from drawing_revisions x where x.drawing_id = d.id ${visible}) as revision_count`),
    );
}

function applyFilters(q: Knex.QueryBuilder, f: Partial<DrawingListFilters>): Knex.QueryBuilder {
  if (f.q) {
    const like = `%${f.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    q.where((w) => w.whereILike('d.number', like).orWhereILike('d.title', like));
  }
  if (f.stageKey) q.where('d.stage_key', f.stageKey);
  if (f.state) q.where('r.state', f.state);
  if (f.suitability) q.where('r.suitability', f.suitability);
  return q;
}

export async function listRegister(
  db: Q,
  projectId: string,
  outOnly: boolean,
  f: DrawingListFilters,
): Promise<{ rows: DrawingRow[]; total: number }> {
  // The page and the count apart: a count(*) over () on the page made PostgreSQL join every
  // drawing to its revision before the limit. Counted on its own, the revision join drops out when
  // no filter reads it (a left join on its primary key), and the page stops after pageSize rows
  // read in the order of drawings_register_order.
  const rows = (await applyFilters(registerQuery(db, projectId, outOnly), f)
    .orderByRaw(`${SORTS[f.sort]} ${f.direction} nulls last, lower(d.number) asc, d.id`)
    .limit(f.pageSize)
    .offset((f.page - 1) * f.pageSize)) as DrawingRow[];
  const matching = applyFilters(registerQuery(db, projectId, outOnly), f)
    .clearSelect()
    .select(db.raw('1'))
    .as('m');
  const [{ n }] = await db.from(matching).count<Array<{ n: string }>>('* as n');
  return { rows, total: Number(n) };
}

/** Every row of the register that matches (for the exports), in the register's order. */
export async function allRegister(
  db: Q,
  projectId: string,
  outOnly: boolean,
  f: Partial<DrawingListFilters> & Pick<DrawingListFilters, 'sort' | 'direction'>,
): Promise<DrawingRow[]> {
  return applyFilters(registerQuery(db, projectId, outOnly), f).orderByRaw(
    `${SORTS[f.sort]} ${f.direction} nulls last, lower(d.number) asc, d.id`,
  );
}

export async function getDrawingRow(
  db: Q,
  projectId: string,
  id: string,
  outOnly: boolean,
): Promise<DrawingRow | undefined> {
  return registerQuery(db, projectId, outOnly).where('d.id', id).first();
}

export async function drawingNumbers(db: Q, projectId: string): Promise<string[]> {
  return (await db('drawings').where({ project_id: projectId }).select('number')).map(
    (r: { number: string }) => r.number,
  );
}

export async function insertDrawing(trx: Knex.Transaction, row: Record<string, unknown>): Promise<string> {
  const [{ id }] = await trx('drawings').insert(row).returning('id');
  return id;
}

export async function lockDrawing(trx: Knex.Transaction, projectId: string, id: string) {
  return trx('drawings')
    .where({ project_id: projectId, id })
    .forUpdate()
    .first<{ id: string; number: string; title: string } | undefined>('id', 'number', 'title');
}

export interface RevisionRow {
  id: string;
  drawing_id: string;
  project_id: string;
  seq: number;
  series: RevisionSeries;
  code: string;
  suitability: string;
  purpose: Purpose;
  description: string;
  revision_date: string;
  state: RevisionState;
  drawn_by: string;
  drawn_name: string;
  checked_by: string | null;
  checked_name: string | null;
  approved_by: string | null;
  approved_name: string | null;
  issued_at: Date | null;
  scheme_id: string | null;
  scheme_name: string | null;
  scheme_version: number | null;
}

export function revisionsQuery(db: Q) {
  return db('drawing_revisions as r')
    .join('users as dn', 'dn.id', 'r.drawn_by')
    .leftJoin('users as ck', 'ck.id', 'r.checked_by')
    .leftJoin('users as ap', 'ap.id', 'r.approved_by')
    .leftJoin('schemes as sc', 'sc.id', 'r.scheme_id')
    .select(
      'r.id',
      'r.drawing_id',
      'r.project_id',
      'r.seq',
      'r.series',
      'r.code',
      'r.suitability',
      'r.purpose',
      'r.description',
      db.raw(`to_char(r.revision_date, 'YYYY-MM-DD') as revision_date`),
      'r.state',
      'r.drawn_by',
      'dn.display_name as drawn_name',
      'r.checked_by',
      'ck.display_name as checked_name',
      'r.approved_by',
      'ap.display_name as approved_name',
      'r.issued_at',
      'r.scheme_id',
      'sc.name as scheme_name',
      'r.scheme_version',
    );
}

export async function revisionsOf(db: Q, drawingId: string, outOnly: boolean): Promise<RevisionRow[]> {
  return revisionsQuery(db)
    .where('r.drawing_id', drawingId)
    .modify((q) => {
      if (outOnly) q.whereIn('r.state', OUT_STATES);
    })
    .orderBy('r.seq', 'desc');
}

export async function getRevision(db: Q, projectId: string, id: string): Promise<RevisionRow | undefined> {
  return revisionsQuery(db).where({ 'r.project_id': projectId, 'r.id': id }).first();
}

export async function lockRevision(trx: Knex.Transaction, projectId: string, id: string) {
  return trx('drawing_revisions')
    .where({ project_id: projectId, id })
    .forUpdate()
    .first<
      | { id: string; drawing_id: string; code: string; state: RevisionState; drawn_by: string; series: RevisionSeries }
      | undefined
    >('id', 'drawing_id', 'code', 'state', 'drawn_by', 'series');
}

export interface RevisionFileRow {
  id: string;
  revision_id: string;
  project_id: string;
  role: 'pdf' | 'source';
  file_name: string;
  object_key: string;
  size_bytes: string;
  sha256: string;
  content_type: string;
  uploaded_at: Date;
}

export async function filesOf(db: Q, revisionIds: string[]): Promise<RevisionFileRow[]> {
  if (!revisionIds.length) return [];
  return db('revision_files')
    .whereIn('revision_id', revisionIds)
    .orderByRaw(`role = 'pdf' desc, lower(file_name), uploaded_at`);
}

export async function getFile(db: Q, projectId: string, revisionId: string, fileId: string) {
  return db('revision_files as f')
    .join('drawing_revisions as r', 'r.id', 'f.revision_id')
    .where({ 'f.project_id': projectId, 'f.revision_id': revisionId, 'f.id': fileId })
    .first<(RevisionFileRow & { state: RevisionState }) | undefined>('f.*', 'r.state');
}

export async function logDownload(
  db: Q,
  row: {
    project_id: string;
    what: 'file' | 'zip' | 'sheet';
    transmittal_id?: string | null;
    revision_file_id?: string | null;
    user_id?: string | null;
    recipient_id?: string | null;
    ip?: string | null;
  },
): Promise<void> {
  await db('drawing_downloads').insert(row);
}
