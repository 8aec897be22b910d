import { randomUUID } from 'node:crypto';
import { Readable } from 'node:stream';
import {
  PURPOSE_LABELS,
  type DownloadLogEntry,
  type Transmittal,
  type TransmittalListItem,
  type transmittalCreateSchema,
} from '@trabeate/contracts';
import type { z } from 'zod';
import type { Db } from '../db/db';
import { HttpError, notFound } from '../core/errors';
import type { Caller } from '../access/policy';
import { insertActivity } from '../activity/activity.repository';
import { lockProject } from '../projects/projects.repository';
import type { Notices } from '../notices/notices';
import type { ObjectStore } from '../storage';
import { filesOf, type RevisionFileRow } from '../drawings/drawings.repository';
import { fileOf } from '../drawings/drawings.service';
import { transmittalReference } from '../drawings/format';
import { printDayTime } from '../look/print-look';
import { transmittalSheet } from '../drawings/transmittal-sheet';
import { linkQuery } from './signed-links';
import {
  downloadsOf,
  getTransmittal,
  itemsOf,
  listTransmittals,
  recipientsOf,
  type TransmittalRow,
} from './transmittals.repository';

type TransmittalCreate = z.output<typeof transmittalCreateSchema>;

/** Outside recipients' links work this long (a contractor downloads within days, not months). */
export const LINK_TTL_DAYS = 14;

export interface TransmittalDeps {
  db: Db;
  store: ObjectStore | undefined;
  notices: Notices;
  linkSecret: Buffer;
  publicUrl: string;
}

const conflict = (message: string) => new HttpError(409, 'conflict', message);
const badRequest = (message: string, field: string) =>
  new HttpError(400, 'validation_failed', message, { [field]: [message] });
/** A client contact sees only transmittals sent to them; the firm sees all. */
export const recipientFilter = (caller: Caller) => (caller.role === 'client' ? caller.userId : null);

export const sheetKey = (projectId: string, transmittalId: string) =>
  `transmittals/${projectId}/${transmittalId}/sheet`;

export async function readTransmittal(db: Db, caller: Caller, projectId: string, id: string): Promise<Transmittal> {
  const row = await getTransmittal(db, projectId, id, recipientFilter(caller));
  if (!row) throw notFound('No transmittal with this id.');
  return transmittalOf(db, caller, row);
}

async function transmittalOf(db: Db, caller: Caller, t: TransmittalRow): Promise<Transmittal> {
  const items = await itemsOf(db, t.id);
  const files = await filesOf(
    db,
    items.map((i) => i.revision_id),
  );
  const recipients = await recipientsOf(db, t.id);
  const mine = recipients.find((r) => r.user_id === caller.userId);
  const base = `/api/projects/${t.project_id}/transmittals/${t.id}`;
  return {
    id: t.id,
    number: t.number,
    reference: transmittalReference(t.project_reference, t.number),
    purpose: t.purpose,
    note: t.note,
    issuedBy: { id: t.issued_by, displayName: t.issuer_name },
    issuedAt: new Date(t.issued_at).toISOString(),
    linksExpireAt: new Date(t.links_expire_at).toISOString(),
    items: items.map((i) => ({
      revisionId: i.revision_id,
      drawingId: i.drawing_id,
      number: i.number,
      title: i.title,
      code: i.code,
      suitability: i.suitability,
      purpose: i.purpose,
      date: i.revision_date,
      state: i.state,
      files: files.filter((f) => f.revision_id === i.revision_id).map(fileOf),
    })),
    // A client contact sees their own receipt, not who else the firm sent it to.
    recipients: recipients
      .filter((r) => caller.role !== 'client' || r.user_id === caller.userId)
      .map((r) => ({
        id: r.id,
        email: r.email,
        name: r.name,
        userId: r.user_id,
        acknowledgedAt: r.acknowledged_at ? new Date(r.acknowledged_at).toISOString() : null,
      })),
    sheetUrl: `${base}/sheet`,
    zipUrl: `${base}/zip`,
    myAcknowledgement: mine
      ? { acknowledgedAt: mine.acknowledged_at ? new Date(mine.acknowledged_at).toISOString() : null }
      : null,
  };
}

export async function listForCaller(db: Db, caller: Caller, projectId: string): Promise<TransmittalListItem[]> {
  const rows = await listTransmittals(db, projectId, recipientFilter(caller));
  const mine =
    caller.role === 'client'
      ? new Map(
          (
            await db('transmittal_recipients')
              .whereIn(
                'transmittal_id',
                rows.map((r) => r.id),
              )
              .where('user_id', caller.userId)
              .select('transmittal_id', 'acknowledged_at')
          ).map((r: { transmittal_id: string; acknowledged_at: Date | null }) => [r.transmittal_id, r.acknowledged_at]),
        )
      : new Map<string, Date | null>();
  return rows.map((t) => ({
    id: t.id,
    number: t.number,
    reference: transmittalReference(t.project_reference, t.number),
    purpose: t.purpose,
    issuedAt: new Date(t.issued_at).toISOString(),
    myAcknowledgement: mine.has(t.id)
      ? { acknowledgedAt: mine.get(t.id) ? new Date(mine.get(t.id)!).toISOString() : null }
      : null,
    itemCount: t.item_count,
    recipientCount: t.recipient_count,
    acknowledgedCount: t.acknowledged_count,
  }));
}

