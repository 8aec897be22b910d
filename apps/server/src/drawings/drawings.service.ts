import {
  STAGE_TITLES,
  suitabilityFitsSeries,
  type Drawing,
  type DrawingCreate,
  type DrawingList,
  type DrawingListItem,
  type DrawingSettings,
  type Revision,
  type RevisionAction,
  type RevisionFile,
  type RevisionPatch,
  type RevisionSeries,
  type RevisionState,
  type revisionCreateSchema,
} from '@trabeate/contracts';
import type { Knex } from 'knex';
import type { z } from 'zod';
import type { Db } from '../db/db';
import { HttpError, notFound } from '../core/errors';
import type { Caller } from '../access/policy';
import { insertActivity } from '../activity/activity.repository';
import { lockProject } from '../projects/projects.repository';
import type { StoredUpload } from '../uploads';
import { nextDrawingNumber, revisionCode } from './codes';
import {
  drawingNumbers,
  filesOf,
  getDrawingRow,
  getRevision,
  getSettings,
  insertDrawing,
  listRegister,
  lockDrawing,
  lockRevision,
  putSettings,
  revisionsOf,
  type DrawingListFilters,
  type DrawingRow,
  type RevisionFileRow,
  type RevisionRow,
} from './drawings.repository';

type RevisionCreate = z.output<typeof revisionCreateSchema>;

const conflict = (message: string) => new HttpError(409, 'conflict', message);
/** Client contacts see only what has gone out: issued and superseded revisions. */
export const outOnly = (caller: Caller) => caller.role === 'client';

/** PostgreSQL's refusals that mean "two people did this at once" or "this is frozen". */
export function pgCode(err: unknown): string | undefined {
  return typeof err === 'object' && err !== null && 'code' in err ? String((err as { code: unknown }).code) : undefined;
}

export const fileOf = (f: RevisionFileRow): RevisionFile => ({
  id: f.id,
  role: f.role,
  fileName: f.file_name,
  sizeBytes: Number(f.size_bytes),
  sha256: f.sha256,
  contentType: f.content_type,
  uploadedAt: new Date(f.uploaded_at).toISOString(),
  downloadUrl: `/api/projects/${f.project_id}/revisions/${f.revision_id}/files/${f.id}/download`,
});

export const listItemOf = (r: DrawingRow): DrawingListItem => ({
  id: r.id,
  number: r.number,
  title: r.title,
  stageKey: r.stage_key,
  sheetSize: r.sheet_size,
  scale: r.scale,
  current: r.r_id
    ? {
        id: r.r_id,
        code: r.r_code!,
        suitability: r.r_suitability!,
        state: r.r_state!,
        date: r.r_date!,
        issuedAt: r.r_issued_at ? new Date(r.r_issued_at).toISOString() : null,
      }
    : null,
  revisionCount: Number(r.revision_count),
});

/** The transitions this caller may take on a revision now; the refusal says why for any other. */
export function revisionRefusal(
  caller: Caller,
  r: { code: string; state: string; drawn_by: string },
  action: RevisionAction,
  hasPdf: boolean,
): string | null {
  if (caller.role === 'client') return 'Client contacts see issued drawings only.';
  if (r.state === 'issued' || r.state === 'superseded')
    return `Revision ${r.code} has been issued and never changes; register a new revision instead.`;
  if (action === 'check') {
    if (r.state !== 'draft') return `Revision ${r.code} is ${r.state}, not a draft, so it cannot be checked again.`;
    if (!hasPdf) return `Revision ${r.code} has no PDF yet; upload its PDF before it is checked.`;
    if (r.drawn_by === caller.userId)
      return `You drew revision ${r.code}; another engineer or the principal checks it.`;
    return null;
  }
  if (caller.role !== 'principal') return "Only the firm's principal approves a revision.";
  if (r.state !== 'checked') return `Revision ${r.code} is ${r.state}; only a checked revision can be approved.`;
  return null;
}

