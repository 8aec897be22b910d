import { createHash, randomUUID } from 'node:crypto';
import { Readable } from 'node:stream';
import type { Knex } from 'knex';
import type { z } from 'zod';
import {
  PLAN_SCALES,
  planSheetSizeSchema,
  STAGE_TITLES,
  type planSheetRegisterSchema,
  type PlanSheetRegistered,
  type PlanSheetSize,
  type SchemeReport,
  type StageKey,
} from '@trabeate/contracts';
import { CAUTION, type SchemeResult } from '@trabeate/structural';
import type { Db } from '../db/db';
import { HttpError, notFound } from '../core/errors';
import type { Caller } from '../access/policy';
import { toCaller, type UserRow } from '../auth/session';
import type { Jobs } from '../jobs';
import type { ObjectStore } from '../storage';
import { recordUpload, uploadCheck } from '../deliverables/deliverables.service';
import {
  createDrawing,
  proposeNumber,
  proposeRevision,
  readRevision,
  recordFile,
  registerRevision,
} from '../drawings/drawings.service';
import { datesOf, firmToday } from '../firms/firms.repository';
import { printDay, printDayTime } from '../look/print-look';
import { storedDocument } from '../schemes/scheme-document';
import { buildPlanSheet, SheetDoesNotFit, type PlanSheet } from './plan-sheet';
import { sheetPdf, sheetSvg } from './sheet-render';
import { calculationReport, footingChoicesOf, REPORT_SECTIONS } from './report-pdf';
import {
  getReport,
  insertReport,
  reportById,
  updateReport,
  userRow,
  versionFacts,
  type ReportRow,
  type VersionFacts,
} from './scheme-outputs.repository';

export const REPORT_QUEUE = 'scheme.report';

const iso = (d: Date | string | null) => (d ? new Date(d).toISOString() : null);

async function facts(
  db: Db | Knex.Transaction,
  projectId: string,
  schemeId: string,
  version: number,
): Promise<VersionFacts> {
  const f = await versionFacts(db, projectId, schemeId, version);
  if (!f) throw notFound(`No version ${version} of this scheme in this project.`);
  return f;
}

export const reportOf = (r: ReportRow): SchemeReport => ({
  id: r.id,
  projectId: r.project_id,
  schemeId: r.scheme_id,
  version: r.scheme_version,
  state: r.state,
  progress: { done: r.sections_done, total: r.sections_total },
  stageKey: (r.stage_key as StageKey | null) ?? null,
  deliverableId: r.deliverable_id,
  pages: r.pages,
  sizeBytes: r.size_bytes === null ? null : Number(r.size_bytes),
  failure: r.failure,
  requestedAt: iso(r.requested_at)!,
  finishedAt: iso(r.finished_at),
});

// ---------------------------------------------------------------- plan sheet

export interface SheetTitle {
  drawingNumber: string;
  revision: string;
  suitability: string;
  drawnBy: string;
  /** the register's names once the revision is checked and approved; blank before */
  checkedBy?: string;
  approvedBy?: string;
  title?: string;
  /** the revision's day (YYYY-MM-DD), printed in the firm's format; today for a preview */
  date?: string | Date;
}

/** The plan sheet geometry of one saved version; a 400 names the smallest scale that fits. */
export async function planSheet(
  db: Db | Knex.Transaction,
  projectId: string,
  schemeId: string,
  version: number,
  size: PlanSheetSize,
  scale: number,
  t: SheetTitle,
): Promise<{ sheet: PlanSheet; title: string; facts: VersionFacts }> {
  const f = await facts(db, projectId, schemeId, version);
  const document = storedDocument(f.document);
  const title = t.title ?? `Column layout: ${f.scheme_name}`;
  try {
    const sheet = buildPlanSheet(document, f.results as SchemeResult, size, scale, {
      firm: f.firm_name,
      project: `${f.project_reference} ${f.project_name}`,
      drawingNumber: t.drawingNumber,
      title,
      revision: t.revision,
      suitability: t.suitability,
      drawnBy: t.drawnBy,
      checkedBy: t.checkedBy ?? '',
      approvedBy: t.approvedBy ?? '',
      date: printDay(t.date ?? new Date(), datesOf(f)),
      scheme: `${f.scheme_name}, version ${version}`,
      engineVersion: f.engine_version,
      caution: CAUTION,
    });
    return { sheet, title, facts: f };
  } catch (err) {
    if (err instanceof SheetDoesNotFit)
      throw new HttpError(400, 'validation_failed', err.message, {
        'query.scale': [
          err.smallestScale === null ? 'no offered scale fits this sheet' : `1:${err.smallestScale} or smaller`,
        ],
      });
    throw err;
  }
}

