import type { Request, Response } from 'express';
import { z } from 'zod';
import { signedLinkQuerySchema, transmittalCreateSchema } from '@trabeate/contracts';
import { HttpError, notFound } from '../core/errors';
import { validate } from '../core/validate';
import { route, type RouteDecl } from '../access/registry';
import type { Caller } from '../access/policy';
import { contentDisposition } from '../storage';
import { filesOf, logDownload } from '../drawings/drawings.repository';
import { clientAddress, sendObject } from '../drawings/drawings.routes';
import { transmittalReference } from '../drawings/format';
import {
  getTransmittal,
  getTransmittalById,
  itemsOf,
  transmittalFirmDates,
  type TransmittalRow,
} from './transmittals.repository';
import {
  acknowledge,
  downloadLog,
  issueTransmittal,
  listForCaller,
  readTransmittal,
  recipientFilter,
  type TransmittalDeps,
} from './transmittals.service';
import { verifyLink } from './signed-links';
import { streamZip, zipPart } from './transmittal-zip';

const callerOf = (req: Request): Caller => req.caller as Caller;
const projectParams = z.object({ projectId: z.uuid() });
const transmittalParams = projectParams.extend({ transmittalId: z.uuid() });
const sharedParams = z.object({ transmittalId: z.uuid(), item: z.union([z.uuid(), z.enum(['zip', 'sheet'])]) });
const unavailable = () => new HttpError(503, 'service_unavailable', 'File storage is not configured on this server.');

interface Who {
  user_id?: string | null;
  recipient_id?: string | null;
}

async function sendSheet(deps: TransmittalDeps, req: Request, res: Response, t: TransmittalRow, who: Who) {
  if (!deps.store) throw unavailable();
  if (!t.sheet_object_key) throw notFound('This transmittal has no sheet.');
  const object = await deps.store.getStream(t.sheet_object_key);
  await logDownload(deps.db, {
    project_id: t.project_id,
    transmittal_id: t.id,
    what: 'sheet',
    ip: clientAddress(req),
    ...who,
  });
  await sendObject(req, res, object, {
    fileName: `${transmittalReference(t.project_reference, t.number)}.pdf`,
    contentType: 'application/pdf',
    size: Number(t.sheet_size_bytes ?? 0),
  });
}

/** Every file of the transmittal, and its sheet, as one ZIP streamed from storage. */
async function sendZip(deps: TransmittalDeps, req: Request, res: Response, t: TransmittalRow, who: Who) {
  const store = deps.store;
  if (!store) throw unavailable();
  const items = await itemsOf(deps.db, t.id);
  const files = await filesOf(
    deps.db,
    items.map((i) => i.revision_id),
  );
  const reference = transmittalReference(t.project_reference, t.number);
  const entries = items.flatMap((i) =>
    files
      .filter((f) => f.revision_id === i.revision_id)
      .map((f) => ({
        name: `${zipPart(`${i.number} rev ${i.code}`)}/${zipPart(f.file_name)}`,
        key: f.object_key,
        size: Number(f.size_bytes),
      })),
  );
  const extra: Array<{ name: string; data: Buffer }> = [];
  if (t.sheet_object_key) {
    // The sheet is a page or two: read it first so the archive opens with it.
    const sheet = await store.getStream(t.sheet_object_key);
    const chunks: Buffer[] = [];
    for await (const c of sheet.body) chunks.push(c as Buffer);
    extra.push({ name: `${zipPart(reference)}.pdf`, data: Buffer.concat(chunks) });
  }
  const zip = streamZip(store, entries, extra, new Date(t.issued_at));
  const size = await zip.size;
  await logDownload(deps.db, {
    project_id: t.project_id,
    transmittal_id: t.id,
    what: 'zip',
    ip: clientAddress(req),
    ...who,
  });
  res.setHeader('Content-Type', 'application/zip');
  if (size > 0) res.setHeader('Content-Length', String(size));
  res.setHeader('Content-Disposition', contentDisposition(`${reference}.zip`));
  res.setHeader('Cache-Control', 'private, no-store');
  res.on('close', () => {
    if (!res.writableFinished) zip.abort();
  });
  await new Promise<void>((resolve) => {
    zip.stream.on('error', (err: Error) => {
      req.log?.warn({ err: err.message, transmittalId: t.id }, 'zip download ended early');
      res.destroy();
      resolve();
    });
    res.on('close', () => resolve());
    zip.stream.pipe(res);
  });
}

