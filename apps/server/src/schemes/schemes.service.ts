import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import {
  projectDesignBasisSchema,
  type SchemeConflict,
  type SchemeDetail,
  type SchemeDocument,
  type SchemeList,
  type SchemeListItem,
  type SchemeVersion,
  type SchemeVersionList,
  type SchemeVersionSummary,
} from '@trabeate/contracts';
import type { Db } from '../db/db';
import { HttpError, notFound } from '../core/errors';
import { projectRefusal, type Caller } from '../access/policy';
import {
  findScheme,
  getVersion,
  getVersionDocument,
  insertScheme,
  insertVersion,
  listSchemes,
  listVersions,
  lockScheme,
  setCurrentVersion,
  updateScheme,
  type ListRow,
  type SchemeRow,
  type VersionRow,
} from './schemes.repository';
import { analyse, startingDocument, storedDocument, withIdentity } from './scheme-document';

const iso = (d: Date | string) => new Date(d).toISOString();
const missing = () => notFound('No scheme with this id in this project.');
const archivedProject = () =>
  new HttpError(409, 'conflict', 'This project is archived; restore it before changing it.');
const archivedScheme = () => new HttpError(409, 'conflict', 'This scheme is archived; restore it before changing it.');

export const canEditSchemes = (caller: Caller) => projectRefusal(caller.role, 'editSchemes') === null;

export const versionSummaryOf = (v: VersionRow): SchemeVersionSummary => ({
  version: v.version,
  savedAt: iso(v.created_at),
  savedBy: v.author_id ? { id: v.author_id, displayName: v.author_name ?? '' } : null,
  restoredFrom: v.restored_from,
  schemaVersion: v.schema_version,
  checks: { engineVersion: v.engine_version, ok: v.results_ok, errors: v.error_count, warnings: v.warning_count },
});

const listItemOf = (r: ListRow): SchemeListItem => ({
  id: r.id,
  name: r.name,
  version: r.current_version,
  archived: r.archived_at !== null,
  createdAt: iso(r.created_at),
  updatedAt: iso(r.updated_at),
  savedBy: versionSummaryOf(r).savedBy,
  columns: Number(r.column_count),
  checks: versionSummaryOf(r).checks,
});

/** The project, locked for the transaction, refusing changes while it is archived. */
async function openProject(trx: Knex.Transaction, projectId: string) {
  const project = await trx('projects')
    .where({ id: projectId })
    .forShare()
    .first('id', 'firm_id', 'storeys', 'storey_height_m', 'currency', 'design_basis', 'archived_at');
  if (!project) throw notFound('No project with this id.');
  if (project.archived_at) throw archivedProject();
  return project;
}

export async function schemeList(
  db: Db,
  caller: Caller,
  projectId: string,
  q: Parameters<typeof listSchemes>[2],
): Promise<SchemeList> {
  const { rows, total } = await listSchemes(db, projectId, q);
  return { items: rows.map(listItemOf), total, page: q.page, pageSize: q.pageSize, canEdit: canEditSchemes(caller) };
}

export async function schemeDetail(db: Db | Knex.Transaction, caller: Caller, projectId: string, schemeId: string) {
  const scheme = await findScheme(db, projectId, schemeId);
  if (!scheme) throw missing();
  return detailOf(db, caller, scheme);
}

async function detailOf(db: Db | Knex.Transaction, caller: Caller, scheme: SchemeRow): Promise<SchemeDetail> {
  const [version, stored] = await Promise.all([
    getVersion(db, scheme.id, scheme.current_version),
    getVersionDocument(db, scheme.id, scheme.current_version),
  ]);
  if (!version || !stored) throw new Error(`scheme ${scheme.id} has no version ${scheme.current_version}`);
  return {
    id: scheme.id,
    projectId: scheme.project_id,
    name: scheme.name,
    archivedAt: scheme.archived_at ? iso(scheme.archived_at) : null,
    createdAt: iso(scheme.created_at),
    canEdit: canEditSchemes(caller),
    current: versionSummaryOf(version),
    // A rename does not make a save, so the document takes the scheme's name on the way out.
    document: withIdentity(storedDocument(stored.document), scheme.id, scheme.name),
  };
}

