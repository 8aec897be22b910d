import { STAGE_TITLES, type Deliverable, type StageKey } from '@trabeate/contracts';
import type { Db } from '../db/db';
import { HttpError, notFound } from '../core/errors';
import type { Caller } from '../access/policy';
import { insertActivity } from '../activity/activity.repository';
import { lockProject } from '../projects/projects.repository';
import { lockStage } from '../stages/stages.repository';
import { uploadRefusal } from '../stages/stage-rules';
import type { StoredUpload } from '../uploads';
import { getDeliverable, insertDeliverable, nextVersion, type DeliverableRow } from './deliverables.repository';

export const deliverableOf = (r: DeliverableRow): Deliverable => ({
  id: r.id,
  stageKey: r.stage_key,
  fileName: r.file_name,
  version: r.version,
  sizeBytes: Number(r.size_bytes),
  sha256: r.sha256,
  contentType: r.content_type,
  uploadedBy: { id: r.uploaded_by, displayName: r.uploader_name },
  uploadedAt: new Date(r.uploaded_at).toISOString(),
  downloadUrl: `/api/projects/${r.project_id}/deliverables/${r.id}/download`,
});

/** Why no file may be added to this stage now (checked before the upload streams, and again after). */
export async function uploadCheck(db: Db, projectId: string, key: StageKey): Promise<void> {
  const row = await db('stages as s')
    .join('projects as p', 'p.id', 's.project_id')
    .where({ 's.project_id': projectId, 's.key': key })
    .first('s.state', 's.assignee_id', 'p.archived_at');
  if (!row) throw notFound('No stage with this key.');
  const refusal = uploadRefusal({ key, state: row.state, assigneeId: row.assignee_id }, Boolean(row.archived_at));
  if (refusal) throw new HttpError(409, 'conflict', refusal);
}

/**
 * Records a stored upload as the next version of its name on the stage. The stage row is locked,
 * so two uploads of the same name at once get versions n and n+1, never the same one.
 */
export async function recordUpload(
  db: Db,
  caller: Caller,
  projectId: string,
  key: StageKey,
  file: StoredUpload,
): Promise<Deliverable> {
  const id = await db.transaction(async (trx) => {
    const project = await lockProject(trx, projectId);
    const stage = await lockStage(trx, projectId, key);
    if (!stage) throw notFound('No stage with this key.');
    const refusal = uploadRefusal(
      { key, state: stage.state, assigneeId: stage.assignee_id },
      Boolean(project.archived_at),
    );
    if (refusal) throw new HttpError(409, 'conflict', refusal);
    const fileName = file.safeName;
    const version = await nextVersion(trx, projectId, key, fileName);
    const id = await insertDeliverable(trx, {
      project_id: projectId,
      stage_key: key,
      file_name: fileName,
      version,
      object_key: file.key,
      size_bytes: file.size,
      sha256: file.sha256,
      content_type: file.contentType,
      detected_type: file.detectedType,
      uploaded_by: caller.userId,
    });
    await insertActivity(trx, {
      firmId: caller.firmId,
      projectId,
      actorId: caller.userId,
      action: 'deliverable.uploaded',
      objectType: 'deliverable',
      objectId: id,
      stageKey: key,
      summary: `${caller.displayName} uploaded ${fileName}${version > 1 ? ` (version ${version})` : ''} to ${STAGE_TITLES[key]}`,
      details: { fileName, version, sizeBytes: file.size, sha256: file.sha256 },
    });
    await trx('projects').where({ id: projectId }).update({ updated_at: trx.fn.now() });
    return id;
  });
  const row = await getDeliverable(db, projectId, id);
  return deliverableOf(row!);
}