/** A preview's title panel: no drawing yet, so the number and revision say so. */
const previewTitle = (caller: Caller): SheetTitle => ({
  drawingNumber: 'not registered',
  revision: '—',
  suitability: '—',
  drawnBy: caller.displayName,
});

export async function sheetSvgFor(
  db: Db,
  caller: Caller,
  p: string,
  s: string,
  v: number,
  size: PlanSheetSize,
  scale: number,
) {
  const { sheet, title } = await planSheet(db, p, s, v, size, scale, previewTitle(caller));
  return sheetSvg(sheet, title);
}

export async function sheetPdfFor(
  db: Db,
  caller: Caller,
  p: string,
  s: string,
  v: number,
  size: PlanSheetSize,
  scale: number,
) {
  const { sheet, title, facts: f } = await planSheet(db, p, s, v, size, scale, previewTitle(caller));
  return sheetPdf(sheet, { Title: title, Subject: `${f.project_reference} ${f.project_name}` });
}

/**
 * Registers the plan sheet as a new draft revision: of the drawing named, or of a new drawing
 * with the register's next number. The sheet is drawn first (a scale that does not fit creates
 * nothing), then the draft is registered with the scheme version it came from, then its PDF
 * stored and recorded; if storing fails, the draft goes again (drafts may be deleted).
 */
export async function registerSheet(
  db: Db,
  store: ObjectStore,
  caller: Caller,
  projectId: string,
  schemeId: string,
  version: number,
  body: z.output<typeof planSheetRegisterSchema>,
): Promise<PlanSheetRegistered> {
  const origin = await facts(db, projectId, schemeId, version);
  let drawingId = body.drawingId;
  let number: string;
  let title: string | undefined;
  if (drawingId) {
    const d = await db('drawings').where({ project_id: projectId, id: drawingId }).first('number', 'title');
    if (!d) throw notFound('No drawing with this id.');
    number = d.number;
    title = d.title;
  } else number = (await proposeNumber(db, caller, projectId)).number;
  // The firm's today, in its own time zone: the revision's date and the title block's.
  const revisionDate = await firmToday(db, caller.firmId);
  const sheetTitle = (code: string): SheetTitle => ({
    drawingNumber: number,
    revision: code,
    suitability: body.suitability,
    drawnBy: caller.displayName,
    title: title ?? body.newDrawing?.title,
    date: revisionDate,
  });
  // Drawn once before anything is created, so a refused scale leaves the register as it was.
  await planSheet(db, projectId, schemeId, version, body.size, body.scale, sheetTitle('P01'));
  if (!drawingId) {
    const created = await createDrawing(db, caller, projectId, {
      number,
      title: body.newDrawing!.title,
      stageKey: body.newDrawing!.stageKey,
      sheetSize: body.size,
      scale: `1:${body.scale}`,
    });
    drawingId = created.id;
  }
  const planned = await proposeRevision(db, caller, projectId, drawingId, undefined);
  const { sheet, title: printed } = await planSheet(
    db,
    projectId,
    schemeId,
    version,
    body.size,
    body.scale,
    sheetTitle(planned.code),
  );
  const pdf = await sheetPdf(sheet, { Title: printed, Subject: number });
  const revision = await registerRevision(
    db,
    caller,
    projectId,
    drawingId,
    {
      suitability: body.suitability,
      purpose: body.purpose,
      // the register names where the sheet came from, whatever else the engineer wrote
      description: [
        body.description.replace(/[.\s]+$/, ''),
        `Column layout from scheme ${origin.scheme_name}, version ${version}`,
      ]
        .filter(Boolean)
        .join('. '),
      date: revisionDate,
    },
    { schemeId, schemeVersion: version, sheetSize: body.size, sheetScale: body.scale },
  );
  const key = `drawings/${projectId}/${revision.id}/${randomUUID()}`;
  try {
    await store.putStream(key, Readable.from([pdf]), { contentType: 'application/pdf' });
    const safeName = `${number}-${revision.code}.pdf`.replace(/[^\w.-]+/g, '_');
    await recordFile(db, caller, projectId, revision.id, 'pdf', {
      key,
      sha256: createHash('sha256').update(pdf).digest('hex'),
      size: pdf.length,
      detectedType: 'pdf',
      contentType: 'application/pdf',
      originalName: safeName,
      safeName,
    });
  } catch (err) {
    await db('drawing_revisions').where({ id: revision.id, state: 'draft' }).delete();
    await store.remove(key).catch(() => undefined);
    throw err;
  }
  return {
    drawingId,
    drawingNumber: number,
    schemeId,
    version,
    revision: await readRevision(db, caller, projectId, revision.id),
  };
}

