import type { Knex } from 'knex';
import type { z } from 'zod';
import type { activityQuerySchema, StageKey } from '@trabeate/contracts';
import type { Db } from '../db/db';

export type ObjectType =
  'project' | 'stage' | 'deliverable' | 'comment' | 'membership' | 'drawing' | 'revision' | 'transmittal';

export interface ActivityInsert {
  firmId: string;
  projectId: string | null;
  actorId: string | null;
  action: string;
  objectType: ObjectType;
  objectId: string;
  stageKey?: StageKey | null;
  summary: string;
  details?: Record<string, unknown>;
}

export interface ActivityRow {
  id: string;
  at: Date;
  actor_id: string | null;
  actor_name: string | null;
  action: string;
  object_type: ObjectType;
  object_id: string;
  stage_key: StageKey | null;
  summary: string;
}

export async function insertActivity(
  db: Db | Knex.Transaction,
  entries: ActivityInsert | ActivityInsert[],
): Promise<void> {
  const list = Array.isArray(entries) ? entries : [entries];
  if (!list.length) return;
  await db('activity').insert(
    list.map((e) => ({
      firm_id: e.firmId,
      project_id: e.projectId,
      actor_id: e.actorId,
      action: e.action,
      object_type: e.objectType,
      object_id: e.objectId,
      stage_key: e.stageKey ?? null,
      summary: e.summary,
      details: JSON.stringify(e.details ?? {}),
    })),
  );
}

export type ActivityFilters = z.output<typeof activityQuerySchema>;

/** One page of a project's activity, newest first, with the total for the same filters. */
export async function listActivity(
  db: Db,
  projectId: string,
  q: ActivityFilters,
  hiddenTypes: readonly string[] = [],
): Promise<{ rows: ActivityRow[]; total: number }> {
  const base = db('activity as a').where('a.project_id', projectId);
  if (hiddenTypes.length) base.whereNotIn('a.object_type', hiddenTypes);
  if (q.objectType) base.andWhere('a.object_type', q.objectType);
  if (q.stageKey) base.andWhere('a.stage_key', q.stageKey);
  if (q.actorId) base.andWhere('a.actor_id', q.actorId);
  // The total rides along as a window count: one round trip instead of two.
  const rows: Array<ActivityRow & { total_count: string }> = await base
    .clone()
    .leftJoin('users as u', 'u.id', 'a.actor_id')
    .orderBy([
      { column: 'a.at', order: 'desc' },
      { column: 'a.id', order: 'desc' },
    ])
    .limit(q.pageSize)
    .offset((q.page - 1) * q.pageSize)
    .select(
      'a.id',
      'a.at',
      'a.actor_id',
      'u.display_name as actor_name',
      'a.action',
      'a.object_type',
      'a.object_id',
      'a.stage_key',
      'a.summary',
      db.raw('count(*) over () as total_count'),
    );
  if (rows.length) return { rows, total: Number(rows[0].total_count) };
  // Past the last page (or nothing matches): the count alone.
  const [{ n }] = q.page > 1 ? await base.clone().count<{ n: string }[]>('* as n') : [{ n: '0' }];
  return { rows: [], total: Number(n) };
}
