import Stripe from 'stripe';
import type { PaymentsConfig } from '../core/config';

export interface Payments {
  stripe: Stripe;
  webhookSecret: string;
}

/**
 * The Stripe SDK as configured: the real API in production; locally the payments fake on loopback
 * (STRIPE_API_*). Absent without a secret key, and then Pay answers 503.
 */
export function createPayments(c: Partial<PaymentsConfig>): Payments | undefined {
  if (!c.STRIPE_SECRET_KEY || !c.STRIPE_WEBHOOK_SECRET) return undefined;
  const stripe = new Stripe(c.STRIPE_SECRET_KEY, {
    ...(c.STRIPE_API_HOST
      ? { host: c.STRIPE_API_HOST, port: c.STRIPE_API_PORT, protocol: c.STRIPE_API_PROTOCOL ?? 'http' }
      : {}),
    maxNetworkRetries: 1,
    timeout: 15_000,
    appInfo: { name: 'Trabeate' },
  });
  return { stripe, webhookSecret: c.STRIPE_WEBHOOK_SECRET };
}