/** Creates a scheme with its first save (version 1) from a document, inside the caller's transaction. */
export async function insertNewScheme(
  trx: Knex.Transaction,
  s: {
    /** a fixed id (the demo seed's); a new one otherwise */
    id?: string;
    firmId: string;
    projectId: string;
    name: string;
    authorId: string;
    document: (id: string) => SchemeDocument;
  },
): Promise<string> {
  const id = s.id ?? randomUUID();
  const document = withIdentity(s.document(id), id, s.name);
  const analysis = analyse(document);
  await insertScheme(trx, { id, firm_id: s.firmId, project_id: s.projectId, name: s.name, created_by: s.authorId });
  await insertVersion(trx, { schemeId: id, version: 1, document, authorId: s.authorId, analysis });
  return id;
}

/** A new scheme from the project's design basis (engineers on the project). */
export async function createScheme(db: Db, caller: Caller, projectId: string, name: string): Promise<SchemeDetail> {
  return db.transaction(async (trx) => {
    const project = await openProject(trx, projectId);
    const basis = projectDesignBasisSchema.safeParse(project.design_basis);
    if (!basis.success)
      throw new HttpError(409, 'conflict', "Set the project's design basis before creating a scheme from it.");
    const id = await insertNewScheme(trx, {
      firmId: project.firm_id,
      projectId,
      name,
      authorId: caller.userId,
      document: (sid) =>
        startingDocument(
          {
            storeys: project.storeys,
            storeyHeightM: Number(project.storey_height_m),
            currency: String(project.currency).trim(),
            designBasis: basis.data,
          },
          sid,
          name,
        ),
    });
    return schemeDetail(trx, caller, projectId, id);
  });
}

/** A new scheme holding a copy of this scheme's latest save; its history starts afresh. */
export async function duplicateScheme(
  db: Db,
  caller: Caller,
  projectId: string,
  schemeId: string,
  name: string | undefined,
): Promise<SchemeDetail> {
  return db.transaction(async (trx) => {
    const project = await openProject(trx, projectId);
    const source = await findScheme(trx, projectId, schemeId);
    if (!source) throw missing();
    const stored = await getVersionDocument(trx, source.id, source.current_version);
    const document = storedDocument(stored?.document);
    const copyName = name ?? `${source.name} (copy)`.slice(0, 200);
    const id = await insertNewScheme(trx, {
      firmId: project.firm_id,
      projectId,
      name: copyName,
      authorId: caller.userId,
      document: () => document,
    });
    return schemeDetail(trx, caller, projectId, id);
  });
}

export async function renameScheme(db: Db, caller: Caller, projectId: string, schemeId: string, name: string) {
  return db.transaction(async (trx) => {
    await openProject(trx, projectId);
    const scheme = await lockScheme(trx, projectId, schemeId);
    if (!scheme) throw missing();
    if (scheme.archived_at) throw archivedScheme();
    await updateScheme(trx, schemeId, { name });
    return schemeDetail(trx, caller, projectId, schemeId);
  });
}

export async function setSchemeArchived(
  db: Db,
  caller: Caller,
  projectId: string,
  schemeId: string,
  archived: boolean,
): Promise<SchemeDetail> {
  return db.transaction(async (trx) => {
    await openProject(trx, projectId);
    const scheme = await lockScheme(trx, projectId, schemeId);
    if (!scheme) throw missing();
    if (Boolean(scheme.archived_at) !== archived)
      await updateScheme(trx, schemeId, { archived_at: archived ? new Date() : null });
    return schemeDetail(trx, caller, projectId, schemeId);
  });
}

export type SaveOutcome = { saved: SchemeDetail } | { conflict: SchemeConflict };

