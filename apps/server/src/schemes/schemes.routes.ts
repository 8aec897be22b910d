import type { Request } from 'express';
import { z } from 'zod';
import {
  schemeCreateSchema,
  schemeDuplicateSchema,
  schemeListQuerySchema,
  schemeRenameSchema,
  schemeVersionsQuerySchema,
} from '@trabeate/contracts';
import type { Db } from '../db/db';
import { validate } from '../core/validate';
import { route, type RouteDecl } from '../access/registry';
import type { Caller } from '../access/policy';
import { readDocument } from './scheme-document';
import {
  createScheme,
  duplicateScheme,
  renameScheme,
  restoreVersion,
  saveScheme,
  schemeDetail,
  schemeList,
  setSchemeArchived,
  versionHistory,
  versionOf,
} from './schemes.service';

const callerOf = (req: Request): Caller => req.caller as Caller;
const projectParams = z.object({ projectId: z.uuid() });
const schemeParams = projectParams.extend({ schemeId: z.uuid() });
const versionParams = schemeParams.extend({ version: z.coerce.number().int().min(1).max(2_147_483_647) });
// The document is checked by readDocument, which first upgrades one saved under an older version.
const saveBody = z.object({ baseVersion: z.number().int().min(1), document: z.unknown() });

const BASE = '/projects/:projectId/schemes';
const ids = (req: Request) => [String(req.params['projectId']), String(req.params['schemeId'])] as const;

export function schemeRoutes(db: Db): RouteDecl[] {
  return [
    route(
      'get',
      BASE,
      'project:readSchemes',
      validate({ params: projectParams, query: schemeListQuerySchema }),
      async (req, res) => {
        res.json(await schemeList(db, callerOf(req), req.project!.id, res.locals['query']));
      },
    ),
    route(
      'post',
      BASE,
      'project:editSchemes',
      validate({ params: projectParams, body: schemeCreateSchema }),
      async (req, res) => {
        const scheme = await createScheme(db, callerOf(req), req.project!.id, req.body.name);
        res
          .status(201)
          .location(`/api${BASE.replace(':projectId', scheme.projectId)}/${scheme.id}`)
          .json(scheme);
      },
    ),
    route('get', `${BASE}/:schemeId`, 'project:readSchemes', validate({ params: schemeParams }), async (req, res) => {
      res.json(await schemeDetail(db, callerOf(req), ...ids(req)));
    }),
    route(
      'patch',
      `${BASE}/:schemeId`,
      'project:editSchemes',
      validate({ params: schemeParams, body: schemeRenameSchema }),
      async (req, res) => {
        res.json(await renameScheme(db, callerOf(req), ...ids(req), req.body.name));
      },
    ),
    route(
      'post',
      `${BASE}/:schemeId/duplicate`,
      'project:editSchemes',
      validate({ params: schemeParams, body: schemeDuplicateSchema }),
      async (req, res) => {
        const scheme = await duplicateScheme(db, callerOf(req), ...ids(req), req.body.name);
        res
          .status(201)
          .location(`/api${BASE.replace(':projectId', scheme.projectId)}/${scheme.id}`)
          .json(scheme);
      },
    ),
    route(
      'post',
      `${BASE}/:schemeId/archive`,
      'project:editSchemes',
      validate({ params: schemeParams }),
      async (req, res) => {
        res.json(await setSchemeArchived(db, callerOf(req), ...ids(req), true));
      },
    ),
    route(
      'post',
      `${BASE}/:schemeId/restore`,
      'project:editSchemes',
      validate({ params: schemeParams }),
      async (req, res) => {
        res.json(await setSchemeArchived(db, callerOf(req), ...ids(req), false));
      },
    ),
    route(
      'put',
      `${BASE}/:schemeId/document`,
      'project:editSchemes',
      validate({ params: schemeParams, body: saveBody }),
      async (req, res) => {
        const document = readDocument(req.body.document);
        const outcome = await saveScheme(db, callerOf(req), ...ids(req), {
          baseVersion: req.body.baseVersion,
          document,
        });
        if ('conflict' in outcome) res.status(409).json(outcome.conflict);
        else res.json(outcome.saved);
      },
    ),
    route(
      'get',
      `${BASE}/:schemeId/versions`,
      'project:readSchemes',
      validate({ params: schemeParams, query: schemeVersionsQuerySchema }),
      async (req, res) => {
        res.json(await versionHistory(db, ...ids(req), res.locals['query']));
      },
    ),
    route(
      'get',
      `${BASE}/:schemeId/versions/:version`,
      'project:readSchemes',
      validate({ params: versionParams }),
      async (req, res) => {
        res.json(await versionOf(db, ...ids(req), Number(req.params['version'])));
      },
    ),
    route(
      'post',
      `${BASE}/:schemeId/versions/:version/restore`,
      'project:editSchemes',
      validate({ params: versionParams }),
      async (req, res) => {
        res.status(201).json(await restoreVersion(db, callerOf(req), ...ids(req), Number(req.params['version'])));
      },
    ),
  ];
}
