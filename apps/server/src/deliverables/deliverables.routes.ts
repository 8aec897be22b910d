import { randomUUID } from 'node:crypto';
import { pipeline } from 'node:stream/promises';
import type { Request, RequestHandler } from 'express';
import { z } from 'zod';
import { stageKeySchema, type StageKey } from '@trabeate/contracts';
import type { Db } from '../db/db';
import { HttpError, notFound } from '../core/errors';
import { validate } from '../core/validate';
import { route, type RouteDecl } from '../access/registry';
import type { Caller } from '../access/policy';
import { contentDisposition, type ObjectStore } from '../storage';
import { deliverableUpload, uploadedFile } from '../uploads';
import { getDeliverable, listDeliverables } from './deliverables.repository';
import { deliverableOf, recordUpload, uploadCheck } from './deliverables.service';

const callerOf = (req: Request): Caller => req.caller as Caller;
const stageParams = z.object({ projectId: z.uuid(), stageKey: stageKeySchema });
const fileParams = z.object({ projectId: z.uuid(), deliverableId: z.uuid() });
const keyOf = (req: Request) => req.params['stageKey'] as StageKey;

const noStore: RequestHandler = () => {
  throw new HttpError(503, 'service_unavailable', 'File storage is not configured on this server.');
};

export function deliverableRoutes(db: Db, store: ObjectStore | undefined, maxBytes: number): RouteDecl[] {
  const upload = store
    ? deliverableUpload({
        store,
        maxBytes,
        // Ids only: a fresh id per upload, so a re-upload never lands on the old object, and no
        // name a person typed reaches storage. Older rows keep their stored key (reads use it).
        keyFor: (req) => `projects/${req.project!.id}/stages/${keyOf(req)}/${randomUUID()}`,
      })
    : noStore;

  return [
    route(
      'get',
      '/projects/:projectId/stages/:stageKey/deliverables',
      'project:internal',
      validate({ params: stageParams }),
      async (req, res) => {
        res.json((await listDeliverables(db, req.project!.id, keyOf(req))).map(deliverableOf));
      },
    ),
    route(
      'post',
      '/projects/:projectId/stages/:stageKey/deliverables',
      'project:work',
      validate({ params: stageParams }),
      // Refuse before a byte is streamed when the stage cannot take files now.
      async (req, _res, next) => {
        await uploadCheck(db, req.project!.id, keyOf(req));
        next();
      },
      upload,
      async (req, res) => {
        const file = uploadedFile(req);
        try {
          const created = await recordUpload(db, callerOf(req), req.project!.id, keyOf(req), file);
          res.status(201).location(created.downloadUrl).json(created);
        } catch (err) {
          // Nothing is kept for an upload the database did not record.
          await store?.remove(file.key).catch(() => undefined);
          throw err;
        }
      },
    ),
    route(
      'get',
      '/projects/:projectId/deliverables/:deliverableId/download',
      'project:internal',
      validate({ params: fileParams }),
      async (req, res) => {
        if (!store) throw new HttpError(503, 'service_unavailable', 'File storage is not configured on this server.');
        const row = await getDeliverable(db, req.project!.id, String(req.params['deliverableId']));
        if (!row) throw notFound('No file with this id.');
        const object = await store!.getStream(row.object_key);
        res.setHeader('Content-Type', row.content_type);
        res.setHeader('Content-Length', String(object.contentLength ?? row.size_bytes));
        res.setHeader('Content-Disposition', contentDisposition(row.file_name));
        res.setHeader('Cache-Control', 'private, no-store');
        res.setHeader('ETag', `"${row.sha256}"`);
        res.setHeader('X-Content-SHA256', row.sha256);
        try {
          await pipeline(object.body, res);
        } catch (err) {
          // The reader went away, or storage failed mid-stream: nothing more can be said to the client.
          object.body.destroy();
          if (!res.headersSent) throw err;
          req.log?.warn({ err: (err as Error).message, deliverableId: row.id }, 'download ended early');
          res.destroy();
        }
      },
    ),
  ];
}