/**
 * Issues approved revisions to recipients, all in one transaction: the transmittal and its
 * number, its items and recipients, each revision marked issued (and the drawing's previously
 * issued revision superseded), the sheet stored, and one queued e-mail per recipient. A failure
 * anywhere leaves nothing behind (the sheet object is removed again).
 */
export async function issueTransmittal(
  deps: TransmittalDeps,
  caller: Caller,
  projectId: string,
  body: TransmittalCreate,
): Promise<Transmittal> {
  const { db, store, notices } = deps;
  if (!store) throw new HttpError(503, 'service_unavailable', 'File storage is not configured on this server.');
  const id = randomUUID();
  const key = sheetKey(projectId, id);
  let stored = false;
  try {
    await db.transaction(async (trx) => {
      const project = await lockProject(trx, projectId);
      if (project.archived_at) throw conflict('This project is archived; restore it before issuing drawings.');
      const revisionIds = [...new Set(body.revisionIds)];
      const revisions: Array<{
        id: string;
        drawing_id: string;
        code: string;
        state: string;
        suitability: string;
        purpose: TransmittalCreate['purpose'];
        revision_date: string;
        number: string;
        title: string;
      }> = await trx('drawing_revisions as r')
        .join('drawings as d', 'd.id', 'r.drawing_id')
        .where('r.project_id', projectId)
        .whereIn('r.id', revisionIds)
        .forUpdate('r')
        .orderByRaw('lower(d.number)')
        .select(
          'r.id',
          'r.drawing_id',
          'r.code',
          'r.state',
          'r.suitability',
          'r.purpose',
          trx.raw(`to_char(r.revision_date, 'YYYY-MM-DD') as revision_date`),
          'd.number',
          'd.title',
        );
      if (revisions.length !== revisionIds.length)
        throw badRequest('One or more of the chosen revisions is not a revision of this project.', 'body.revisionIds');
      const notReady = revisions.filter((r) => r.state !== 'approved');
      if (notReady.length)
        throw conflict(
          `Only approved revisions can be issued: ${notReady.map((r) => `${r.number} revision ${r.code} is ${r.state}`).join('; ')}.`,
        );

      const contactIds = [...new Set(body.contactIds)];
      const contacts: Array<{ id: string; email: string; display_name: string }> = contactIds.length
        ? await trx('users as u')
            .join('project_members as m', 'm.user_id', 'u.id')
            .where('m.project_id', projectId)
            .where('u.client_organisation_id', project.client_organisation_id)
            .whereNull('u.disabled_at')
            .whereIn('u.id', contactIds)
            .select('u.id', 'u.email', 'u.display_name')
        : [];
      if (contacts.length !== contactIds.length)
        throw badRequest("Recipients with accounts must be this project's client contacts.", 'body.contactIds');
      const known = new Set(contacts.map((c) => c.email.toLowerCase()));
      const externals = [...new Set(body.externalEmails.map((e) => e.trim()))].filter((e) => {
        const lower = e.toLowerCase();
        if (known.has(lower)) return false;
        known.add(lower);
        return true;
      });
      if (!contacts.length && !externals.length)
        throw badRequest('Choose at least one recipient: a client contact or an outside address.', 'body.contactIds');

      const last = await trx('transmittals')
        .where({ project_id: projectId })
        .max<{ n: number | null }>('number as n')
        .first();
      const number = (last?.n ?? 0) + 1;
      const issuedAt = new Date();
      const expires = new Date(issuedAt.getTime() + LINK_TTL_DAYS * 86_400_000);
      await trx('transmittals').insert({
        id,
        firm_id: caller.firmId,
        project_id: projectId,
        number,
        purpose: body.purpose,
        note: body.note,
        issued_by: caller.userId,
        issued_at: issuedAt,
        links_expire_at: expires,
        sheet_object_key: key,
      });
      await trx('transmittal_items').insert(
        revisions.map((r, i) => ({ transmittal_id: id, revision_id: r.id, position: i + 1 })),
      );
      const recipients: Array<{ id: string; user_id: string | null; email: string; name: string }> = await trx(
        'transmittal_recipients',
      )
        .insert([
          ...contacts.map((c) => ({ transmittal_id: id, user_id: c.id, email: c.email, name: c.display_name })),
          ...externals.map((e) => ({ transmittal_id: id, user_id: null, email: e, name: '' })),
        ])
        .returning(['id', 'user_id', 'email', 'name']);

      for (const r of revisions) {
        await trx('drawing_revisions')
          .where({ drawing_id: r.drawing_id, state: 'issued' })
          .update({ state: 'superseded', superseded_at: issuedAt });
        await trx('drawing_revisions').where({ id: r.id }).update({ state: 'issued', issued_at: issuedAt });
      }

      const reference = transmittalReference(project.reference, number);
      const dates = { dateLocale: project.date_locale, timeZone: project.time_zone };
      const sheet = await transmittalSheet({
        firmName: project.firm_name,
        dates,
        projectReference: project.reference,
        projectName: project.name,
        reference,
        purpose: body.purpose,
        note: body.note,
        issuedBy: caller.displayName,
        issuedAt,
        recipients: recipients.map((r) => ({ name: r.name, email: r.email })),
        items: revisions.map((r) => ({
          number: r.number,
          title: r.title,
          code: r.code,
          suitability: r.suitability,
          purpose: r.purpose,
          date: r.revision_date,
        })),
      });
      await store.putStream(key, Readable.from([sheet]), { contentType: 'application/pdf' });
      stored = true;
      await trx('transmittals').where({ id }).update({ sheet_size_bytes: sheet.length });

      await insertActivity(trx, {
        firmId: caller.firmId,
        projectId,
        actorId: caller.userId,
        action: 'transmittal.issued',
        objectType: 'transmittal',
        objectId: id,
        summary: `${caller.displayName} issued ${revisions.length} revision${revisions.length === 1 ? '' : 's'} under ${reference} to ${recipients.length} recipient${recipients.length === 1 ? '' : 's'}`,
        details: {
          revisions: revisions.map((r) => `${r.number} ${r.code}`),
          recipients: recipients.map((r) => r.email),
        },
      });

      const pdfs: RevisionFileRow[] = (
        await filesOf(
          trx,
          revisions.map((r) => r.id),
        )
      ).filter((f) => f.role === 'pdf');
      const expiresUnix = Math.floor(expires.getTime() / 1000);
      for (const rcpt of recipients) {
        const outside = rcpt.user_id === null;
        const shared = (item: string) =>
          `${deps.publicUrl}/api/shared/transmittals/${id}/${item}?${linkQuery(deps.linkSecret, {
            transmittalId: id,
            recipientId: rcpt.id,
            item,
            expires: expiresUnix,
          })}`;
        const inApp = (path: string) => notices.link(path);
        await notices.send(trx, {
          to: rcpt.email,
          template: 'drawings-issued',
          data: {
            recipientName: rcpt.name,
            firmName: project.firm_name,
            projectName: project.name,
            reference,
            purpose: PURPOSE_LABELS[body.purpose].toLowerCase(),
            note: body.note || undefined,
            items: revisions.map((r) => {
              const pdf = pdfs.find((f) => f.revision_id === r.id)!;
              return {
                number: r.number,
                title: r.title,
                code: r.code,
                suitability: r.suitability,
                fileLink: outside
                  ? shared(pdf.id)
                  : inApp(`/api/projects/${projectId}/revisions/${r.id}/files/${pdf.id}/download`),
              };
            }),
            sheetLink: outside ? shared('sheet') : inApp(`/api/projects/${projectId}/transmittals/${id}/sheet`),
            zipLink: outside ? shared('zip') : inApp(`/api/projects/${projectId}/transmittals/${id}/zip`),
            expiresOn: outside ? printDayTime(expires, dates) : undefined,
            link: outside ? undefined : inApp(`/drawings?project=${projectId}&transmittal=${id}`),
          },
          // The sheet travels with the notice, so the record of what was sent stays with the recipient.
          attachments: [
            { filename: `${reference}.pdf`, contentType: 'application/pdf', contentBase64: sheet.toString('base64') },
          ],
        });
      }
    });
  } catch (err) {
    if (stored) await store.remove(key).catch(() => undefined);
    throw err;
  }
  return readTransmittal(db, caller, projectId, id);
}

