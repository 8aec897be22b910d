import type { Knex } from 'knex';
import type { z } from 'zod';
import type { ProjectCreate, projectListQuerySchema } from '@trabeate/contracts';
import type { Db } from '../db/db';
import type { Caller } from '../access/policy';
import { notFound } from '../core/errors';
import { LATE_SQL } from '../stages/stages.repository';

type Q = Db | Knex.Transaction;

export interface ProjectRow {
  id: string;
  firm_id: string;
  reference: string;
  name: string;
  client_organisation_id: string;
  org_name: string;
  site_address: string;
  building_use: string;
  storeys: number;
  storey_height_m: string;
  floor_area_m2: string | null;
  estimated_cost: string | null;
  currency: string;
  design_basis: unknown;
  archived_at: Date | null;
  updated_at: Date;
}

export function projectsQuery(db: Q, firmId: string) {
  return db('projects as p')
    .join('client_organisations as o', 'o.id', 'p.client_organisation_id')
    .where('p.firm_id', firmId)
    .select(
      'p.id',
      'p.firm_id',
      'p.reference',
      'p.name',
      'p.client_organisation_id',
      'o.name as org_name',
      'p.site_address',
      'p.building_use',
      'p.storeys',
      'p.storey_height_m',
      'p.floor_area_m2',
      'p.estimated_cost',
      'p.currency',
      'p.design_basis',
      'p.archived_at',
      'p.updated_at',
    );
}

/** Limits a project query to what the caller may see (the same rule as canSeeProject in access/policy.ts). */
export function visibleTo<Q extends Knex.QueryBuilder>(q: Q, caller: Caller): Q {
  if (caller.role === 'principal') return q;
  q.whereExists((sub) =>
    sub
      .select(sub.client.raw('1'))
      .from('project_members as m')
      .whereRaw('m.project_id = p.id')
      .andWhere('m.user_id', caller.userId),
  );
  if (caller.role === 'client') q.andWhere('p.client_organisation_id', caller.clientOrganisationId);
  return q;
}

export async function getProject(db: Q, firmId: string, id: string): Promise<ProjectRow> {
  const row: ProjectRow | undefined = await projectsQuery(db, firmId).andWhere('p.id', id).first();
  if (!row) throw notFound('No project with this id.');
  return row;
}

export interface ProjectContext {
  id: string;
  firm_id: string;
  name: string;
  reference: string;
  client_organisation_id: string;
  archived_at: Date | null;
  firm_name: string;
  /** The firm's date language (mails and PDFs write dates in it). */
  date_locale: string;
  time_zone: string;
}

/** Locks the project row for the transaction (edits, archiving and stage moves take turns). */
export async function lockProject(trx: Knex.Transaction, id: string): Promise<ProjectContext> {
  const row: ProjectContext | undefined = await trx('projects as p')
    .join('firms as f', 'f.id', 'p.firm_id')
    .where('p.id', id)
    .forUpdate('p')
    .first(
      'p.id',
      'p.firm_id',
      'p.name',
      'p.reference',
      'p.client_organisation_id',
      'p.archived_at',
      'f.name as firm_name',
      'f.date_locale',
      'f.time_zone',
    );
  if (!row) throw notFound('No project with this id.');
  return row;
}

export const SORT_COLUMNS: Record<ProjectListFilters['sort'], string> = {
  reference: 'p.reference',
  name: 'p.name',
  client: 'o.name',
  updatedAt: 'p.updated_at',
  storeys: 'p.storeys',
};

/** The same sort, by the column names the page of rows carries. */
const PAGE_SORT_COLUMNS: Record<ProjectListFilters['sort'], string> = {
  reference: 'reference',
  name: 'name',
  client: 'org_name',
  updatedAt: 'updated_at',
  storeys: 'storeys',
};

export interface ListRow extends Pick<
  ProjectRow,
  | 'id'
  | 'reference'
  | 'name'
  | 'client_organisation_id'
  | 'org_name'
  | 'site_address'
  | 'storeys'
  | 'archived_at'
  | 'updated_at'
