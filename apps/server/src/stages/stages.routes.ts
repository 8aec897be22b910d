import type { Request } from 'express';
import { z } from 'zod';
import {
  commentCreateSchema,
  stageKeySchema,
  stagePatchSchema,
  stageSchema,
  stageSubmissionListSchema,
  stageTransitionSchema,
  type StageKey,
} from '@trabeate/contracts';
import type { Db } from '../db/db';
import { validate } from '../core/validate';
import { route, type RouteDecl } from '../access/registry';
import type { Caller } from '../access/policy';
import type { Notices } from '../notices/notices';
import { listComments, listStages } from './stages.repository';
import { listSubmissions } from './stage-submissions';
import { addComment, commentOf, patchStage, stageOf, transition } from './stages.service';

const callerOf = (req: Request): Caller => req.caller as Caller;
const projectParams = z.object({ projectId: z.uuid() });
const stageParams = z.object({ projectId: z.uuid(), stageKey: stageKeySchema });
const keyOf = (req: Request) => req.params['stageKey'] as StageKey;

export function stageRoutes(db: Db, notices: Notices): RouteDecl[] {
  const archived = async (projectId: string) =>
    Boolean((await db('projects').where({ id: projectId }).first('archived_at'))?.archived_at);
  return [
    route(
      'get',
      '/projects/:projectId/stages',
      'project:read',
      validate({ params: projectParams }),
      async (req, res) => {
        const id = req.project!.id;
        const isArchived = await archived(id);
        res.json(
          stageSchema.array().parse((await listStages(db, id)).map((s) => stageOf(s, callerOf(req), isArchived))),
        );
      },
    ),
    route(
      'patch',
      '/projects/:projectId/stages/:stageKey',
      'project:manage',
      validate({ params: stageParams, body: stagePatchSchema }),
      async (req, res) => {
        res.json(await patchStage(db, callerOf(req), req.project!.id, keyOf(req), req.body));
      },
    ),
    route(
      'post',
      '/projects/:projectId/stages/:stageKey/transitions',
      'project:work',
      validate({ params: stageParams, body: stageTransitionSchema }),
      async (req, res) => {
        res.json(await transition(db, notices, callerOf(req), req.project!.id, keyOf(req), req.body));
      },
    ),
    route(
      'get',
      '/projects/:projectId/stages/:stageKey/submissions',
      // Checks and justifications are the firm's review: clients see the stage's progress only.
      'project:internal',
      validate({ params: stageParams }),
      async (req, res) => {
        res.json(stageSubmissionListSchema.parse(await listSubmissions(db, req.project!.id, keyOf(req))));
      },
    ),
    route(
      'get',
      '/projects/:projectId/stages/:stageKey/comments',
      'project:internal',
      validate({ params: stageParams }),
      async (req, res) => {
        res.json((await listComments(db, req.project!.id, keyOf(req))).map(commentOf));
      },
    ),
    route(
      'post',
      '/projects/:projectId/stages/:stageKey/comments',
      'project:work',
      validate({ params: stageParams, body: commentCreateSchema }),
      async (req, res) => {
        res.status(201).json(await addComment(db, callerOf(req), req.project!.id, keyOf(req), req.body.body));
      },
    ),
  ];
}