/**
 * Saves a document as the next version when `baseVersion` is still the latest; otherwise answers
 * with the version that is (the editor then offers to reload or to save as a copy). The engine
 * runs before the transaction, so the row lock is held only for the insert.
 */
export async function saveScheme(
  db: Db,
  caller: Caller,
  projectId: string,
  schemeId: string,
  input: { baseVersion: number; document: SchemeDocument; restoredFrom?: number },
): Promise<SaveOutcome> {
  const analysisFor = (name: string) => {
    const document = withIdentity(input.document, schemeId, name);
    return { document, analysis: analyse(document) };
  };
  const before = await findScheme(db, projectId, schemeId);
  if (!before) throw missing();
  let prepared = analysisFor(before.name);
  return db.transaction(async (trx) => {
    await openProject(trx, projectId);
    const scheme = await lockScheme(trx, projectId, schemeId);
    if (!scheme) throw missing();
    if (scheme.archived_at) throw archivedScheme();
    if (scheme.current_version !== input.baseVersion) {
      const current = await getVersion(trx, schemeId, scheme.current_version);
      return {
        conflict: {
          error: {
            code: 'conflict',
            message: `${current?.author_name ?? 'Someone'} saved version ${scheme.current_version} of this scheme after version ${input.baseVersion}, which this save started from. Reload it, or save yours as a copy.`,
          },
          current: versionSummaryOf(current as VersionRow),
        },
      } satisfies SaveOutcome;
    }
    // renamed between the engine run and the lock: the stored document keeps the current name
    if (scheme.name !== before.name) prepared = analysisFor(scheme.name);
    const version = scheme.current_version + 1;
    await insertVersion(trx, {
      schemeId,
      version,
      document: prepared.document,
      authorId: caller.userId,
      restoredFrom: input.restoredFrom,
      analysis: prepared.analysis,
    });
    await setCurrentVersion(trx, schemeId, version);
    return { saved: await detailOf(trx, caller, { ...scheme, current_version: version }) };
  });
}

/** Restoring an earlier save is a new save of its document, on top of whatever is latest. */
export async function restoreVersion(
  db: Db,
  caller: Caller,
  projectId: string,
  schemeId: string,
  version: number,
): Promise<SchemeDetail> {
  const scheme = await findScheme(db, projectId, schemeId);
  if (!scheme) throw missing();
  const stored = await getVersionDocument(db, schemeId, version);
  if (!stored) throw notFound(`This scheme has no version ${version}.`);
  // Retried if another save lands between reading the latest version and saving on top of it.
  for (let attempt = 0; attempt < 3; attempt++) {
    const latest = (await findScheme(db, projectId, schemeId))!.current_version;
    const outcome = await saveScheme(db, caller, projectId, schemeId, {
      baseVersion: latest,
      document: storedDocument(stored.document),
      restoredFrom: version,
    });
    if ('saved' in outcome) return outcome.saved;
  }
  throw new HttpError(409, 'conflict', 'Others are saving this scheme right now; try the restore again.');
}

export async function versionHistory(
  db: Db,
  projectId: string,
  schemeId: string,
  page: { page: number; pageSize: number },
): Promise<SchemeVersionList> {
  if (!(await findScheme(db, projectId, schemeId))) throw missing();
  const { rows, total } = await listVersions(db, schemeId, page);
  return { items: rows.map(versionSummaryOf), total, ...page };
}

export async function versionOf(db: Db, projectId: string, schemeId: string, version: number): Promise<SchemeVersion> {
  const scheme = await findScheme(db, projectId, schemeId);
  if (!scheme) throw missing();
  const [row, stored] = await Promise.all([
    getVersion(db, schemeId, version),
    getVersionDocument(db, schemeId, version),
  ]);
  if (!row || !stored) throw notFound(`This scheme has no version ${version}.`);
  return {
    ...versionSummaryOf(row),
    document: storedDocument(stored.document),
    results: stored.results as SchemeVersion['results'],
  };
}
