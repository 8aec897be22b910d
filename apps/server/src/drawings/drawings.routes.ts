import { randomUUID } from 'node:crypto';
import { pipeline } from 'node:stream/promises';
import type { Request, RequestHandler, Response } from 'express';
import { z } from 'zod';
import {
  drawingCreateSchema,
  drawingListQuerySchema,
  drawingSettingsSchema,
  nextRevisionQuerySchema,
  revisionCreateSchema,
  revisionPatchSchema,
  revisionTransitionSchema,
} from '@trabeate/contracts';
import type { Db } from '../db/db';
import { HttpError, notFound } from '../core/errors';
import { validate } from '../core/validate';
import { route, type RouteDecl } from '../access/registry';
import type { Caller } from '../access/policy';
import { contentDisposition, type ObjectStore, type StoredObject } from '../storage';
import { deliverableUpload, uploadedFile } from '../uploads';
import { getFile, logDownload, type DrawingListFilters } from './drawings.repository';
import {
  createDrawing,
  deleteFile,
  fileCheck,
  getDrawing,
  listDrawings,
  outOnly,
  patchRevision,
  proposeNumber,
  proposeRevision,
  readSettings,
  recordFile,
  registerRevision,
  transitionRevision,
  writeSettings,
} from './drawings.service';
import { registerCsv, registerPdf } from './register-export';
import { restampSheet } from '../scheme-outputs/scheme-outputs.service';

const callerOf = (req: Request): Caller => req.caller as Caller;
const projectParams = z.object({ projectId: z.uuid() });
const drawingParams = projectParams.extend({ drawingId: z.uuid() });
const revisionParams = projectParams.extend({ revisionId: z.uuid() });
const fileParams = revisionParams.extend({ fileId: z.uuid() });
const fileRoleQuery = z.object({ role: z.enum(['pdf', 'source']).default('pdf') });
const exportQuery = drawingListQuerySchema.omit({ page: true, pageSize: true });

const unavailable = () => new HttpError(503, 'service_unavailable', 'File storage is not configured on this server.');

/** The address a download came from, for the log. */
export const clientAddress = (req: Request): string | null => req.ip ?? req.socket.remoteAddress ?? null;

/** Streams a stored object to the response; a reader that goes away mid-stream only ends it. */
export async function sendObject(
  req: Request,
  res: Response,
  object: StoredObject,
  meta: { fileName: string; contentType: string; size: number; sha256?: string },
): Promise<void> {
  res.setHeader('Content-Type', meta.contentType);
  res.setHeader('Content-Length', String(object.contentLength ?? meta.size));
  res.setHeader('Content-Disposition', contentDisposition(meta.fileName));
  res.setHeader('Cache-Control', 'private, no-store');
  if (meta.sha256) res.setHeader('X-Content-SHA256', meta.sha256);
  try {
    await pipeline(object.body, res);
  } catch (err) {
    object.body.destroy();
    if (!res.headersSent) throw err;
    req.log?.warn({ err: (err as Error).message }, 'download ended early');
    res.destroy();
  }
}