export function revisionOf(caller: Caller, r: RevisionRow, files: RevisionFileRow[]): Revision {
  const hasPdf = files.some((f) => f.role === 'pdf');
  return {
    id: r.id,
    drawingId: r.drawing_id,
    code: r.code,
    series: r.series,
    suitability: r.suitability,
    purpose: r.purpose,
    description: r.description,
    date: r.revision_date,
    state: r.state,
    drawnBy: { id: r.drawn_by, displayName: r.drawn_name },
    checkedBy: r.checked_by ? { id: r.checked_by, displayName: r.checked_name! } : null,
    approvedBy: r.approved_by ? { id: r.approved_by, displayName: r.approved_name! } : null,
    issuedAt: r.issued_at ? new Date(r.issued_at).toISOString() : null,
    fromScheme:
      r.scheme_id && r.scheme_version !== null && !outOnly(caller)
        ? { id: r.scheme_id, name: r.scheme_name ?? '', version: r.scheme_version }
        : null,
    files: files.map(fileOf),
    allowedActions: (['check', 'approve'] as const).filter((a) => revisionRefusal(caller, r, a, hasPdf) === null),
  };
}

export async function readSettings(db: Db, firmId: string): Promise<DrawingSettings> {
  const s = await getSettings(db, firmId);
  return { revisionScheme: s.revision_scheme, numberPattern: s.number_pattern };
}

export async function writeSettings(db: Db, firmId: string, s: DrawingSettings): Promise<DrawingSettings> {
  await putSettings(db, firmId, { revision_scheme: s.revisionScheme, number_pattern: s.numberPattern });
  return readSettings(db, firmId);
}

export async function listDrawings(
  db: Db,
  caller: Caller,
  projectId: string,
  f: DrawingListFilters,
): Promise<DrawingList> {
  const { rows, total } = await listRegister(db, projectId, outOnly(caller), f);
  return { items: rows.map(listItemOf), total, page: f.page, pageSize: f.pageSize };
}

export async function proposeNumber(db: Db, caller: Caller, projectId: string) {
  const settings = await getSettings(db, caller.firmId);
  const project = await db('projects').where({ id: projectId }).first('reference');
  const number = nextDrawingNumber(settings.number_pattern, project.reference, await drawingNumbers(db, projectId));
  return { number, pattern: settings.number_pattern };
}

export async function getDrawing(db: Db, caller: Caller, projectId: string, drawingId: string): Promise<Drawing> {
  const hide = outOnly(caller);
  const row = await getDrawingRow(db, projectId, drawingId, hide);
  if (!row) throw notFound('No drawing with this id.');
  const revisions = await revisionsOf(db, drawingId, hide);
  const files = await filesOf(
    db,
    revisions.map((r) => r.id),
  );
  return {
    ...listItemOf(row),
    revisions: revisions.map((r) =>
      revisionOf(
        caller,
        r,
        files.filter((f) => f.revision_id === r.id),
      ),
    ),
    canRegisterRevision: !hide && !revisions.some((r) => ['draft', 'checked', 'approved'].includes(r.state)),
  };
}

async function refuseArchived(trx: Parameters<typeof lockProject>[0], projectId: string) {
  const project = await lockProject(trx, projectId);
  if (project.archived_at) throw conflict('This project is archived; restore it to change its drawings.');
  return project;
}

export async function createDrawing(db: Db, caller: Caller, projectId: string, body: DrawingCreate): Promise<Drawing> {
  const id = await db.transaction(async (trx) => {
    await refuseArchived(trx, projectId);
    let id: string;
    try {
      id = await trx.transaction(async (inner) =>
        insertDrawing(inner, {
          firm_id: caller.firmId,
          project_id: projectId,
          number: body.number,
          title: body.title,
          stage_key: body.stageKey,
          sheet_size: body.sheetSize,
          scale: body.scale,
          created_by: caller.userId,
        }),
      );
    } catch (err) {
      if (pgCode(err) === '23505')
        throw conflict(`Drawing number ${body.number} is already used in this project; choose another number.`);
      throw err;
    }
    await insertActivity(trx, {
      firmId: caller.firmId,
      projectId,
      actorId: caller.userId,
      action: 'drawing.registered',
      objectType: 'drawing',
      objectId: id,
      stageKey: body.stageKey,
      summary: `${caller.displayName} registered drawing ${body.number} (${body.title}) under ${STAGE_TITLES[body.stageKey]}`,
    });
    return id;
  });
  return getDrawing(db, caller, projectId, id);
}

