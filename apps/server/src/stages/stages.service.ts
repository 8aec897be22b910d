import type { Knex } from 'knex';
import {
  STAGE_TITLES,
  type Comment,
  type Stage,
  type StageAction,
  type StageKey,
  type StagePatch,
  type StageTransition,
} from '@trabeate/contracts';
import type { Db } from '../db/db';
import { HttpError, notFound } from '../core/errors';
import { projectRefusal, type Caller } from '../access/policy';
import { insertActivity } from '../activity/activity.repository';
import type { Notices } from '../notices/notices';
import { lockProject, type ProjectContext } from '../projects/projects.repository';
import {
  getStage,
  insertComment,
  listComments,
  lockStage,
  updateStage,
  type CommentRow,
  type StageRow,
} from './stages.repository';
import { offerStageDraft } from '../fees/fees.service';
import { allowedActions, STATE_WORDS, transitionRefusal, TRANSITIONS } from './stage-rules';
import { insertSubmission, openSubmission, recordDecision, submissionBasis } from './stage-submissions';

export function stageOf(r: StageRow, caller: Caller, archived: boolean): Stage {
  return {
    key: r.key,
    title: STAGE_TITLES[r.key],
    position: r.position,
    state: r.state,
    assignee: r.assignee_id ? { id: r.assignee_id, displayName: r.assignee_name ?? '' } : null,
    dueDate: r.due_date,
    late: r.late,
    submittedAt: r.submitted_at ? new Date(r.submitted_at).toISOString() : null,
    approvedAt: r.approved_at ? new Date(r.approved_at).toISOString() : null,
    // Clients see progress, not how many files or review notes the firm's work holds.
    ...(projectRefusal(caller.role, 'internal') === null
      ? { deliverableCount: r.deliverable_count, commentCount: r.comment_count }
      : { deliverableCount: null, commentCount: null }),
    allowedActions: allowedActions({ key: r.key, state: r.state, assigneeId: r.assignee_id }, caller, archived),
  };
}

export const commentOf = (r: CommentRow): Comment => ({
  id: r.id,
  stageKey: r.stage_key,
  author: { id: r.author_id, displayName: r.author_name },
  body: r.body,
  action: (r.action as StageAction | null) ?? null,
  createdAt: new Date(r.created_at).toISOString(),
});

async function loadStage(db: Db | Knex.Transaction, projectId: string, key: StageKey): Promise<StageRow> {
  const row = await getStage(db, projectId, key);
  if (!row) throw notFound('No stage with this key.');
  return row;
}

function refuseIfArchived(project: ProjectContext): void {
  if (project.archived_at)
    throw new HttpError(409, 'conflict', 'This project is archived; restore it before changing it.');
}