export function drawingRoutes(db: Db, store: ObjectStore | undefined, maxBytes: number): RouteDecl[] {
  const upload: RequestHandler = store
    ? deliverableUpload({
        store,
        maxBytes,
        // Ids only: the person's file name stays in the database and in Content-Disposition.
        keyFor: (req) => `drawings/${req.project!.id}/${String(req.params['revisionId'])}/${randomUUID()}`,
      })
    : () => {
        throw unavailable();
      };

  return [
    route('get', '/drawing-settings', 'firm', async (req, res) => {
      res.json(await readSettings(db, callerOf(req).firmId));
    }),
    route('put', '/drawing-settings', 'principal', validate({ body: drawingSettingsSchema }), async (req, res) => {
      res.json(await writeSettings(db, callerOf(req).firmId, req.body));
    }),
    route(
      'get',
      '/projects/:projectId/drawings',
      'project:read',
      validate({ params: projectParams, query: drawingListQuerySchema }),
      async (req, res) => {
        res.json(await listDrawings(db, callerOf(req), req.project!.id, res.locals['query'] as DrawingListFilters));
      },
    ),
    route(
      'post',
      '/projects/:projectId/drawings',
      'project:work',
      validate({ params: projectParams, body: drawingCreateSchema }),
      async (req, res) => {
        res.status(201).json(await createDrawing(db, callerOf(req), req.project!.id, req.body));
      },
    ),
    route(
      'get',
      '/projects/:projectId/drawings/next-number',
      'project:work',
      validate({ params: projectParams }),
      async (req, res) => {
        res.json(await proposeNumber(db, callerOf(req), req.project!.id));
      },
    ),
    route(
      'get',
      '/projects/:projectId/drawings/export.csv',
      'project:work',
      validate({ params: projectParams, query: exportQuery }),
      async (req, res) => {
        const { fileName, body } = await registerCsv(db, req.project!.id, res.locals['query']);
        res.setHeader('Content-Type', 'text/csv; charset=utf-8');
        res.setHeader('Content-Disposition', contentDisposition(fileName));
        res.send(body);
      },
    ),
    route(
      'get',
      '/projects/:projectId/drawings/export.pdf',
      'project:work',
      validate({ params: projectParams, query: exportQuery }),
      async (req, res) => {
        const { fileName, body } = await registerPdf(db, req.project!.id, res.locals['query']);
        res.setHeader('Content-Type', 'application/pdf');
        res.setHeader('Content-Disposition', contentDisposition(fileName));
        res.send(body);
      },
    ),
    route(
      'get',
      '/projects/:projectId/drawings/:drawingId',
      'project:read',
      validate({ params: drawingParams }),
      async (req, res) => {
        res.json(await getDrawing(db, callerOf(req), req.project!.id, String(req.params['drawingId'])));
      },
    ),
    route(
      'get',
      '/projects/:projectId/drawings/:drawingId/next-revision',
      'project:work',
      validate({ params: drawingParams, query: nextRevisionQuerySchema }),
      async (req, res) => {
        const q = res.locals['query'] as z.output<typeof nextRevisionQuerySchema>;
        res.json(await proposeRevision(db, callerOf(req), req.project!.id, String(req.params['drawingId']), q.series));
      },
    ),
    route(
      'post',
      '/projects/:projectId/drawings/:drawingId/revisions',
      'project:work',
      validate({ params: drawingParams, body: revisionCreateSchema }),
      async (req, res) => {
        const created = await registerRevision(
          db,
          callerOf(req),
          req.project!.id,
          String(req.params['drawingId']),
          req.body,
        );
        res.status(201).json(created);
      },
    ),
    route(
      'patch',
      '/projects/:projectId/revisions/:revisionId',
      'project:work',
      validate({ params: revisionParams, body: revisionPatchSchema }),
      async (req, res) => {
        res.json(await patchRevision(db, callerOf(req), req.project!.id, String(req.params['revisionId']), req.body));
      },
    ),
    route(
      'post',
      '/projects/:projectId/revisions/:revisionId/transitions',
      'project:work',
      validate({ params: revisionParams, body: revisionTransitionSchema }),
      async (req, res) => {
        res.json(
          await transitionRevision(
            db,
            callerOf(req),
            req.project!.id,
            String(req.params['revisionId']),
            req.body.action,
            // a plan sheet drawn from a scheme takes the checker's and approver's names into its PDF
            store ? (trx, id) => restampSheet(trx, store, id) : undefined,
          ),
        );
      },
    ),
    route(
      'post',
      '/projects/:projectId/revisions/:revisionId/files',
      'project:work',
      validate({ params: revisionParams, query: fileRoleQuery }),
      async (req, res, next) => {
        await fileCheck(db, req.project!.id, String(req.params['revisionId']), res.locals['query'].role);
        next();
      },
      upload,
      async (req, res) => {
        const file = uploadedFile(req);
        try {
          const role = (res.locals['query'] as z.output<typeof fileRoleQuery>).role;
          const { file: created } = await recordFile(
            db,
            callerOf(req),
            req.project!.id,
            String(req.params['revisionId']),
            role,
            file,
          );
          res.status(201).location(created.downloadUrl).json(created);
        } catch (err) {
          await store?.remove(file.key).catch(() => undefined);
          throw err;
        }
      },
    ),
    route(
      'put',
      '/projects/:projectId/revisions/:revisionId/files/:fileId',
      'project:work',
      validate({ params: fileParams }),
      async (req, res, next) => {
        res.locals['role'] = await fileCheck(
          db,
          req.project!.id,
          String(req.params['revisionId']),
          'pdf',
          String(req.params['fileId']),
        );
        next();
      },
      upload,
      async (req, res) => {
        const file = uploadedFile(req);
        let replacedKey: string | undefined;
        let created;
        try {
          ({ file: created, replacedKey } = await recordFile(
            db,
            callerOf(req),
            req.project!.id,
            String(req.params['revisionId']),
            res.locals['role'] as 'pdf' | 'source',
            file,
            String(req.params['fileId']),
          ));
        } catch (err) {
          await store?.remove(file.key).catch(() => undefined);
          throw err;
        }
        // Committed: the old object is no longer referenced; failing to remove it loses nothing.
        if (replacedKey) await store?.remove(replacedKey).catch(() => undefined);
        res.status(200).location(created.downloadUrl).json(created);
      },
    ),
    route(
      'delete',
      '/projects/:projectId/revisions/:revisionId/files/:fileId',
      'project:work',
      validate({ params: fileParams }),
      async (req, res) => {
        const key = await deleteFile(
          db,
          callerOf(req),
          req.project!.id,
          String(req.params['revisionId']),
          String(req.params['fileId']),
        );
        await store?.remove(key).catch(() => undefined);
        res.status(204).end();
      },
    ),
    route(
      'get',
      '/projects/:projectId/revisions/:revisionId/files/:fileId/download',
      'project:read',
      validate({ params: fileParams }),
      async (req, res) => {
        if (!store) throw unavailable();
        const caller = callerOf(req);
        const f = await getFile(db, req.project!.id, String(req.params['revisionId']), String(req.params['fileId']));
        if (!f || (outOnly(caller) && !['issued', 'superseded'].includes(f.state)))
          throw notFound('No file with this id.');
        const object = await store.getStream(f.object_key);
        await logDownload(db, {
          project_id: f.project_id,
          what: 'file',
          revision_file_id: f.id,
          user_id: caller.userId,
          ip: clientAddress(req),
        });
        await sendObject(req, res, object, {
          fileName: f.file_name,
          contentType: f.content_type,
          size: Number(f.size_bytes),
          sha256: f.sha256,
        });
      },
    ),
  ];
}
