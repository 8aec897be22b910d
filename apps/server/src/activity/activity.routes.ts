import { z } from 'zod';
import { activityQuerySchema, type Activity } from '@trabeate/contracts';
import type { Db } from '../db/db';
import { validate } from '../core/validate';
import { route, type RouteDecl } from '../access/registry';
import { listActivity, type ActivityFilters, type ActivityRow } from './activity.repository';

const params = z.object({ projectId: z.uuid() });

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
        const seeFinance = req.caller?.role !== 'engineer';
        const { rows, total } = await listActivity(db, req.project!.id, q, { seeFinance });
        res.json({ items: rows.map(activityOf), total, page: q.page, pageSize: q.pageSize });
      },
    ),
  ];
}
