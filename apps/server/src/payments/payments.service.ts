import type { Knex } from 'knex';
import Stripe from 'stripe';
import type { CheckoutOutcome, CheckoutStart } from '@trabeate/contracts';
import type { Db } from '../db/db';
import type { Caller } from '../access/policy';
import { datesOf, firmToday } from '../firms/firms.repository';
import { HttpError, notFound } from '../core/errors';
import type { Notices } from '../notices/notices';
import { insertActivity } from '../activity/activity.repository';
import { getAgreement } from '../fees/fees.repository';
import { getInvoice, lockInvoice } from '../invoices/invoices.repository';
import { applyPayment, readInvoice, summaryOf } from '../invoices/invoices.service';
import { formatMoney } from '../invoices/money';
import { longDate } from '../invoices/invoice-pdf';
import type { Payments } from './stripe-client';

export interface PaymentDeps {
  db: Db;
  notices: Notices;
  payments?: Payments;
  publicUrl: string;
}

const conflict = (message: string) => new HttpError(409, 'conflict', message);
const unavailable = (message: string) => new HttpError(503, 'service_unavailable', message);

function paymentsOf(deps: PaymentDeps): Payments {
  if (!deps.payments) throw unavailable('Card payments are not set up on this server; pay by bank transfer instead.');
  return deps.payments;
}

/** A card processor that cannot be reached, or answers with its own fault, is a 503 for us. */
function fromStripe(err: unknown): never {
  if (err instanceof Stripe.errors.StripeError) {
    if (
      err instanceof Stripe.errors.StripeConnectionError ||
      err instanceof Stripe.errors.StripeAPIError ||
      err instanceof Stripe.errors.StripeRateLimitError ||
      (err.statusCode ?? 0) >= 500
    )
      throw Object.assign(unavailable('The card processor is not answering; try again in a minute.'), { cause: err });
  }
  throw err;
}

/**
 * Starts a Checkout Session for what is owed now on an invoice. The idempotency key is the
 * invoice, the amount and how many payments it has had, so a double click (or a retry after a
 * timeout) returns the same session, and a changed balance makes a new one.
 */
export async function startCheckout(
  deps: PaymentDeps,
  caller: Caller,
  projectId: string,
  invoiceId: string,
): Promise<CheckoutStart> {
  const { stripe } = paymentsOf(deps);
  const row = await getInvoice(deps.db, caller.firmId, projectId, invoiceId);
  if (!row || row.state === 'draft') throw notFound('No invoice with this id.');
  const s = summaryOf(row);
  if (s.kind !== 'invoice') throw conflict('A credit note is not paid; it reduces what the invoice asks for.');
  if (s.state === 'void') throw conflict('This invoice is void; there is nothing to pay.');
  if (s.state === 'paid' || s.dueMinor <= 0) throw conflict('This invoice is already paid in full.');
  const { n } = await deps
    .db('payments')
    .where({ invoice_id: invoiceId })
    .first<{ n: string }>(deps.db.raw('count(*) as n'));
  const back = `${deps.publicUrl}/fees/return?project=${projectId}&invoice=${invoiceId}`;
  let session: Stripe.Checkout.Session;
  try {
    session = await stripe.checkout.sessions.create(
      {
        mode: 'payment',
        line_items: [
          {
            quantity: 1,
            price_data: {
              currency: s.currency.toLowerCase(),
              unit_amount: s.dueMinor,
              product_data: { name: `Invoice ${s.number} · ${s.project.reference} ${s.project.name}` },
            },
          },
        ],
        client_reference_id: invoiceId,
        metadata: { invoiceId, projectId, firmId: caller.firmId, invoiceNumber: s.number ?? '' },
        customer_email: caller.email,
        success_url: `${back}&session={CHECKOUT_SESSION_ID}`,
        // Stripe fills the session id into the success URL only; the page keeps it for the way back.
        cancel_url: `${back}&cancelled=1`,
      },
      { idempotencyKey: `invoice-${invoiceId}-due-${s.dueMinor}-after-${n}` },
    );
  } catch (err) {
    fromStripe(err);
  }
  if (!session.url) throw unavailable('The card processor gave no payment page; try again in a minute.');
  if (session.amount_total !== s.dueMinor || session.currency?.toUpperCase() !== s.currency)
    throw unavailable('The card processor answered with a different amount; nothing was charged. Try again.');
  await deps
    .db('checkout_sessions')
    .insert({
      id: session.id,
      invoice_id: invoiceId,
      amount_minor: s.dueMinor,
      currency: s.currency,
      started_by: caller.userId,
    })
    .onConflict('id')
    .ignore();
  return { url: session.url, sessionId: session.id };
}

