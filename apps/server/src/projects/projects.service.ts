import type { Knex } from 'knex';
import {
  projectDesignBasisSchema,
  STAGE_TITLES,
  type ProjectCreate,
  type ProjectDetail,
  type ProjectListItem,
  type ProjectPage,
  type ProjectUpdate,
  type StageKey,
  type StageState,
} from '@trabeate/contracts';
import type { Db } from '../db/db';
import { HttpError } from '../core/errors';
import { abilities, type Caller } from '../access/policy';
import { insertActivity } from '../activity/activity.repository';
import { insertStages, listStages } from '../stages/stages.repository';
import { stageOf } from '../stages/stages.service';
import { getProject, lockProject, projectColumns, type ListRow, type ProjectRow } from './projects.repository';

const FIELD_LABELS: Record<string, string> = {
  reference: 'reference',
  name: 'name',
  clientOrganisationId: 'client organisation',
  siteAddress: 'site address',
  buildingUse: 'building use',
  storeys: 'storeys',
  storeyHeightM: 'storey height',
  floorAreaM2: 'floor area',
  estimatedCost: 'estimated cost',
  currency: 'currency',
  designBasis: 'design basis',
};

export const listItemOf = (r: ListRow): ProjectListItem => ({
  id: r.id,
  reference: r.reference,
  name: r.name,
  clientOrganisation: { id: r.client_organisation_id, name: r.org_name },
  siteAddress: r.site_address,
  storeys: r.storeys,
  archived: r.archived_at !== null,
  updatedAt: new Date(r.updated_at).toISOString(),
  currentStage: r.current_key
    ? {
        key: r.current_key as StageKey,
        title: STAGE_TITLES[r.current_key as StageKey],
        state: r.current_state as StageState,
      }
    : null,
  lateStages: r.late_stages,
});

/**
 * Two independent reads: side by side on the pool (a read request waits for the slower one, not
 * both), one after the other inside a transaction, whose single connection runs one query at a time.
 */
async function together<A, B>(db: Db | Knex.Transaction, a: () => Promise<A>, b: () => Promise<B>): Promise<[A, B]> {
  if ('isTransaction' in db && db.isTransaction) return [await a(), await b()];
  return Promise.all([a(), b()]);
}

/** The short form of a project (facts, team, finance when the caller may see money, abilities). */
export async function projectDetail(
  db: Db | Knex.Transaction,
  caller: Caller,
  id: string,
): Promise<ProjectDetail & { row: ProjectRow }> {
  const [row, members] = await together(
    db,
    () => getProject(db, caller.firmId, id),
    (): Promise<Array<{ id: string; display_name: string; firm_role: 'principal' | 'engineer' | null }>> =>
      db('project_members as m')
        .join('users as u', 'u.id', 'm.user_id')
        .where('m.project_id', id)
        .whereNull('u.disabled_at')
        .orderBy('u.display_name')
        .select('u.id', 'u.display_name', 'u.firm_role'),
  );
  const can = abilities(caller.role);
  return {
    row,
    id: row.id,
    reference: row.reference,
    name: row.name,
    clientOrganisation: { id: row.client_organisation_id, name: row.org_name },
    siteAddress: row.site_address,
    buildingUse: row.building_use,
    storeys: row.storeys,
    storeyHeightM: Number(row.storey_height_m),
    floorAreaM2: row.floor_area_m2 === null ? null : Number(row.floor_area_m2),
    members: members.map((m) => ({ id: m.id, displayName: m.display_name, role: m.firm_role ?? 'client' })),
    finance: can.seeFinance
      ? {
          estimatedCost: row.estimated_cost === null ? null : Number(row.estimated_cost),
          currency: row.currency.trim(),
        }
      : null,
    abilities: can,
  };
}

/** Everything the project page shows, for this caller: the short form plus design basis and stages. */
export async function projectPage(db: Db | Knex.Transaction, caller: Caller, id: string): Promise<ProjectPage> {
  const [{ row, ...detail }, stages] = await together(
    db,
    () => projectDetail(db, caller, id),
    () => listStages(db, id),
  );
  const basis = projectDesignBasisSchema.safeParse(row.design_basis);
  const archived = row.archived_at !== null;
  // The unit rates are the firm's own prices, not the client's to see.
  const designBasis = !basis.success
    ? null
    : detail.abilities.seeInternal
      ? basis.data
      : { ...basis.data, rates: undefined };
  return {
    ...detail,
    designBasis,
    currency: row.currency.trim(),
    archivedAt: row.archived_at ? new Date(row.archived_at).toISOString() : null,
    stages: stages.map((s) => stageOf(s, caller, archived)),
    // An archived project is read-only for everyone until the principal restores it.
    abilities: archived ? { ...detail.abilities, work: false } : detail.abilities,
  };
}

