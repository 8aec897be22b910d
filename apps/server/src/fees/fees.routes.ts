import type { Request } from 'express';
import { z } from 'zod';
import { feeAgreementWriteSchema, feeVariationCreateSchema } from '@trabeate/contracts';
import type { Db } from '../db/db';
import { validate } from '../core/validate';
import { route, type RouteDecl } from '../access/registry';
import type { Caller } from '../access/policy';
import { addVariation, readAgreement, writeAgreement } from './fees.service';

const callerOf = (req: Request): Caller => req.caller as Caller;
const projectParams = z.object({ projectId: z.uuid() });

export function feeRoutes(db: Db): RouteDecl[] {
  return [
    route(
      'get',
      '/projects/:projectId/fee-agreement',
      'project:manage',
      validate({ params: projectParams }),
      async (req, res) => {
        res.json(await readAgreement(db, req.project!.id));
      },
    ),
    route(
      'put',
      '/projects/:projectId/fee-agreement',
      'project:manage',
      validate({ params: projectParams, body: feeAgreementWriteSchema }),
      async (req, res) => {
        res.json(await writeAgreement(db, callerOf(req), req.project!.id, req.body));
      },
    ),
    route(
      'post',
      '/projects/:projectId/fee-variations',
      'project:manage',
      validate({ params: projectParams, body: feeVariationCreateSchema }),
      async (req, res) => {
        res.status(201).json(await addVariation(db, callerOf(req), req.project!.id, req.body));
      },
    ),
  ];
}