type SessionLike = Pick<Stripe.Checkout.Session, 'id' | 'payment_status' | 'amount_total' | 'currency'>;

/**
 * Records a paid Checkout Session against its invoice, once: the invoice row lock orders a
 * webhook and a success page arriving together, and the unique session id on payments refuses a
 * second row. The amount is Stripe's, never the browser's.
 */
export async function settlePaidSession(
  deps: Pick<PaymentDeps, 'notices'>,
  trx: Knex.Transaction,
  session: SessionLike,
): Promise<'recorded' | 'already' | 'unknown'> {
  if (session.payment_status !== 'paid' || session.amount_total == null || !session.currency) return 'unknown';
  const started = await trx('checkout_sessions').where({ id: session.id }).first();
  if (!started) return 'unknown';
  const inv = await trx('invoices').where({ id: started.invoice_id }).first('project_id', 'firm_id');
  await lockInvoice(trx, inv.project_id, started.invoice_id);
  if (await trx('payments').where({ stripe_session_id: session.id }).first('id')) return 'already';
  if (session.currency.toUpperCase() !== started.currency.trim())
    throw new Error(`session ${session.id} was paid in ${session.currency}, not ${started.currency}`);
  // The day the money arrived where the firm is (its books and the receipt say the same day).
  const receivedOn = await firmToday(trx, inv.firm_id);
  const { overpaidMinor } = await applyPayment(trx, inv.firm_id, inv.project_id, started.invoice_id, {
    method: 'card',
    amountMinor: session.amount_total,
    receivedOn,
    reference: `Card ${session.id}`,
    stripeSessionId: session.id,
    recordedBy: null,
  });
  await trx('checkout_sessions')
    .where({ id: session.id })
    .update({ outcome: 'paid', outcome_message: 'Paid by card.' });
  const row = (await getInvoice(trx, inv.firm_id, inv.project_id, started.invoice_id))!;
  const s = summaryOf(row);
  const amount = formatMoney(session.amount_total, s.currency);
  await insertActivity(trx, {
    firmId: inv.firm_id,
    projectId: inv.project_id,
    actorId: started.started_by,
    action: 'payment.received',
    objectType: 'payment',
    objectId: started.invoice_id,
    summary: `${amount} paid by card on invoice ${s.number}${overpaidMinor ? ` (overpaid by ${formatMoney(overpaidMinor, s.currency)})` : ''}`,
    details: { sessionId: session.id, amountMinor: session.amount_total, overpaidMinor },
  });
  const payer = started.started_by
    ? await trx('users').where({ id: started.started_by }).first('email', 'display_name')
    : undefined;
  const agreement = await getAgreement(trx, inv.project_id);
  const firm = await trx('firms').where({ id: inv.firm_id }).first('name', 'date_locale', 'time_zone');
  const receiptTo =
    payer ?? (agreement ? { email: agreement.contact_email, display_name: agreement.contact_name } : null);
  if (receiptTo)
    await deps.notices.send(trx, {
      to: receiptTo.email,
      template: 'payment-receipt',
      data: {
        recipientName: receiptTo.display_name,
        firmName: firm.name,
        projectName: s.project.name,
        number: s.number ?? '',
        amount,
        paidOn: longDate(receivedOn, datesOf(firm)),
        link: deps.notices.link('/fees'),
      },
    });
  const principals = await trx('users')
    .where({ firm_id: inv.firm_id, firm_role: 'principal' })
    .whereNull('disabled_at')
    .select('email', 'display_name');
  for (const p of principals)
    await deps.notices.send(trx, {
      to: p.email,
      template: 'payment-notice',
      data: {
        recipientName: p.display_name,
        firmName: firm.name,
        projectName: s.project.name,
        clientName: s.client.name,
        number: s.number ?? '',
        amount,
        ...(overpaidMinor ? { overpaid: formatMoney(overpaidMinor, s.currency) } : {}),
        link: deps.notices.link('/fees'),
      },
    });
  return 'recorded';
}

