import type { Request } from 'express';
import { z } from 'zod';
import { planSheetQuerySchema, planSheetRegisterSchema, schemeReportCreateSchema } from '@trabeate/contracts';
import type { Db } from '../db/db';
import type { Logger } from '../core/logger';
import { HttpError } from '../core/errors';
import { validate } from '../core/validate';
import { route, type RouteDecl } from '../access/registry';
import type { Caller } from '../access/policy';
import type { Jobs } from '../jobs';
import type { ObjectStore } from '../storage';
import { sendObject } from '../drawings/drawings.routes';
import {
  readReport,
  registerSheet,
  reportOf,
  requestReport,
  sheetPdfFor,
  sheetSvgFor,
  startReportWorker,
} from './scheme-outputs.service';

// Outputs of a saved scheme version. The firm's own work: the principal and the project's
// engineers (rule project:readSchemes); clients never see schemes, so never these either.
const callerOf = (req: Request): Caller => req.caller as Caller;
const versionParams = z.object({
  projectId: z.uuid(),
  schemeId: z.uuid(),
  version: z.coerce.number().int().min(1).max(2_147_483_647),
});
const reportParams = z.object({ projectId: z.uuid(), reportId: z.uuid() });
const VERSION = '/projects/:projectId/schemes/:schemeId/versions/:version';
const REPORT = '/projects/:projectId/scheme-reports/:reportId';

const noStorage = () => new HttpError(503, 'service_unavailable', 'File storage is not configured on this server.');
const noJobs = () => new HttpError(503, 'service_unavailable', 'The job queue is not running on this server.');
const v = (req: Request) =>
  [String(req.params['projectId']), String(req.params['schemeId']), Number(req.params['version'])] as const;

export function schemeOutputRoutes(deps: {
  db: Db;
  store?: ObjectStore;
  jobs?: Jobs;
  logger: Logger;
  pollingIntervalSeconds?: number;
}): RouteDecl[] {
  const { db, store, jobs } = deps;
  // Every API process works report jobs; a request waits for this process's worker to be set up.
  const worker =
    store && jobs
      ? startReportWorker(db, store, jobs, deps.pollingIntervalSeconds).catch((err) => {
          deps.logger.error({ err }, 'report worker did not start');
          throw err;
        })
      : undefined;
  worker?.catch(() => undefined);

  return [
    route(
      'post',
      `${VERSION}/reports`,
      'project:readSchemes',
      validate({ params: versionParams, body: schemeReportCreateSchema }),
      async (req, res) => {
        if (!jobs || !worker) throw noJobs();
        await worker.catch(() => {
          throw noJobs();
        });
        const report = await requestReport(db, jobs, callerOf(req), ...v(req), req.body.stageKey);
        res.status(202).location(`/api/projects/${report.projectId}/scheme-reports/${report.id}`).json(report);
      },
    ),
    route('get', REPORT, 'project:readSchemes', validate({ params: reportParams }), async (req, res) => {
      res.setHeader('Cache-Control', 'no-store');
      res.json(reportOf(await readReport(db, req.project!.id, String(req.params['reportId']))));
    }),
    route('get', `${REPORT}/file`, 'project:readSchemes', validate({ params: reportParams }), async (req, res) => {
      const r = await readReport(db, req.project!.id, String(req.params['reportId']));
      if (r.state !== 'done' || !r.object_key)
        throw new HttpError(409, 'conflict', `This report is ${r.state}; open it once it is done.`);
      if (!store) throw noStorage();
      const object = await store.getStream(r.object_key);
      await sendObject(req, res, object, {
        fileName: `calculation-report-v${r.scheme_version}.pdf`,
        contentType: 'application/pdf',
        size: Number(r.size_bytes),
      });
    }),
    route(
      'get',
      `${VERSION}/sheet.svg`,
      'project:readSchemes',
      validate({ params: versionParams, query: planSheetQuerySchema }),
      async (req, res) => {
        const q = res.locals['query'] as z.output<typeof planSheetQuerySchema>;
        const svg = await sheetSvgFor(db, callerOf(req), ...v(req), q.size, q.scale);
        res.setHeader('Content-Type', 'image/svg+xml; charset=utf-8');
        res.setHeader('Cache-Control', 'private, no-store');
        res.send(svg);
      },
    ),
    route(
      'get',
      `${VERSION}/sheet.pdf`,
      'project:readSchemes',
      validate({ params: versionParams, query: planSheetQuerySchema }),
      async (req, res) => {
        const q = res.locals['query'] as z.output<typeof planSheetQuerySchema>;
        const pdf = await sheetPdfFor(db, callerOf(req), ...v(req), q.size, q.scale);
        res.setHeader('Content-Type', 'application/pdf');
        res.setHeader('Content-Disposition', `inline; filename="plan-sheet-v${v(req)[2]}.pdf"`);
        res.setHeader('Cache-Control', 'private, no-store');
        res.send(pdf);
      },
    ),
    route(
      'post',
      `${VERSION}/sheet/revisions`,
      'project:readSchemes',
      validate({ params: versionParams, body: planSheetRegisterSchema }),
      async (req, res) => {
        if (!store) throw noStorage();
        res.status(201).json(await registerSheet(db, store, callerOf(req), ...v(req), req.body));
      },
    ),
  ];
}