export function transmittalRoutes(deps: TransmittalDeps): RouteDecl[] {
  const { db } = deps;
  const visible = async (req: Request) => {
    const t = await getTransmittal(
      db,
      req.project!.id,
      String(req.params['transmittalId']),
      recipientFilter(callerOf(req)),
    );
    if (!t) throw notFound('No transmittal with this id.');
    return t;
  };

  return [
    route(
      'get',
      '/projects/:projectId/transmittals',
      'project:read',
      validate({ params: projectParams }),
      async (req, res) => {
        res.json(await listForCaller(db, callerOf(req), req.project!.id));
      },
    ),
    route(
      'post',
      '/projects/:projectId/transmittals',
      'project:manage',
      validate({ params: projectParams, body: transmittalCreateSchema }),
      async (req, res) => {
        res.status(201).json(await issueTransmittal(deps, callerOf(req), req.project!.id, req.body));
      },
    ),
    route(
      'get',
      '/projects/:projectId/transmittals/:transmittalId',
      'project:read',
      validate({ params: transmittalParams }),
      async (req, res) => {
        res.json(await readTransmittal(db, callerOf(req), req.project!.id, String(req.params['transmittalId'])));
      },
    ),
    route(
      'get',
      '/projects/:projectId/transmittals/:transmittalId/sheet',
      'project:read',
      validate({ params: transmittalParams }),
      async (req, res) => {
        await sendSheet(deps, req, res, await visible(req), { user_id: callerOf(req).userId });
      },
    ),
    route(
      'get',
      '/projects/:projectId/transmittals/:transmittalId/zip',
      'project:read',
      validate({ params: transmittalParams }),
      async (req, res) => {
        await sendZip(deps, req, res, await visible(req), { user_id: callerOf(req).userId });
      },
    ),
    route(
      'post',
      '/projects/:projectId/transmittals/:transmittalId/acknowledge',
      'project:acknowledge',
      validate({ params: transmittalParams }),
      async (req, res) => {
        res.json(await acknowledge(db, callerOf(req), req.project!.id, String(req.params['transmittalId'])));
      },
    ),
    route(
      'get',
      '/projects/:projectId/transmittals/:transmittalId/downloads',
      'project:manage',
      validate({ params: transmittalParams }),
      async (req, res) => {
        res.json(await downloadLog(db, req.project!.id, String(req.params['transmittalId'])));
      },
    ),
    // Outside recipients: no session; the signed link is the permission (see signed-links.ts).
    route(
      'get',
      '/shared/transmittals/:transmittalId/:item',
      'public',
      validate({ params: sharedParams, query: signedLinkQuerySchema }),
      async (req, res) => {
        const q = res.locals['query'] as z.output<typeof signedLinkQuerySchema>;
        const transmittalId = String(req.params['transmittalId']);
        const item = String(req.params['item']);
        // an expired link is told in the firm's own date format and zone
        const dates = Number(q.e) * 1000 <= Date.now() ? await transmittalFirmDates(db, transmittalId) : undefined;
        verifyLink(
          deps.linkSecret,
          { transmittalId, recipientId: q.r, item, expires: Number(q.e) },
          q.s,
          Date.now(),
          dates,
        );
        const t = await getTransmittalById(db, transmittalId);
        const recipient = t
          ? await db('transmittal_recipients').where({ id: q.r, transmittal_id: transmittalId }).first('id')
          : undefined;
        if (!t || !recipient) throw notFound('This transmittal no longer exists.');
        const who = { recipient_id: recipient.id as string };
        if (item === 'sheet') return sendSheet(deps, req, res, t, who);
        if (item === 'zip') return sendZip(deps, req, res, t, who);
        if (!deps.store) throw unavailable();
        const file = await db('revision_files as f')
          .join('transmittal_items as i', 'i.revision_id', 'f.revision_id')
          .where({ 'i.transmittal_id': transmittalId, 'f.id': item })
          .first('f.*');
        if (!file) throw notFound('No such file in this transmittal.');
        const object = await deps.store.getStream(file.object_key);
        await logDownload(db, {
          project_id: t.project_id,
          transmittal_id: t.id,
          revision_file_id: file.id,
          what: 'file',
          ip: clientAddress(req),
          ...who,
        });
        await sendObject(req, res, object, {
          fileName: file.file_name,
          contentType: file.content_type,
          size: Number(file.size_bytes),
          sha256: file.sha256,
        });
      },
    ),
  ];
}