/** Why a card was refused, in the card processor's words, for the person who tried it. */
function declineOf(session: Stripe.Checkout.Session): string | null {
  const pi = session.payment_intent;
  if (!pi || typeof pi === 'string') return null;
  const e = pi.last_payment_error;
  if (!e) return null;
  return `${e.message ?? 'The card was refused.'}${e.code ? ` (${e.code})` : ''}`;
}

/**
 * Asked by the return page: what happened to this Checkout Session, from Stripe's own answer.
 * A paid session is recorded here if its webhook has not come yet; the webhook then changes nothing.
 */
export async function reconcileSession(
  deps: PaymentDeps,
  caller: Caller,
  projectId: string,
  invoiceId: string,
  sessionId: string,
): Promise<CheckoutOutcome> {
  const { stripe } = paymentsOf(deps);
  const started = await deps.db('checkout_sessions').where({ id: sessionId, invoice_id: invoiceId }).first();
  const row = await getInvoice(deps.db, caller.firmId, projectId, invoiceId);
  if (!started || !row || row.state === 'draft') throw notFound('No payment with this reference for this invoice.');
  let session: Stripe.Checkout.Session;
  try {
    session = await stripe.checkout.sessions.retrieve(sessionId, { expand: ['payment_intent'] });
  } catch (err) {
    fromStripe(err);
  }
  let outcome: CheckoutOutcome['outcome'];
  let message: string;
  if (session.payment_status === 'paid') {
    await deps.db.transaction((trx) => settlePaidSession(deps, trx, session));
    outcome = 'paid';
    message = `Paid: ${formatMoney(session.amount_total ?? 0, row.currency.trim())} by card. A receipt is on its way by e-mail.`;
  } else if (session.status === 'expired') {
    outcome = 'expired';
    message = 'This payment page expired before the payment was made. Nothing was charged; you can start again.';
  } else {
    const declined = declineOf(session);
    outcome = declined ? 'declined' : 'pending';
    message = declined
      ? `The card was declined, so nothing was charged: ${declined}`
      : 'No payment has been made on this page yet. Nothing was charged.';
    await deps
      .db('checkout_sessions')
      .where({ id: sessionId })
      .andWhere((q) => q.whereNull('outcome').orWhereNot('outcome', 'paid'))
      .update({ outcome, outcome_message: message });
  }
  return { outcome, message, invoice: await readInvoice(deps.db, caller, projectId, invoiceId) };
}

/** The signed events that matter to us; anything else is acknowledged and ignored. */
export async function handleEvent(deps: PaymentDeps, event: Stripe.Event): Promise<'handled' | 'duplicate'> {
  return deps.db.transaction(async (trx) => {
    const fresh = await trx('stripe_events')
      .insert({ id: event.id, type: event.type })
      .onConflict('id')
      .ignore()
      .returning('id');
    if (!fresh.length) return 'duplicate';
    if (event.type === 'checkout.session.completed' || event.type === 'checkout.session.async_payment_succeeded') {
      // The event's own object is Stripe's signed answer; the amount is taken from it.
      await settlePaidSession(deps, trx, event.data.object);
    }
    // payment_intent.payment_failed changes nothing here: the return page reads the refusal from
    // the session itself, and a late failure must never undo a payment.
    return 'handled';
  });
}
