import type { Request } from 'express';
import Stripe from 'stripe';
import { z } from 'zod';
import { validate } from '../core/validate';
import { HttpError } from '../core/errors';
import { route, type RouteDecl } from '../access/registry';
import type { Caller } from '../access/policy';
import { retryAfter } from '../invoices/invoices.routes';
import { handleEvent, reconcileSession, startCheckout, type PaymentDeps } from './payments.service';

const callerOf = (req: Request): Caller => req.caller as Caller;
const invoiceParams = z.object({ projectId: z.uuid(), invoiceId: z.uuid() });
const sessionParams = invoiceParams.extend({ sessionId: z.string().regex(/^cs_[\w-]{1,200}$/, 'a payment reference') });

/** Where Stripe posts signed events; the raw body is kept for the signature (see app.ts). */
export const STRIPE_WEBHOOK_PATH = '/webhooks/stripe';
/** Events older than this are refused, so a captured delivery cannot be replayed later. */
const TOLERANCE_SECONDS = 300;

export function paymentRoutes(deps: PaymentDeps): RouteDecl[] {
  return [
    route(
      'post',
      '/projects/:projectId/invoices/:invoiceId/checkout',
      'project:pay',
      validate({ params: invoiceParams }),
      retryAfter(async (req, res) => {
        res
          .status(201)
          .json(await startCheckout(deps, callerOf(req), req.project!.id, req.params['invoiceId'] as string));
      }),
    ),
    route(
      'post',
      '/projects/:projectId/invoices/:invoiceId/checkout/:sessionId/reconcile',
      'project:finance',
      validate({ params: sessionParams }),
      retryAfter(async (req, res) => {
        res.json(
          await reconcileSession(
            deps,
            callerOf(req),
            req.project!.id,
            req.params['invoiceId'] as string,
            req.params['sessionId'] as string,
          ),
        );
      }),
    ),
    route('post', STRIPE_WEBHOOK_PATH, 'public', async (req, res) => {
      if (!deps.payments)
        throw new HttpError(503, 'service_unavailable', 'Card payments are not set up on this server.');
      const signature = req.headers['stripe-signature'];
      if (!Buffer.isBuffer(req.body) || typeof signature !== 'string')
        throw new HttpError(400, 'bad_request', 'A Stripe event needs its raw body and a Stripe-Signature header.');
      let event: Stripe.Event;
      try {
        event = deps.payments.stripe.webhooks.constructEvent(
          req.body,
          signature,
          deps.payments.webhookSecret,
          TOLERANCE_SECONDS,
        );
      } catch (err) {
        const stale = err instanceof Error && /timestamp outside the tolerance/i.test(err.message);
        throw new HttpError(
          400,
          'bad_request',
          stale
            ? 'The event is older than the five minutes allowed; it was not processed.'
            : 'The event signature does not match; it was not processed.',
        );
      }
      const result = await handleEvent(deps, event);
      res.json({ received: true, duplicate: result === 'duplicate' });
    }),
  ];
}
