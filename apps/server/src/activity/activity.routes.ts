import { z } from 'zod';
import { activityQuerySchema, type Activity } from '@trabeate/contracts';
import type { Db } from '../db/db';
import { validate } from '../core/validate';
import { route, type RouteDecl } from '../access/registry';
import { projectRefusal, type Caller } from '../access/policy';
import { listActivity, type ActivityFilters, type ActivityRow } from './activity.repository';

const params = z.object({ projectId: z.uuid() });
const CLIENT_HIDDEN: readonly Activity['objectType'][] = ['deliverable', 'comment'];

export const activityOf = (r: ActivityRow): Activity => ({
  id: r.id,
  at: new Date(r.at).toISOString(),
  actor: r.actor_id ? { id: r.actor_id, displayName: r.actor_name ?? '' } : null,
  action: r.action,
  objectType: r.object_type,
  objectId: r.object_id,
  stageKey: r.stage_key,
  summary: r.summary,
});

export function activityRoutes(db: Db): RouteDecl[] {
  return [
    route(
      'get',
      '/projects/:projectId/activity',
      'project:read',
      validate({ params, query: activityQuerySchema }),
      async (req, res) => {
        const q = res.locals['query'] as ActivityFilters;
        // Uploads and review notes are the firm's work in progress; clients see the stage moves.
        const internal = projectRefusal((req.caller as Caller).role, 'internal') === null;
        const { rows, total } = await listActivity(db, req.project!.id, q, internal ? [] : CLIENT_HIDDEN);
        res.json({ items: rows.map(activityOf), total, page: q.page, pageSize: q.pageSize });
      },
    ),
  ];
}
