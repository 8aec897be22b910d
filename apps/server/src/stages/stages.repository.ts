import type { Knex } from 'knex';
import { STAGE_KEYS, type StageKey, type StageState } from '@trabeate/contracts';
import type { Db } from '../db/db';
import { firmTodaySql } from '../firms/firms.repository';

type Q = Db | Knex.Transaction;

/**
 * Late means past its due date, in the firm's own calendar (its time zone), while the work is with
 * the assignee. A stage under review waits on the reviewer, not the engineer, so it is never late
 * (the principal sees how long it has waited).
 */
export const LATE_SQL = (
  alias: string,
  /** the firm's id as SQL; by default looked up from the stage's project */
  firmId = `(select lp.firm_id from projects lp where lp.id = ${alias}.project_id)`,
) =>
  `${alias}.due_date is not null and ${alias}.state in ('not_started', 'in_progress', 'returned') and ${alias}.due_date < ${firmTodaySql(firmId)}`;

export interface StageRow {
  project_id: string;
  key: StageKey;
  position: number;
  state: StageState;
  assignee_id: string | null;
  assignee_name: string | null;
  due_date: string | null;
  late: boolean;
  submitted_at: Date | null;
  approved_at: Date | null;
  deliverable_count: number;
  comment_count: number;
}

/** The six stages every project has, in order. */
export async function insertStages(trx: Q, projectId: string): Promise<void> {
  await trx('stages').insert(STAGE_KEYS.map((key, i) => ({ project_id: projectId, key, position: i + 1 })));
}

function stagesQuery(db: Q) {
  return db('stages as s')
    .leftJoin('users as u', 'u.id', 's.assignee_id')
    .select(
      's.project_id',
      's.key',
      's.position',
      's.state',
      's.assignee_id',
      'u.display_name as assignee_name',
      db.raw(`to_char(s.due_date, 'YYYY-MM-DD') as due_date`),
      db.raw(`(${LATE_SQL('s')}) as late`),
      's.submitted_at',
      's.approved_at',
      db.raw(
        '(select count(*)::int from deliverables d where d.project_id = s.project_id and d.stage_key = s.key) as deliverable_count',
      ),
      db.raw(
        '(select count(*)::int from stage_comments c where c.project_id = s.project_id and c.stage_key = s.key) as comment_count',
      ),
    );
}

export async function listStages(db: Q, projectId: string): Promise<StageRow[]> {
  return stagesQuery(db).where('s.project_id', projectId).orderBy('s.position');
}

export async function getStage(db: Q, projectId: string, key: StageKey): Promise<StageRow | undefined> {
  return stagesQuery(db).where({ 's.project_id': projectId, 's.key': key }).first();
}

/** Locks the stage row for the rest of the transaction: two people acting at once take turns. */
export async function lockStage(
  trx: Knex.Transaction,
  projectId: string,
  key: StageKey,
): Promise<{ state: StageState; assignee_id: string | null } | undefined> {
  return trx('stages').where({ project_id: projectId, key }).forUpdate().first('state', 'assignee_id');
}

export async function updateStage(
  trx: Q,
  projectId: string,
  key: StageKey,
  patch: Record<string, unknown>,
): Promise<void> {
  await trx('stages')
    .where({ project_id: projectId, key })
    .update({ ...patch, updated_at: trx.fn.now() });
}

export async function insertComment(
  trx: Q,
  c: { projectId: string; stageKey: StageKey; authorId: string; body: string; action: string | null },
): Promise<{ id: string; created_at: Date }> {
  const [row] = await trx('stage_comments')
    .insert({ project_id: c.projectId, stage_key: c.stageKey, author_id: c.authorId, body: c.body, action: c.action })
    .returning(['id', 'created_at']);
  return row;
}

export interface CommentRow {
  id: string;
  stage_key: StageKey;
  author_id: string;
  author_name: string;
  body: string;
  action: string | null;
  created_at: Date;
}

export async function listComments(db: Q, projectId: string, key: StageKey, onlyId?: string): Promise<CommentRow[]> {
  const q = db('stage_comments as c')
    .join('users as u', 'u.id', 'c.author_id')
    .where({ 'c.project_id': projectId, 'c.stage_key': key })
    .orderBy([{ column: 'c.created_at' }, { column: 'c.id' }])
    .select(
      'c.id',
      'c.stage_key',
      'c.author_id',
      'u.display_name as author_name',
      'c.body',
      'c.action',
      'c.created_at',
    );
  if (onlyId) q.andWhere('c.id', onlyId);
  return q;
}