> {
  current_key: string | null;
  current_state: string | null;
  late_stages: number;
}

export type ProjectListFilters = z.output<typeof projectListQuerySchema>;

/** One page of the projects the caller may see, sorted and filtered in the database. */
export async function listProjects(
  db: Db,
  caller: Caller,
  f: ProjectListFilters,
): Promise<{ rows: ListRow[]; total: number }> {
  // Only what a list item shows (not the design basis and other page fields): every matching row
  // is carried through the sort and the count, not only the page.
  const base = visibleTo(
    db('projects as p')
      .join('client_organisations as o', 'o.id', 'p.client_organisation_id')
      .where('p.firm_id', caller.firmId)
      .select(
        'p.id',
        'p.reference',
        'p.name',
        'p.client_organisation_id',
        'o.name as org_name',
        'p.site_address',
        'p.storeys',
        'p.archived_at',
        'p.updated_at',
      ),
    caller,
  );
  if (f.status === 'active') base.whereNull('p.archived_at');
  if (f.status === 'archived') base.whereNotNull('p.archived_at');
  if (f.clientOrganisationId) base.andWhere('p.client_organisation_id', f.clientOrganisationId);
  if (f.q) {
    const like = `%${f.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    base.andWhere((w) =>
      w
        .whereILike('p.reference', like)
        .orWhereILike('p.name', like)
        .orWhereILike('p.site_address', like)
        .orWhereILike('o.name', like),
    );
  }
  // One round trip: the page (which stops reading once it has its rows, in the index's order when
  // sorted by date), the total of the filtered set beside it as a count of its own (a window count
  // made PostgreSQL carry every matching row), and each of the page's projects' stage summary in
  // one pass over that project's six stages.
  const total = base.clone().clearSelect().count('*');
  const page = base
    .clone()
    .select(db.raw('(?) as total_count', [total]))
    .orderBy([
      { column: SORT_COLUMNS[f.sort], order: f.direction },
      { column: 'p.id', order: 'asc' },
    ])
    .limit(f.pageSize)
    .offset((f.page - 1) * f.pageSize);
  const rows: Array<ListRow & { total_count: string }> = await db
    .with('page', page)
    .from('page')
    .joinRaw(
      `cross join lateral (
         select (array_agg(s.key order by s.position))[1] as current_key,
                (array_agg(s.state order by s.position))[1] as current_state,
                (count(*) filter (where ${LATE_SQL('s', '?')}))::int as late_stages
         from stages s where s.project_id = page.id and s.state <> 'approved') st`,
      [caller.firmId], // every listed project is the caller's firm's
    )
    .select('page.*', 'st.current_key', 'st.current_state', 'st.late_stages')
    .orderBy([
      { column: `page.${PAGE_SORT_COLUMNS[f.sort]}`, order: f.direction },
      { column: 'page.id', order: 'asc' },
    ]);
  if (rows.length) return { rows, total: Number(rows[0].total_count) };
  // Past the last page (or nothing matches): the count alone.
  const [{ n }] = f.page > 1 ? await base.clone().clearSelect().count<{ n: string }[]>('* as n') : [{ n: '0' }];
  return { rows: [], total: Number(n) };
}

/** The columns a project write sets, from the shared contract's field names. */
export function projectColumns(input: Partial<ProjectCreate>): Record<string, unknown> {
  const map: Record<string, unknown> = {
    reference: input.reference,
    name: input.name,
    client_organisation_id: input.clientOrganisationId,
    site_address: input.siteAddress,
    building_use: input.buildingUse,
    storeys: input.storeys,
    storey_height_m: input.storeyHeightM,
    floor_area_m2: input.floorAreaM2,
    estimated_cost: input.estimatedCost,
    currency: input.currency,
    design_basis: input.designBasis === undefined ? undefined : JSON.stringify(input.designBasis),
  };
  return Object.fromEntries(Object.entries(map).filter(([, v]) => v !== undefined));
}