export async function acknowledge(db: Db, caller: Caller, projectId: string, id: string): Promise<Transmittal> {
  await db.transaction(async (trx) => {
    const row = await getTransmittal(trx, projectId, id, caller.userId);
    if (!row) throw notFound('No transmittal with this id.');
    // The first acknowledgement stands; acknowledging again changes nothing.
    const updated = await trx('transmittal_recipients')
      .where({ transmittal_id: id, user_id: caller.userId })
      .whereNull('acknowledged_at')
      .update({ acknowledged_at: trx.fn.now() });
    if (updated)
      await insertActivity(trx, {
        firmId: caller.firmId,
        projectId,
        actorId: caller.userId,
        action: 'transmittal.acknowledged',
        objectType: 'transmittal',
        objectId: id,
        summary: `${caller.displayName} acknowledged receipt of ${transmittalReference(row.project_reference, row.number)}`,
      });
  });
  return readTransmittal(db, caller, projectId, id);
}

export async function downloadLog(db: Db, projectId: string, id: string): Promise<DownloadLogEntry[]> {
  const row = await getTransmittal(db, projectId, id, null);
  if (!row) throw notFound('No transmittal with this id.');
  return (await downloadsOf(db, id)).map((d) => ({
    id: d.id,
    at: new Date(d.at).toISOString(),
    what: d.what,
    fileName: d.what === 'file' ? d.file_name : d.what === 'zip' ? 'All files (ZIP)' : 'Transmittal sheet',
    who: d.user_name ? `${d.user_name} <${d.user_email}>` : (d.recipient_email ?? 'unknown'),
    viaLink: Boolean(d.recipient_id),
    ip: d.ip,
  }));
}