/** Which series a new revision takes, and its code, given the drawing's revisions so far. */
async function planRevision(
  q: Db | Parameters<typeof lockProject>[0],
  firmId: string,
  drawingId: string,
  wanted: RevisionSeries | undefined,
) {
  const settings = await getSettings(q, firmId);
  const rows: Array<{ series: RevisionSeries; seq: number }> = await q('drawing_revisions')
    .where({ drawing_id: drawingId })
    .orderBy('seq', 'desc')
    .select('series', 'seq');
  const last = rows[0];
  const series = wanted ?? last?.series ?? 'preliminary';
  if (last?.series === 'contractual' && series === 'preliminary')
    throw conflict('This drawing already has contractual revisions; a new revision cannot go back to preliminary.');
  const inSeries = rows.filter((r) => r.series === series).length;
  return {
    scheme: settings.revision_scheme,
    series,
    code: revisionCode(settings.revision_scheme, series, inSeries + 1),
    seq: (last?.seq ?? 0) + 1,
  };
}

export async function proposeRevision(
  db: Db,
  caller: Caller,
  projectId: string,
  drawingId: string,
  series: RevisionSeries | undefined,
) {
  const drawing = await db('drawings').where({ project_id: projectId, id: drawingId }).first('id');
  if (!drawing) throw notFound('No drawing with this id.');
  const { code, scheme, series: s } = await planRevision(db, caller.firmId, drawingId, series);
  return { code, scheme, series: s };
}

/**
 * Registers the next revision of a drawing as a draft. The drawing row is locked, so two people
 * registering at once are served one after the other: the second finds the first's draft open and
 * gets a 409 saying so (a drawing has at most one revision in progress; an index enforces it too).
 */
export async function registerRevision(
  db: Db,
  caller: Caller,
  projectId: string,
  drawingId: string,
  body: RevisionCreate,
  /** the scheme version a generated plan sheet was drawn from, and its paper (scheme-outputs) */
  origin?: { schemeId: string; schemeVersion: number; sheetSize: string; sheetScale: number },
): Promise<Revision> {
  const id = await db.transaction(async (trx) => {
    await refuseArchived(trx, projectId);
    const drawing = await lockDrawing(trx, projectId, drawingId);
    if (!drawing) throw notFound('No drawing with this id.');
    const open = await trx('drawing_revisions')
      .where({ drawing_id: drawingId })
      .whereIn('state', ['draft', 'checked', 'approved'])
      .first('code', 'state');
    if (open)
      throw conflict(
        `Revision ${open.code} of ${drawing.number} is still ${open.state}; issue it before registering the next revision.`,
      );
    const plan = await planRevision(trx, caller.firmId, drawingId, body.series);
    if (!suitabilityFitsSeries(body.suitability, plan.series))
      throw new HttpError(
        400,
        'validation_failed',
        plan.series === 'preliminary'
          ? `A preliminary revision is shared, so its suitability is S0 to S4, not ${body.suitability}.`
          : `A contractual revision is authorised, so its suitability is A1 to An or CR, not ${body.suitability}.`,
        { 'body.suitability': ['does not fit the revision series'] },
      );
    const [{ id }] = await trx('drawing_revisions')
      .insert({
        drawing_id: drawingId,
        project_id: projectId,
        seq: plan.seq,
        series: plan.series,
        code: plan.code,
        suitability: body.suitability,
        purpose: body.purpose,
        description: body.description,
        revision_date: body.date,
        drawn_by: caller.userId,
        ...(origin
          ? {
              scheme_id: origin.schemeId,
              scheme_version: origin.schemeVersion,
              sheet_size: origin.sheetSize,
              sheet_scale: origin.sheetScale,
            }
          : {}),
      })
      .returning('id');
    await insertActivity(trx, {
      firmId: caller.firmId,
      projectId,
      actorId: caller.userId,
      action: 'revision.registered',
      objectType: 'revision',
      objectId: id,
      summary: `${caller.displayName} registered revision ${plan.code} of drawing ${drawing.number}`,
      details: { code: plan.code, suitability: body.suitability },
    });
    return id as string;
  });
  return readRevision(db, caller, projectId, id);
}

export async function readRevision(db: Db, caller: Caller, projectId: string, id: string): Promise<Revision> {
  const row = await getRevision(db, projectId, id);
  if (!row || (outOnly(caller) && !['issued', 'superseded'].includes(row.state)))
    throw notFound('No revision with this id.');
  return revisionOf(caller, row, await filesOf(db, [id]));
}

const frozen = (code: string) =>
  conflict(`Revision ${code} has been issued and never changes; register a new revision instead.`);