/**
 * Draws a registered plan sheet again inside a check's or an approval's transaction, so that its
 * title panel carries the names the register now holds (drawn, checked, approved) and the stored
 * PDF never says less than the register does. The sheet is drawn from the same scheme version on
 * the same paper; only the names differ. The new PDF is stored under a new key before the change
 * commits (storage down: the check is refused and nothing changes), its row takes the new key,
 * size and SHA-256, and the returned step removes the replaced object once the change has
 * committed. A revision not drawn from a scheme is left as it is.
 */
export async function restampSheet(
  trx: Knex.Transaction,
  store: ObjectStore,
  revisionId: string,
): Promise<(() => Promise<void>) | void> {
  const r = await trx('drawing_revisions as r')
    .join('drawings as d', 'd.id', 'r.drawing_id')
    .join('users as dn', 'dn.id', 'r.drawn_by')
    .leftJoin('users as ck', 'ck.id', 'r.checked_by')
    .leftJoin('users as ap', 'ap.id', 'r.approved_by')
    .where('r.id', revisionId)
    .first<
      | {
          project_id: string;
          scheme_id: string | null;
          scheme_version: number | null;
          sheet_size: string | null;
          sheet_scale: number | null;
          code: string;
          suitability: string;
          revision_date: string;
          number: string;
          title: string;
          drawing_size: string;
          drawing_scale: string;
          drawn_name: string;
          checked_name: string | null;
          approved_name: string | null;
        }
      | undefined
    >(
      'r.project_id',
      'r.scheme_id',
      'r.scheme_version',
      'r.sheet_size',
      'r.sheet_scale',
      'r.code',
      'r.suitability',
      trx.raw(`to_char(r.revision_date, 'YYYY-MM-DD') as revision_date`),
      'd.number',
      'd.title',
      'd.sheet_size as drawing_size',
      'd.scale as drawing_scale',
      'dn.display_name as drawn_name',
      'ck.display_name as checked_name',
      'ap.display_name as approved_name',
    );
  if (!r?.scheme_id || r.scheme_version === null) return;
  const file = await trx('revision_files')
    .where({ revision_id: revisionId, role: 'pdf' })
    .forUpdate()
    .first<{ id: string; object_key: string } | undefined>('id', 'object_key');
  if (!file) return;
  // Sheets registered before their paper was kept with the revision: the drawing's own size and scale.
  const size = planSheetSizeSchema.safeParse(r.sheet_size ?? r.drawing_size);
  const scale = r.sheet_scale ?? Number(/^1:(\d+)$/.exec(r.drawing_scale)?.[1]);
  if (!size.success || !(PLAN_SCALES as readonly number[]).includes(scale)) return;
  const { sheet, title } = await planSheet(trx, r.project_id, r.scheme_id, r.scheme_version, size.data, scale, {
    drawingNumber: r.number,
    revision: r.code,
    suitability: r.suitability,
    drawnBy: r.drawn_name,
    checkedBy: r.checked_name ?? '',
    approvedBy: r.approved_name ?? '',
    title: r.title,
    date: r.revision_date,
  });
  const pdf = await sheetPdf(sheet, { Title: title, Subject: r.number });
  const key = `drawings/${r.project_id}/${revisionId}/${randomUUID()}`;
  await store.putStream(key, Readable.from([pdf]), { contentType: 'application/pdf' });
  try {
    await trx('revision_files')
      .where({ id: file.id })
      .update({
        object_key: key,
        size_bytes: pdf.length,
        sha256: createHash('sha256').update(pdf).digest('hex'),
        // when these bytes were stored, so the register does not date them to the registration
        uploaded_at: trx.fn.now(),
      });
  } catch (err) {
    await store.remove(key).catch(() => undefined);
    throw err;
  }
  return async () => {
    await store.remove(file.object_key).catch(() => undefined);
  };
}

// ---------------------------------------------------------------- report

/**
 * Queues a report of one saved version; with a stage, the finished PDF is also filed there as a
 * deliverable (the stage must take uploads now, else 409 before anything is queued).
 */
