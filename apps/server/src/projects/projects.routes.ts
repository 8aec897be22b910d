import type { Request } from 'express';
import { z } from 'zod';
import {
  projectCreateSchema,
  projectListQuerySchema,
  projectPageSchema,
  projectUpdateSchema,
  type ProjectDetail,
  type ProjectList,
} from '@trabeate/contracts';
import type { Db } from '../db/db';
import { HttpError, notFound } from '../core/errors';
import type { ReplyCache } from '../core/reply-cache';
import { validate } from '../core/validate';
import { route, type RouteDecl } from '../access/registry';
import { type Caller } from '../access/policy';
import { insertActivity } from '../activity/activity.repository';
import { listProjects, type ProjectListFilters } from './projects.repository';
import { createProject, listItemOf, projectDetail, projectPage, setArchived, updateProject } from './projects.service';

const callerOf = (req: Request): Caller => req.caller as Caller;
const projectParams = z.object({ projectId: z.uuid() });
const memberParams = z.object({ projectId: z.uuid(), userId: z.uuid() });

/**
 * @param lists replies of the projects list kept while nothing in the firm's lists changes (see
 *   ReplyCache); without one every request reads the database.
 */
export function projectRoutes(db: Db, lists?: ReplyCache): RouteDecl[] {
  return [
    route('get', '/projects', 'signedIn', validate({ query: projectListQuerySchema }), async (req, res) => {
      const q = res.locals['query'] as ProjectListFilters;
      const caller = callerOf(req);
      // Principals see every project of the firm; anyone else what they are on (and may see).
      const key = `${caller.role === 'principal' ? 'principal' : `${caller.role} ${caller.userId}`} ${JSON.stringify(q)}`;
      const kept = lists?.get(caller.firmId, key);
      if (kept !== undefined) {
        res.type('json').send(kept);
        return;
      }
      const generation = lists?.start(caller.firmId);
      const { rows, total } = await listProjects(db, caller, q);
      const body: ProjectList = { items: rows.map(listItemOf), total, page: q.page, pageSize: q.pageSize };
      const text = JSON.stringify(body);
      lists?.keep(caller.firmId, key, generation, text);
      res.type('json').send(text);
    }),
    route('post', '/projects', 'principal', validate({ body: projectCreateSchema }), async (req, res) => {
      const page = await createProject(db, callerOf(req), req.body);
      res.status(201).location(`/api/projects/${page.id}`).json(page);
    }),
    // The short form (team, abilities, finance) that the sign-in shell and the people pages use.
    route('get', '/projects/:projectId', 'project:read', async (req, res) => {
      const { row: _row, ...body } = await projectDetail(db, callerOf(req), req.project!.id);
      res.json(body satisfies ProjectDetail);
    }),
    route('get', '/projects/:projectId/full', 'project:read', validate({ params: projectParams }), async (req, res) => {
      // Shaped by the contract: a field the schema does not name (a comment body, say) never leaves.
      res.json(projectPageSchema.parse(await projectPage(db, callerOf(req), req.project!.id)));
    }),
    route(
      'patch',
      '/projects/:projectId',
      'project:manage',
      validate({ params: projectParams, body: projectUpdateSchema }),
      async (req, res) => {
        res.json(await updateProject(db, callerOf(req), req.project!.id, req.body));
      },
    ),
    route(
      'post',
      '/projects/:projectId/archive',
      'project:manage',
      validate({ params: projectParams }),
      async (req, res) => {
        res.json(await setArchived(db, callerOf(req), req.project!.id, true));
      },
    ),
    route(
      'post',
      '/projects/:projectId/restore',
      'project:manage',
      validate({ params: projectParams }),
      async (req, res) => {
        res.json(await setArchived(db, callerOf(req), req.project!.id, false));
      },
    ),
    route(
      'put',
      '/projects/:projectId/members/:userId',
      'project:manage',
      validate({ params: memberParams }),
      async (req, res) => {
        const caller = callerOf(req);
        const project = req.project!;
        const user = await db('users')
          .where({ id: req.params['userId'], firm_id: caller.firmId })
          .whereNull('disabled_at')
          .first();
        if (!user) throw notFound('No person with this id.');
        if (user.firm_role === 'principal')
          throw new HttpError(409, 'conflict', 'The principal sees every project already.');
        if (!user.firm_role && user.client_organisation_id !== project.client_organisation_id) {
          throw new HttpError(
            409,
            'conflict',
            'This person is a contact of another client organisation; they cannot join this project.',
          );
        }
        await db.transaction(async (trx) => {
          const added = await trx('project_members')
            .insert({ project_id: project.id, user_id: user.id, added_by: caller.userId })
            .onConflict(['project_id', 'user_id'])
            .ignore()
            .returning('user_id');
          if (added.length) {
            await insertActivity(trx, {
              firmId: caller.firmId,
              projectId: project.id,
              actorId: caller.userId,
              action: 'membership.added',
              objectType: 'membership',
              objectId: user.id,
              summary: `${caller.displayName} added ${user.display_name} to the project team`,
            });
          }
        });
        res.status(204).end();
      },
    ),
    route(
      'delete',
      '/projects/:projectId/members/:userId',
      'project:manage',
      validate({ params: memberParams }),
      async (req, res) => {
        const caller = callerOf(req);
        const project = req.project!;
        await db.transaction(async (trx) => {
          const removed = await trx('project_members')
            .where({ project_id: project.id, user_id: req.params['userId'] })
            .del();
          if (!removed) return;
          const user = await trx('users').where({ id: req.params['userId'] }).first('display_name');
          // Stages the person was assigned to are left for the principal to assign again.
          await trx('stages')
            .where({ project_id: project.id, assignee_id: req.params['userId'] })
            .update({ assignee_id: null, updated_at: trx.fn.now() });
          await insertActivity(trx, {
            firmId: caller.firmId,
            projectId: project.id,
            actorId: caller.userId,
            action: 'membership.removed',
            objectType: 'membership',
            objectId: String(req.params['userId']),
            summary: `${caller.displayName} removed ${user?.display_name ?? 'a person'} from the project team`,
          });
        });
        res.status(204).end();
      },
    ),
  ];
}