/** Assigns an engineer and sets the due date (principal). An engineer not yet on the team joins it. */
export async function patchStage(
  db: Db,
  caller: Caller,
  projectId: string,
  key: StageKey,
  patch: StagePatch,
): Promise<Stage> {
  const project = await db.transaction(async (trx) => {
    const project = await lockProject(trx, projectId);
    refuseIfArchived(project);
    const current = await lockStage(trx, projectId, key);
    if (!current) throw notFound('No stage with this key.');
    const changes: Record<string, unknown> = {};
    const said: string[] = [];
    if (patch.assigneeId !== undefined && patch.assigneeId !== current.assignee_id) {
      if (patch.assigneeId === null) {
        changes['assignee_id'] = null;
        said.push('removed the assigned engineer');
      } else {
        const person = await trx('users')
          .where({ id: patch.assigneeId, firm_id: caller.firmId })
          .whereNull('disabled_at')
          .first('id', 'firm_role', 'display_name');
        if (!person || person.firm_role !== 'engineer') {
          throw new HttpError(400, 'validation_failed', "Stages are assigned to one of the firm's engineers.", {
            'body.assigneeId': ['not an engineer of this firm'],
          });
        }
        const joined = await trx('project_members')
          .insert({ project_id: projectId, user_id: person.id, added_by: caller.userId })
          .onConflict(['project_id', 'user_id'])
          .ignore()
          .returning('user_id');
        if (joined.length) {
          await insertActivity(trx, {
            firmId: caller.firmId,
            projectId,
            actorId: caller.userId,
            action: 'membership.added',
            objectType: 'membership',
            objectId: person.id,
            summary: `${caller.displayName} added ${person.display_name} to the project team`,
          });
        }
        changes['assignee_id'] = person.id;
        said.push(`assigned ${person.display_name}`);
      }
    }
    if (patch.dueDate !== undefined) {
      changes['due_date'] = patch.dueDate;
      said.push(patch.dueDate ? `set the due date to ${patch.dueDate}` : 'cleared the due date');
    }
    if (Object.keys(changes).length) {
      await updateStage(trx, projectId, key, changes);
      await insertActivity(trx, {
        firmId: caller.firmId,
        projectId,
        actorId: caller.userId,
        action: 'stage.updated',
        objectType: 'stage',
        objectId: `${projectId}:${key}`,
        stageKey: key,
        summary: `${caller.displayName} ${said.join(' and ')} on ${STAGE_TITLES[key]}`,
        details: { ...patch },
      });
      await trx('projects').where({ id: projectId }).update({ updated_at: trx.fn.now() });
    }
    return project;
  });
  return stageOf(await loadStage(db, projectId, key), caller, Boolean(project.archived_at));
}

const VERB: Record<StageAction, string> = {
  start: 'started',
  submit: 'submitted',
  approve: 'approved',
  return: 'returned',
  reopen: 'reopened',
};

/**
 * Moves a stage along the workflow under a row lock, so two people acting at once cannot both
 * move it; records the comment that came with it, the activity entry and the e-mail notice in
 * the same transaction.
 */
