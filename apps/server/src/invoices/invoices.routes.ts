import type { Request, RequestHandler } from 'express';
import { z } from 'zod';
import {
  creditNoteCreateSchema,
  invoiceDraftWriteSchema,
  invoiceListQuerySchema,
  invoiceVoidSchema,
  paymentCreateSchema,
  remindersToggleSchema,
} from '@trabeate/contracts';
import { validate } from '../core/validate';
import { HttpError, notFound } from '../core/errors';
import { route, type RouteDecl } from '../access/registry';
import type { Caller } from '../access/policy';
import { getInvoice, listInvoices, type InvoiceFilters } from './invoices.repository';
import {
  createCreditNote,
  createDraft,
  issueInvoice,
  readInvoice,
  receivables,
  recordPayment,
  setReminders,
  summaryOf,
  updateDraft,
  voidInvoice,
  type InvoiceDeps,
} from './invoices.service';

const callerOf = (req: Request): Caller => req.caller as Caller;
const projectParams = z.object({ projectId: z.uuid() });
const invoiceParams = z.object({ projectId: z.uuid(), invoiceId: z.uuid() });
const idOf = (req: Request) => req.params['invoiceId'] as string;

/** A dependency that is down answers 503 with Retry-After, so clients and proxies wait and retry. */
export const retryAfter =
  (handler: RequestHandler): RequestHandler =>
  async (req, res, next) => {
    try {
      await handler(req, res, next);
    } catch (err) {
      if (err instanceof HttpError && err.status === 503) res.setHeader('Retry-After', '30');
      throw err;
    }
  };

export function invoiceRoutes(deps: InvoiceDeps): RouteDecl[] {
  const { db, store } = deps;
  return [
    // Across projects: the principal sees every invoice; a client their organisation's issued ones.
    route('get', '/invoices', 'signedIn', validate({ query: invoiceListQuerySchema }), async (req, res) => {
      const caller = callerOf(req);
      if (caller.role === 'engineer')
        throw new HttpError(
          403,
          'forbidden',
          "Fees, invoices and payments are visible to the principal and the project's client only.",
        );
      const f = res.locals['query'] as InvoiceFilters;
      const { rows, total } = await listInvoices(db, caller, f);
      res.json({ items: rows.map(summaryOf), total, page: f.page, pageSize: f.pageSize });
    }),
    route('get', '/receivables', 'principal', async (req, res) => {
      res.json(await receivables(db, callerOf(req)));
    }),
    route(
      'get',
      '/projects/:projectId/invoices',
      'project:finance',
      validate({ params: projectParams }),
      async (req, res) => {
        const caller = callerOf(req);
        const { rows, total } = await listInvoices(db, caller, {
          page: 1,
          pageSize: 100,
          sort: 'issuedOn',
          direction: 'desc',
          projectId: req.project!.id,
        });
        res.json({ items: rows.map(summaryOf), total, page: 1, pageSize: 100 });
      },
    ),
    route(
      'post',
      '/projects/:projectId/invoices',
      'project:manage',
      validate({ params: projectParams, body: invoiceDraftWriteSchema }),
      async (req, res) => {
        res.status(201).json(await createDraft(db, callerOf(req), req.project!.id, req.body));
      },
    ),
    route(
      'get',
      '/projects/:projectId/invoices/:invoiceId',
      'project:finance',
      validate({ params: invoiceParams }),
      async (req, res) => {
        res.json(await readInvoice(db, callerOf(req), req.project!.id, idOf(req)));
      },
    ),
    route(
      'put',
      '/projects/:projectId/invoices/:invoiceId',
      'project:manage',
      validate({ params: invoiceParams, body: invoiceDraftWriteSchema }),
      async (req, res) => {
        res.json(await updateDraft(db, callerOf(req), req.project!.id, idOf(req), req.body));
      },
    ),
    route(
      'post',
      '/projects/:projectId/invoices/:invoiceId/issue',
      'project:manage',
      validate({ params: invoiceParams }),
      retryAfter(async (req, res) => {
        res.json(await issueInvoice(deps, callerOf(req), req.project!.id, idOf(req)));
      }),
    ),
    route(
      'post',
      '/projects/:projectId/invoices/:invoiceId/void',
      'project:manage',
      validate({ params: invoiceParams, body: invoiceVoidSchema }),
      async (req, res) => {
        res.json(await voidInvoice(db, callerOf(req), req.project!.id, idOf(req), req.body.reason));
      },
    ),
    route(
      'post',
      '/projects/:projectId/invoices/:invoiceId/credit-notes',
      'project:manage',
      validate({ params: invoiceParams, body: creditNoteCreateSchema }),
      retryAfter(async (req, res) => {
        res.status(201).json(await createCreditNote(deps, callerOf(req), req.project!.id, idOf(req), req.body));
      }),
    ),
    route(
      'post',
      '/projects/:projectId/invoices/:invoiceId/payments',
      'project:manage',
      validate({ params: invoiceParams, body: paymentCreateSchema }),
      async (req, res) => {
        res.status(201).json(await recordPayment(db, callerOf(req), req.project!.id, idOf(req), req.body));
      },
    ),
    route(
      'put',
      '/projects/:projectId/invoices/:invoiceId/reminders',
      'project:manage',
      validate({ params: invoiceParams, body: remindersToggleSchema }),
      async (req, res) => {
        res.json(await setReminders(db, callerOf(req), req.project!.id, idOf(req), req.body.enabled));
      },
    ),
    route(
      'get',
      '/projects/:projectId/invoices/:invoiceId/pdf',
      'project:finance',
      validate({ params: invoiceParams }),
      retryAfter(async (req, res) => {
        const caller = callerOf(req);
        const row = await getInvoice(db, caller.firmId, req.project!.id, idOf(req));
        if (!row || (caller.role === 'client' && row.state === 'draft') || !row.pdf_object_key)
          throw notFound('This invoice has no PDF (drafts get one when issued).');
        if (!store) throw new HttpError(503, 'service_unavailable', 'File storage is not configured on this server.');
        let object;
        try {
          object = await store.getStream(row.pdf_object_key);
        } catch {
          throw new HttpError(503, 'service_unavailable', 'File storage is not answering; try again shortly.');
        }
        // The number is ours (INV-2026-0001), but it is still quoted the standard way.
        const name = `${row.number ?? 'invoice'}.pdf`;
        res.setHeader('Content-Type', 'application/pdf');
        res.setHeader(
          'Content-Disposition',
          `inline; filename="${name.replace(/[^\w.-]/g, '_')}"; filename*=UTF-8''${encodeURIComponent(name)}`,
        );
        if (object.contentLength) res.setHeader('Content-Length', String(object.contentLength));
        object.body.pipe(res);
      }),
    ),
  ];
}