export async function requestReport(
  db: Db,
  jobs: Jobs,
  caller: Caller,
  projectId: string,
  schemeId: string,
  version: number,
  stageKey: StageKey | undefined,
): Promise<SchemeReport> {
  await facts(db, projectId, schemeId, version);
  if (stageKey) await uploadCheck(db, projectId, stageKey);
  const row = await insertReport(db, {
    firm_id: caller.firmId,
    project_id: projectId,
    scheme_id: schemeId,
    scheme_version: version,
    state: 'queued',
    sections_total: REPORT_SECTIONS.length,
    stage_key: stageKey ?? null,
    requested_by: caller.userId,
  });
  try {
    await jobs.boss.send(REPORT_QUEUE, { reportId: row.id }, { retryLimit: 2, retryDelay: 5 });
  } catch {
    // A row that no job will ever pick up must not sit "queued" for ever.
    await updateReport(db, row.id, { state: 'failed', failure: 'The job queue did not take the report; try again.' });
    throw new HttpError(503, 'service_unavailable', 'The job queue is not answering; try again in a minute.');
  }
  return reportOf(row);
}

export async function readReport(db: Db, projectId: string, id: string): Promise<ReportRow> {
  const r = await getReport(db, projectId, id);
  if (!r) throw notFound('No report with this id.');
  return r;
}

/** The job: writes the report section by section (progress stored), stores it, files it if asked. */
export async function runReport(db: Db, store: ObjectStore, reportId: string): Promise<void> {
  const r = await reportById(db, reportId);
  if (!r || r.state === 'done') return;
  await updateReport(db, r.id, { state: 'running', sections_done: 0, failure: null });
  try {
    const f = await facts(db, r.project_id, r.scheme_id, r.scheme_version);
    const { pdf, pages } = await calculationReport(
      {
        firm: f.firm_name,
        projectReference: f.project_reference,
        projectName: f.project_name,
        schemeName: f.scheme_name,
        version: r.scheme_version,
        savedAt: printDayTime(f.saved_at, datesOf(f)),
        savedBy: f.saved_by ?? 'someone no longer here',
        engineVersion: f.engine_version,
        document: storedDocument(f.document),
        results: f.results as SchemeResult,
        footingChoices: footingChoicesOf(f.document),
        generatedOn: printDay(new Date(), datesOf(f)),
        caution: CAUTION,
      },
      async (done) => updateReport(db, r.id, { sections_done: done }),
    );
    const key = `reports/${r.project_id}/${r.id}`;
    await store.putStream(key, Readable.from([pdf]), { contentType: 'application/pdf' });
    await updateReport(db, r.id, { object_key: key, size_bytes: pdf.length, pages });
    let failure: string | null = null;
    let deliverableId: string | null = null;
    if (r.stage_key) {
      // The deliverable is its own object (deliverables own their keys), written from the same bytes.
      const requester = await userRow(db, r.requested_by);
      const dKey = `projects/${r.project_id}/stages/${r.stage_key}/${randomUUID()}`;
      try {
        await store.putStream(dKey, Readable.from([pdf]), { contentType: 'application/pdf' });
        const name = `Calculation report ${f.scheme_name} v${r.scheme_version}.pdf`.replace(/[^\w .()-]+/g, '_');
        const d = await recordUpload(db, toCaller(requester as UserRow), r.project_id, r.stage_key as StageKey, {
          key: dKey,
          sha256: createHash('sha256').update(pdf).digest('hex'),
          size: pdf.length,
          detectedType: 'pdf',
          contentType: 'application/pdf',
          originalName: name,
          safeName: name,
        });
        deliverableId = d.id;
      } catch (err) {
        if (!(err instanceof HttpError)) throw err;
        failure = `The report is ready but was not filed on ${STAGE_TITLES[r.stage_key as StageKey]}: ${err.message}`;
      }
    }
    await updateReport(db, r.id, {
      state: 'done',
      deliverable_id: deliverableId,
      failure,
      finished_at: db.fn.now(),
    });
  } catch (err) {
    await updateReport(db, r.id, {
      state: 'failed',
      failure:
        'The report could not be written; generate it again, and tell the firm’s administrator if it fails twice.',
      finished_at: db.fn.now(),
    });
    throw err;
  }
}

/** Starts this process's report worker (every API process works the queue; pg-boss shares the jobs out). */
export async function startReportWorker(
  db: Db,
  store: ObjectStore,
  jobs: Jobs,
  pollingIntervalSeconds = 2,
): Promise<void> {
  const boss = jobs.boss;
  if (!(await boss.getQueue(REPORT_QUEUE)))
    await boss.createQueue(REPORT_QUEUE, { name: REPORT_QUEUE, retryLimit: 2, retryDelay: 5 }).catch(async (err) => {
      if (!(await boss.getQueue(REPORT_QUEUE))) throw err;
    });
  await boss.work<{ reportId: string }>(REPORT_QUEUE, { pollingIntervalSeconds, batchSize: 1 }, async ([job]) => {
    await runReport(db, store, job.data.reportId);
  });
}