export async function transition(
  db: Db,
  notices: Notices,
  caller: Caller,
  projectId: string,
  key: StageKey,
  input: StageTransition,
): Promise<Stage> {
  const title = STAGE_TITLES[key];
  const project = await db.transaction(async (trx) => {
    const project = await lockProject(trx, projectId);
    const current = await lockStage(trx, projectId, key);
    if (!current) throw notFound('No stage with this key.');
    const refusal = transitionRefusal(
      input.action,
      { key, state: current.state, assigneeId: current.assignee_id },
      caller,
      Boolean(project.archived_at),
    );
    if (refusal)
      throw new HttpError(refusal.status, refusal.status === 409 ? 'conflict' : 'forbidden', refusal.message);

    // A stage that rests on a scheme passes the check gate before anything changes.
    const basis = input.action === 'submit' ? await submissionBasis(trx, projectId, key, input) : null;

    const t = TRANSITIONS[input.action];
    const changes: Record<string, unknown> = { state: t.to };
    if (input.action === 'start') changes['started_at'] = trx.fn.now();
    if (input.action === 'submit') changes['submitted_at'] = trx.fn.now();
    if (input.action === 'approve') changes['approved_at'] = trx.fn.now();
    if (input.action === 'reopen') changes['approved_at'] = null;
    await updateStage(trx, projectId, key, changes);
    // Approval offers the principal a draft invoice for the stage's share of the fee (or points at
    // the stage's draft that is already waiting).
    const offeredInvoiceId =
      input.action === 'approve'
        ? ((await offerStageDraft(trx, caller, projectId, key)) ??
          (await trx('invoices').where({ project_id: projectId, stage_key: key, state: 'draft' }).first('id'))?.id ??
          null)
        : null;

    const text = input.action === 'reopen' ? input.reason : 'comment' in input ? input.comment : undefined;
    // The decision is recorded against the submission (and so the scheme version) it answers.
    const answered =
      input.action === 'approve' || input.action === 'return' ? await openSubmission(trx, projectId, key) : undefined;
    if (answered)
      await recordDecision(trx, answered.id, {
        outcome: input.action === 'approve' ? 'approved' : 'returned',
        by: caller.userId,
        comment: text,
        invoiceId: offeredInvoiceId,
      });
    const submissionId = basis
      ? await insertSubmission(trx, {
          firmId: caller.firmId,
          projectId,
          key,
          submittedBy: caller.userId,
          comment: text,
          basis,
        })
      : answered?.id;
    const scheme = basis?.scheme
      ? { name: basis.scheme.name, version: basis.scheme.version }
      : answered?.scheme_name && answered.scheme_version
        ? { name: answered.scheme_name, version: answered.scheme_version }
        : null;
    const justified = basis?.justifications.length ?? 0;
    if (text)
      await insertComment(trx, { projectId, stageKey: key, authorId: caller.userId, body: text, action: input.action });
    await insertActivity(trx, {
      firmId: caller.firmId,
      projectId,
      actorId: caller.userId,
      action: `stage.${VERB[input.action]}`,
      objectType: 'stage',
      objectId: `${projectId}:${key}`,
      stageKey: key,
      summary:
        `${caller.displayName} ${VERB[input.action]} ${title}${input.action === 'submit' ? ' for review' : ''}` +
        (scheme ? ` (${scheme.name}, version ${scheme.version})` : '') +
        (justified ? `, with ${justified} error-level check${justified === 1 ? '' : 's'} justified` : ''),
      details: {
        from: current.state,
        to: t.to,
        ...(text ? { comment: text } : {}),
        ...(submissionId ? { submissionId } : {}),
        ...(scheme ? { schemeVersion: scheme.version } : {}),
        ...(basis?.scheme ? { schemeId: basis.scheme.id } : {}),
      },
    });
    await trx('projects').where({ id: projectId }).update({ updated_at: trx.fn.now() });

    // Straight to the stage the notice is about: the project page opens the panel named by ?stage=.
    const link = notices.link(`/projects/${projectId}?stage=${key}`);
    const common = { firmName: project.firm_name, projectName: project.name, stageName: title, link };
    if (input.action === 'submit') {
      const principals = await trx('users')
        .where({ firm_id: caller.firmId, firm_role: 'principal' })
        .whereNull('disabled_at')
        .select('email', 'display_name');
      for (const p of principals) {
        await notices.send(trx, {
          to: p.email,
          template: 'stage-submitted',
          data: { ...common, recipientName: p.display_name, submittedBy: caller.displayName, note: text },
        });
      }
    } else if (input.action === 'return' || input.action === 'approve') {
      const engineer = current.assignee_id
        ? await trx('users').where({ id: current.assignee_id }).whereNull('disabled_at').first('email', 'display_name')
        : undefined;
      if (engineer && input.action === 'return') {
        await notices.send(trx, {
          to: engineer.email,
          template: 'stage-returned',
          data: {
            ...common,
            recipientName: engineer.display_name,
            returnedBy: caller.displayName,
            comment: input.comment,
          },
        });
      } else if (engineer) {
        await notices.send(trx, {
          to: engineer.email,
          template: 'stage-approved',
          data: { ...common, recipientName: engineer.display_name, approvedBy: caller.displayName },
        });
      }
    }
    return project;
  });
  return stageOf(await loadStage(db, projectId, key), caller, Boolean(project.archived_at));
}

export async function addComment(
  db: Db,
  caller: Caller,
  projectId: string,
  key: StageKey,
  body: string,
): Promise<Comment> {
  const id = await db.transaction(async (trx) => {
    const project = await lockProject(trx, projectId);
    refuseIfArchived(project);
    if (!(await lockStage(trx, projectId, key))) throw notFound('No stage with this key.');
    const { id } = await insertComment(trx, { projectId, stageKey: key, authorId: caller.userId, body, action: null });
    await insertActivity(trx, {
      firmId: caller.firmId,
      projectId,
      actorId: caller.userId,
      action: 'comment.added',
      objectType: 'comment',
      objectId: id,
      stageKey: key,
      summary: `${caller.displayName} commented on ${STAGE_TITLES[key]}`,
    });
    return id;
  });
  const [row] = await listComments(db, projectId, key, id);
  return commentOf(row);
}

export { STATE_WORDS };