export async function patchRevision(
  db: Db,
  caller: Caller,
  projectId: string,
  id: string,
  patch: RevisionPatch,
): Promise<Revision> {
  await db.transaction(async (trx) => {
    await refuseArchived(trx, projectId);
    const r = await lockRevision(trx, projectId, id);
    if (!r) throw notFound('No revision with this id.');
    if (r.state === 'issued' || r.state === 'superseded') throw frozen(r.code);
    if (r.state !== 'draft')
      throw conflict(`Revision ${r.code} is ${r.state}; only a draft can be edited. Register a new revision instead.`);
    if (patch.suitability && !suitabilityFitsSeries(patch.suitability, r.series))
      throw new HttpError(
        400,
        'validation_failed',
        `Suitability ${patch.suitability} does not fit a ${r.series} revision.`,
      );
    const changes: Record<string, unknown> = {};
    if (patch.suitability !== undefined) changes['suitability'] = patch.suitability;
    if (patch.purpose !== undefined) changes['purpose'] = patch.purpose;
    if (patch.description !== undefined) changes['description'] = patch.description;
    if (patch.date !== undefined) changes['revision_date'] = patch.date;
    await trx('drawing_revisions').where({ id }).update(changes);
  });
  return readRevision(db, caller, projectId, id);
}

/**
 * Called inside a check or approval's transaction, after the revision row changed: a generated
 * drawing draws itself again with the new names (scheme-outputs' plan sheet). What it returns runs
 * once the change has committed (removing the file it replaced).
 */
export type RevisionRestamp = (trx: Knex.Transaction, revisionId: string) => Promise<(() => Promise<void>) | void>;

export async function transitionRevision(
  db: Db,
  caller: Caller,
  projectId: string,
  id: string,
  action: RevisionAction,
  restamp?: RevisionRestamp,
): Promise<Revision> {
  const afterCommit = await db.transaction(async (trx) => {
    await refuseArchived(trx, projectId);
    const r = await lockRevision(trx, projectId, id);
    if (!r) throw notFound('No revision with this id.');
    const hasPdf = Boolean(await trx('revision_files').where({ revision_id: id, role: 'pdf' }).first('id'));
    const refusal = revisionRefusal(caller, r, action, hasPdf);
    if (refusal) throw conflict(refusal);
    const drawing = await trx('drawings').where({ id: r.drawing_id }).first('number');
    await trx('drawing_revisions')
      .where({ id })
      .update(
        action === 'check'
          ? { state: 'checked', checked_by: caller.userId, checked_at: trx.fn.now() }
          : { state: 'approved', approved_by: caller.userId, approved_at: trx.fn.now() },
      );
    await insertActivity(trx, {
      firmId: caller.firmId,
      projectId,
      actorId: caller.userId,
      action: action === 'check' ? 'revision.checked' : 'revision.approved',
      objectType: 'revision',
      objectId: id,
      summary: `${caller.displayName} ${action === 'check' ? 'checked' : 'approved'} revision ${r.code} of drawing ${drawing.number}`,
    });
    return restamp ? await restamp(trx, id) : undefined;
  });
  if (afterCommit) await afterCommit();
  return readRevision(db, caller, projectId, id);
}

/**
 * Refuses, before a byte is streamed, a file for a revision that cannot take one now. With
 * `replaces`, the file must exist on that revision, and the new one takes its role.
 */
export async function fileCheck(
  db: Db,
  projectId: string,
  id: string,
  role: 'pdf' | 'source',
  replaces?: string,
): Promise<'pdf' | 'source'> {
  const r = await db('drawing_revisions').where({ project_id: projectId, id }).first('code', 'state');
  if (!r) throw notFound('No revision with this id.');
  if (r.state === 'issued' || r.state === 'superseded') throw frozen(r.code);
  if (r.state !== 'draft')
    throw conflict(`Revision ${r.code} is ${r.state}; its files are fixed once it has been checked.`);
  if (replaces) {
    const old = await db('revision_files').where({ revision_id: id, id: replaces }).first('role');
    if (!old) throw notFound('No file with this id on this revision.');
    return old.role;
  }
  if (role === 'pdf' && (await db('revision_files').where({ revision_id: id, role: 'pdf' }).first('id')))
    throw conflict(`Revision ${r.code} already has its PDF; replace it or delete it first.`);
  return role;
}