async function checkClientOrganisation(trx: Knex.Transaction, caller: Caller, id: string): Promise<void> {
  const org = await trx('client_organisations').where({ id, firm_id: caller.firmId }).first('id');
  if (!org)
    throw new HttpError(400, 'validation_failed', 'No client organisation with this id.', {
      'body.clientOrganisationId': ['unknown client organisation'],
    });
}

const UNIQUE_REFERENCE = 'projects_firm_id_reference_unique';

function duplicateReference(err: unknown, reference: string | undefined): never {
  const e = err as { code?: string; constraint?: string };
  if (e.code === '23505' && e.constraint === UNIQUE_REFERENCE) {
    throw new HttpError(409, 'conflict', `Another project already uses the reference ${reference}.`, {
      'body.reference': ['already used by another project of the firm'],
    });
  }
  throw err;
}

/** Creates a project with its six stages (principal). */
export async function createProject(db: Db, caller: Caller, input: ProjectCreate): Promise<ProjectPage> {
  try {
    return await db.transaction(async (trx) => {
      await checkClientOrganisation(trx, caller, input.clientOrganisationId);
      const [{ id }] = await trx('projects')
        .insert({ ...projectColumns(input), firm_id: caller.firmId, created_by: caller.userId })
        .returning('id');
      await insertStages(trx, id);
      await insertActivity(trx, {
        firmId: caller.firmId,
        projectId: id,
        actorId: caller.userId,
        action: 'project.created',
        objectType: 'project',
        objectId: id,
        summary: `${caller.displayName} created the project ${input.reference} ${input.name}`,
      });
      return projectPage(trx, caller, id);
    });
  } catch (err) {
    duplicateReference(err, input.reference);
  }
}

/** Changes any of a project's fields (principal); records which fields changed. */
export async function updateProject(db: Db, caller: Caller, id: string, patch: ProjectUpdate): Promise<ProjectPage> {
  try {
    return await db.transaction(async (trx) => {
      const project = await lockProject(trx, id);
      if (project.archived_at)
        throw new HttpError(409, 'conflict', 'This project is archived; restore it before editing it.');
      if (patch.clientOrganisationId) await checkClientOrganisation(trx, caller, patch.clientOrganisationId);
      const before = await getProject(trx, caller.firmId, id);
      const columns = projectColumns(patch);
      const changed = Object.keys(patch).filter((k) => {
        const col = Object.keys(projectColumns({ [k]: (patch as Record<string, unknown>)[k] }))[0];
        if (!col) return false;
        const was = (before as unknown as Record<string, unknown>)[col];
        const now = columns[col];
        return JSON.stringify(normalise(was)) !== JSON.stringify(normalise(now));
      });
      if (!changed.length) return projectPage(trx, caller, id);
      await trx('projects')
        .where({ id })
        .update({ ...columns, updated_at: trx.fn.now() });
      if (patch.clientOrganisationId && patch.clientOrganisationId !== before.client_organisation_id) {
        // The old organisation's contacts lose a project that is no longer theirs.
        await trx('project_members')
          .where({ project_id: id })
          .whereIn('user_id', trx('users').whereNotNull('client_organisation_id').select('id'))
          .del();
      }
      await insertActivity(trx, {
        firmId: caller.firmId,
        projectId: id,
        actorId: caller.userId,
        action: 'project.updated',
        objectType: 'project',
        objectId: id,
        summary: `${caller.displayName} changed the ${changed.map((k) => FIELD_LABELS[k] ?? k).join(', ')}`,
        details: { fields: changed },
      });
      return projectPage(trx, caller, id);
    });
  } catch (err) {
    duplicateReference(err, patch.reference);
  }
}

function normalise(v: unknown): unknown {
  if (typeof v === 'string' && /^\{/.test(v)) return JSON.parse(v);
  if (typeof v === 'string' && /^-?\d+(\.\d+)?$/.test(v)) return Number(v);
  if (typeof v === 'string') return v.trim();
  return v;
}

/** Archives or restores a project (principal). Projects are never deleted. */
export async function setArchived(db: Db, caller: Caller, id: string, archive: boolean): Promise<ProjectPage> {
  return db.transaction(async (trx) => {
    const project = await lockProject(trx, id);
    if (Boolean(project.archived_at) === archive) {
      throw new HttpError(
        409,
        'conflict',
        archive ? 'This project is already archived.' : 'This project is not archived.',
      );
    }
    await trx('projects')
      .where({ id })
      .update({ archived_at: archive ? trx.fn.now() : null, updated_at: trx.fn.now() });
    await insertActivity(trx, {
      firmId: caller.firmId,
      projectId: id,
      actorId: caller.userId,
      action: archive ? 'project.archived' : 'project.restored',
      objectType: 'project',
      objectId: id,
      summary: `${caller.displayName} ${archive ? 'archived' : 'restored'} the project`,
    });
    return projectPage(trx, caller, id);
  });
}