/** The file row of a draft revision, locked with its revision, or the reason it cannot change. */
async function lockDraftFile(trx: Knex.Transaction, projectId: string, revisionId: string, fileId: string) {
  const r = await lockRevision(trx, projectId, revisionId);
  if (!r) throw notFound('No revision with this id.');
  if (r.state === 'issued' || r.state === 'superseded') throw frozen(r.code);
  if (r.state !== 'draft') throw conflict(`Revision ${r.code} is ${r.state}; its files are fixed.`);
  const f = await trx('revision_files')
    .where({ revision_id: revisionId, id: fileId })
    .forUpdate()
    .first<RevisionFileRow | undefined>();
  if (!f) throw notFound('No file with this id on this revision.');
  return { r, f };
}

/**
 * Removes a file from a draft revision and returns its object key, for the caller to remove from
 * storage once this has committed (a failed removal then leaves only an unreferenced object).
 * The PDF may go too: a revision cannot be checked without one.
 */
export async function deleteFile(
  db: Db,
  caller: Caller,
  projectId: string,
  revisionId: string,
  fileId: string,
): Promise<string> {
  return db.transaction(async (trx) => {
    await refuseArchived(trx, projectId);
    const { r, f } = await lockDraftFile(trx, projectId, revisionId, fileId);
    await trx('revision_files').where({ id: f.id }).delete();
    await insertActivity(trx, {
      firmId: caller.firmId,
      projectId,
      actorId: caller.userId,
      action: 'revision.file_removed',
      objectType: 'revision',
      objectId: revisionId,
      summary: `${caller.displayName} removed ${f.file_name} from revision ${r.code}`,
      details: { fileName: f.file_name, sizeBytes: Number(f.size_bytes), sha256: f.sha256, role: f.role },
    });
    return f.object_key;
  });
}

export async function recordFile(
  db: Db,
  caller: Caller,
  projectId: string,
  id: string,
  role: 'pdf' | 'source',
  file: StoredUpload,
  replaces?: string,
): Promise<{ file: RevisionFile; replacedKey?: string }> {
  if (role === 'pdf' && file.detectedType !== 'pdf')
    throw new HttpError(
      415,
      'unsupported_media_type',
      'The drawing itself must be a PDF; send other formats as source files.',
    );
  const row = await db.transaction(async (trx) => {
    await refuseArchived(trx, projectId);
    let replaced: RevisionFileRow | undefined;
    let r: { code: string; state: RevisionState };
    if (replaces) {
      ({ r, f: replaced } = await lockDraftFile(trx, projectId, id, replaces));
      if (replaced.role !== role) throw conflict(`That file is a ${replaced.role} file, not a ${role} file.`);
      await trx('revision_files').where({ id: replaced.id }).delete();
    } else {
      const locked = await lockRevision(trx, projectId, id);
      if (!locked) throw notFound('No revision with this id.');
      if (locked.state === 'issued' || locked.state === 'superseded') throw frozen(locked.code);
      if (locked.state !== 'draft') throw conflict(`Revision ${locked.code} is ${locked.state}; its files are fixed.`);
      r = locked;
    }
    let inserted: RevisionFileRow;
    try {
      [inserted] = await trx.transaction(async (inner) =>
        inner('revision_files')
          .insert({
            revision_id: id,
            project_id: projectId,
            role,
            file_name: file.safeName,
            object_key: file.key,
            size_bytes: file.size,
            sha256: file.sha256,
            content_type: file.contentType,
            uploaded_by: caller.userId,
          })
          .returning('*'),
      );
    } catch (err) {
      if (pgCode(err) === '23505') throw conflict(`Revision ${r.code} already has its PDF.`);
      throw err;
    }
    await insertActivity(trx, {
      firmId: caller.firmId,
      projectId,
      actorId: caller.userId,
      action: replaced ? 'revision.file_replaced' : 'revision.file_added',
      objectType: 'revision',
      objectId: id,
      summary: replaced
        ? `${caller.displayName} replaced ${replaced.file_name} with ${file.safeName} on revision ${r.code}`
        : `${caller.displayName} added ${file.safeName} to revision ${r.code}`,
      details: {
        fileName: file.safeName,
        sizeBytes: file.size,
        sha256: file.sha256,
        role,
        ...(replaced ? { replaced: { fileName: replaced.file_name, sha256: replaced.sha256 } } : {}),
      },
    });
    return { inserted, replacedKey: replaced?.object_key };
  });
  return { file: fileOf(row.inserted), replacedKey: row.replacedKey };
}
