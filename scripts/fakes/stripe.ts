import { spawn, type ChildProcess } from 'node:child_process';
import { createHmac, randomBytes } from 'node:crypto';
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';

// The local payments fake: `emulate` (pinned 0.12.2) keeps the Stripe objects, and this small
// front in our own process fills what our checkout flow needs and the emulator lacks: sessions
// built from inline `price_data`, `amount_total` and `currency` on sessions, a payment intent per
// session, idempotency keys, a checkout page that refuses the standard decline test card, and
// webhook events that carry an id and are signed the way Stripe signs them. Loopback only.

/** The standard test cards: the first pays, the second is refused with `card_declined`. */
export const TEST_CARDS = { success: '4242424242424242', decline: '4000000000000002' } as const;

/** A fixed local secret for `npm start` and the e2e API; never a real key. */
export const FAKE_STRIPE_KEYS = {
  secretKey: 'sk_test_trabeate_local_fake',
  webhookSecret: 'whsec_trabeate_local_fake',
} as const;

export interface FakeStripeEvent {
  id: string;
  type: string;
  created: number;
  data: { object: Record<string, unknown> };
}

export interface FakeStripeOptions {
  /** Port on 127.0.0.1; 0 (the default) lets the system pick. */
  port?: number;
  /** Where signed events are posted; none are sent without it. */
  webhookUrl?: string;
  webhookSecret?: string;
}

export interface FakeStripe {
  port: number;
  url: string;
  /** Every event created, oldest first, whether sent, held or dropped. */
  events: FakeStripeEvent[];
  /** Points the webhooks somewhere else (tests start their app after the fake). */
  setWebhook(url: string | undefined, secret?: string): void;
  /** While held, events are kept instead of sent (a late or lost webhook); release sends them. */
  holdWebhooks(hold: boolean): void;
  releaseWebhooks(order?: 'as-created' | 'reversed'): Promise<number[]>;
  /** Signs a payload as the fake does, for posting an event by hand. */
  sign(payload: string, timestamp?: number): string;
  /** Pays (or fails) a session as the checkout page's form would; answers the redirect target. */
  submitCard(sessionId: string, card: string): Promise<{ status: number; location: string | null }>;
  env: Record<string, string>;
  stop(): Promise<void>;
}

interface SessionExtra {
  amountTotal: number;
  currency: string;
  paymentIntent: string;
  description: string;
  email: string | null;
  lastError: { type: string; code: string; decline_code?: string; message: string } | null;
  paid: boolean;
}

const EMULATOR_BOOT = `
const { createEmulator } = await import('emulate');
const emu = await createEmulator({ service: 'stripe', port: 0, hostname: '127.0.0.1' });
process.stdout.write(JSON.stringify({ url: emu.url }) + '\\n');
process.on('SIGTERM', () => emu.close().finally(() => process.exit(0)));
`;

/** The emulator runs in a child (it is ESM-only and Jest's loader cannot import it). */
async function startEmulator(): Promise<{ url: string; child: ChildProcess }> {
  const child = spawn(process.execPath, ['--input-type=module', '-e', EMULATOR_BOOT], {
    stdio: ['ignore', 'pipe', 'pipe'],
    cwd: process.cwd(),
  });
  return new Promise((resolve, reject) => {
    let out = '';
    let err = '';
    const timer = setTimeout(() => fail(new Error('the Stripe emulator did not start within 20 s')), 20_000);
    const fail = (e: Error) => {
      clearTimeout(timer);
      child.kill('SIGKILL');
      reject(e);
    };
    child.stderr!.on('data', (d: Buffer) => (err += d.toString()));
    child.on('exit', (code) => fail(new Error(`the Stripe emulator exited (${code}): ${err.slice(-500)}`)));
    child.stdout!.on('data', (d: Buffer) => {
      out += d.toString();
      const line = out.split('\n')[0];
      if (out.includes('\n')) {
        clearTimeout(timer);
        child.removeAllListeners('exit');
        child.stdout!.removeAllListeners('data');
        child.stdout!.resume();
        try {
          resolve({ url: (JSON.parse(line) as { url: string }).url, child });
        } catch {
          reject(new Error(`the Stripe emulator said: ${line}`));
        }
      }
    });
  });
}

const readBody = (req: IncomingMessage): Promise<string> =>
  new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => resolve(Buffer.concat(chunks).toString('utf8')));
    req.on('error', reject);
  });

const escapeHtml = (s: string) =>
  s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

function money(minor: number, currency: string): string {
  const code = currency.toUpperCase();
  const digits = new Intl.NumberFormat('en-GB', { style: 'currency', currency: code }).resolvedOptions()
    .maximumFractionDigits!;
  return new Intl.NumberFormat('en-GB', { style: 'currency', currency: code }).format(minor / 10 ** digits);
}

export async function startFakeStripe(opts: FakeStripeOptions = {}): Promise<FakeStripe> {
  const emulator = await startEmulator();
  const upstream = emulator.url.replace(/\/$/, '');
  const sessions = new Map<string, SessionExtra>();
  const idempotent = new Map<string, { status: number; body: string }>();
  const events: FakeStripeEvent[] = [];
  const held: FakeStripeEvent[] = [];
  let webhookUrl = opts.webhookUrl;
  let webhookSecret = opts.webhookSecret ?? FAKE_STRIPE_KEYS.webhookSecret;
  let hold = false;
  let front = '';

  const call = async (method: string, path: string, form?: URLSearchParams) => {
    const res = await fetch(`${upstream}${path}`, {
      method,
      headers: form ? { 'Content-Type': 'application/x-www-form-urlencoded' } : {},
      body: form?.toString(),
      redirect: 'manual',
    });
    const text = await res.text();
    return { status: res.status, text, json: () => JSON.parse(text) as Record<string, unknown> };
  };

  const sign = (payload: string, timestamp = Math.floor(Date.now() / 1000)) =>
    `t=${timestamp},v1=${createHmac('sha256', webhookSecret).update(`${timestamp}.${payload}`).digest('hex')}`;

  const deliver = async (event: FakeStripeEvent): Promise<number> => {
    if (!webhookUrl) return 0;
    const body = JSON.stringify({ object: 'event', api_version: '2025-01-01', livemode: false, ...event });
    try {
      const res = await fetch(webhookUrl, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json', 'Stripe-Signature': sign(body) },
        body,
        signal: AbortSignal.timeout(10_000),
      });
      return res.status;
    } catch {
      return 0;
    }
  };
  const emit = async (type: string, object: Record<string, unknown>) => {
    const event = {
      id: `evt_${randomBytes(12).toString('base64url')}`,
      type,
      created: Math.floor(Date.now() / 1000),
      data: { object },
    };
    events.push(event);
    if (hold) held.push(event);
    else await deliver(event);
  };

  const intentOf = (sessionId: string, extra: SessionExtra) => ({
    id: extra.paymentIntent,
    object: 'payment_intent',
    amount: extra.amountTotal,
    currency: extra.currency,
    status: extra.paid ? 'succeeded' : 'requires_payment_method',
    client_secret: `${extra.paymentIntent}_secret_${sessionId.slice(-8)}`,
    last_payment_error: extra.lastError,
    metadata: {},
  });
  const decorate = (session: Record<string, unknown>, expand: string[]) => {
    const extra = sessions.get(session['id'] as string);
    if (!extra) return session;
    return {
      ...session,
      amount_subtotal: extra.amountTotal,
      amount_total: extra.amountTotal,
      currency: extra.currency,
      customer_email: extra.email,
      payment_intent: expand.includes('payment_intent')
        ? intentOf(session['id'] as string, extra)
        : extra.paymentIntent,
      url: session['status'] === 'open' ? `${front}/checkout/${session['id'] as string}` : null,
    };
  };

  /** Turns inline `price_data` line items into a product and price on the emulator. */
  async function createSession(form: URLSearchParams): Promise<{ status: number; body: string }> {
    const out = new URLSearchParams();
    const items = new Map<string, Record<string, string>>();
    for (const [k, v] of form) {
      const m = /^line_items\[(\d+)\]\[(.+)\]$/.exec(k);
      if (m) items.set(m[1], { ...items.get(m[1]), [m[2]]: v });
      else out.append(k, v);
    }
    let total = 0;
    let currency = '';
    let description = '';
    for (const [i, li] of items) {
      let price = li['price'];
      if (!price) {
        const name = li['price_data][product_data][name'] ?? 'Payment';
        const product = await call('POST', '/v1/products', new URLSearchParams({ name }));
        if (product.status !== 200) return { status: product.status, body: product.text };
        const created = await call(
          'POST',
          '/v1/prices',
          new URLSearchParams({
            product: product.json()['id'] as string,
            currency: li['price_data][currency'] ?? '',
            unit_amount: li['price_data][unit_amount'] ?? '',
          }),
        );
        if (created.status !== 200) return { status: created.status, body: created.text };
        price = created.json()['id'] as string;
        description ||= name;
      }
      const p = (await call('GET', `/v1/prices/${price}`)).json();
      const qty = Number(li['quantity'] ?? '1');
      total += Number(p['unit_amount']) * qty;
      currency = String(p['currency']);
      out.append(`line_items[${i}][price]`, price);
      out.append(`line_items[${i}][quantity]`, String(qty));
    }
    const created = await call('POST', '/v1/checkout/sessions', out);
    if (created.status !== 200) return { status: created.status, body: created.text };
    const session = created.json();
    const intent = await call('POST', '/v1/payment_intents', new URLSearchParams({ amount: String(total), currency }));
    sessions.set(session['id'] as string, {
      amountTotal: total,
      currency,
      paymentIntent: intent.json()['id'] as string,
      description,
      email: form.get('customer_email'),
      lastError: null,
      paid: false,
    });
    return { status: 200, body: JSON.stringify(decorate(session, [])) };
  }

  async function submitCard(sessionId: string, card: string): Promise<{ status: number; location: string | null }> {
    const extra = sessions.get(sessionId);
    const got = await call('GET', `/v1/checkout/sessions/${sessionId}`);
    if (!extra || got.status !== 200) return { status: 404, location: null };
    const session = got.json();
    if (session['status'] !== 'open') return { status: 303, location: `/checkout/${sessionId}` };
    const digits = card.replace(/\D/g, '');
    if (digits === TEST_CARDS.decline) {
      extra.lastError = {
        type: 'card_error',
        code: 'card_declined',
        decline_code: 'generic_decline',
        message: 'Your card was declined.',
      };
      await emit('payment_intent.payment_failed', intentOf(sessionId, extra));
      return { status: 303, location: `/checkout/${sessionId}?declined=1` };
    }
    if (digits !== TEST_CARDS.success) return { status: 303, location: `/checkout/${sessionId}?unknown=1` };
    const done = await call('POST', `/checkout/${sessionId}/complete`, new URLSearchParams());
    if (done.status >= 400) return { status: 502, location: null };
    extra.paid = true;
    extra.lastError = null;
    const completed = decorate((await call('GET', `/v1/checkout/sessions/${sessionId}`)).json(), []);
    await emit('checkout.session.completed', completed);
    const success = String(session['success_url'] ?? '');
    return { status: 303, location: success ? success.replace('{CHECKOUT_SESSION_ID}', sessionId) : null };
  }

  function checkoutPage(sessionId: string, session: Record<string, unknown>, query: URLSearchParams): string {
    const extra = sessions.get(sessionId)!;
    const notice = query.has('declined')
      ? `<p class="refused" role="alert">&#9888; ${escapeHtml(extra.lastError?.message ?? 'Declined.')} (card_declined)</p>`
      : query.has('unknown')
        ? '<p class="refused" role="alert">&#9888; Only the local test cards work here.</p>'
        : '';
    const cancel = session['cancel_url']
      ? `<a class="back" href="${escapeHtml(String(session['cancel_url']))}">Back without paying</a>`
      : '';
    return `<!doctype html><html lang="en"><head><meta charset="utf-8"/>
<meta name="viewport" content="width=device-width,initial-scale=1"/><title>Local test payment</title>
<style>
body{font:16px/1.5 system-ui,sans-serif;margin:0;background:#eef0ec;color:#1d2320}
main{max-width:26rem;margin:2rem auto;padding:1.5rem;background:#fff;border:1px solid #c9cec6}
h1{font-size:1.1rem;margin:0 0 .25rem} .amount{font-size:1.8rem;margin:.5rem 0 1rem}
label{display:block;margin:.75rem 0 .25rem} input{width:100%;box-sizing:border-box;padding:.5rem;font:inherit}
button{margin-top:1rem;width:100%;padding:.6rem;font:inherit;border:0;background:#2d4a3e;color:#fff}
.refused{border:2px solid #8a1c1c;padding:.5rem;margin:0 0 1rem}.back{display:block;margin-top:1rem}
.hint{font-size:.85rem;color:#4b534e}
</style></head><body><main>
<h1>Local test payment</h1><p class="hint">A stand-in for the card processor on this machine. No money moves.</p>
<p>${escapeHtml(extra.description)}</p><p class="amount" data-testid="amount">${escapeHtml(money(extra.amountTotal, extra.currency))}</p>
${notice}
<form method="post" action="/checkout/${escapeHtml(sessionId)}/complete">
<label for="card">Card number</label>
<input id="card" name="card" inputmode="numeric" autocomplete="off" placeholder="4242 4242 4242 4242" required/>
<p class="hint">4242 4242 4242 4242 pays; 4000 0000 0000 0002 is declined.</p>
<button type="submit">Pay ${escapeHtml(money(extra.amountTotal, extra.currency))}</button>
</form>${cancel}</main></body></html>`;
  }

  const send = (res: ServerResponse, status: number, body: string, type = 'application/json') => {
    res.writeHead(status, { 'Content-Type': type });
    res.end(body);
  };

  async function handle(req: IncomingMessage, res: ServerResponse): Promise<void> {
    const url = new URL(req.url ?? '/', 'http://127.0.0.1');
    const body = await readBody(req);
    const method = req.method ?? 'GET';
    const expand = [...url.searchParams].filter(([k]) => /^expand(\[\d*\])?$/.test(k)).map(([, v]) => v);
    if (method === 'POST' && url.pathname === '/v1/checkout/sessions') {
      const key = req.headers['idempotency-key'];
      const cached = typeof key === 'string' ? idempotent.get(key) : undefined;
      if (cached) return send(res, cached.status, cached.body);
      const created = await createSession(new URLSearchParams(body));
      if (typeof key === 'string' && created.status === 200) idempotent.set(key, created);
      return send(res, created.status, created.body);
    }
    const sessionGet = /^\/v1\/checkout\/sessions\/([\w-]+)$/.exec(url.pathname);
    if (method === 'GET' && sessionGet) {
      const got = await call('GET', url.pathname);
      return send(res, got.status, got.status === 200 ? JSON.stringify(decorate(got.json(), expand)) : got.text);
    }
    const intentGet = /^\/v1\/payment_intents\/([\w-]+)$/.exec(url.pathname);
    if (method === 'GET' && intentGet) {
      const entry = [...sessions.entries()].find(([, e]) => e.paymentIntent === intentGet[1]);
      if (entry) return send(res, 200, JSON.stringify(intentOf(entry[0], entry[1])));
    }
    const page = /^\/checkout\/([\w-]+)$/.exec(url.pathname);
    if (method === 'GET' && page) {
      const got = await call('GET', `/v1/checkout/sessions/${page[1]}`);
      if (got.status !== 200 || !sessions.has(page[1]))
        return send(res, 404, '<!doctype html><p>No such payment session.</p>', 'text/html; charset=utf-8');
      const session = got.json();
      if (session['status'] !== 'open')
        return send(
          res,
          200,
          `<!doctype html><p>This payment session is ${escapeHtml(String(session['status']))}.</p>`,
          'text/html; charset=utf-8',
        );
      return send(res, 200, checkoutPage(page[1], session, url.searchParams), 'text/html; charset=utf-8');
    }
    const complete = /^\/checkout\/([\w-]+)\/complete$/.exec(url.pathname);
    if (method === 'POST' && complete) {
      const outcome = await submitCard(complete[1], new URLSearchParams(body).get('card') ?? '');
      if (!outcome.location) return send(res, outcome.status, '<!doctype html><p>Payment received.</p>', 'text/html');
      res.writeHead(303, { Location: outcome.location });
      return void res.end();
    }
    // Anything else goes to the emulator as it is.
    const passed = await fetch(`${upstream}${url.pathname}${url.search}`, {
      method,
      headers: { 'Content-Type': String(req.headers['content-type'] ?? 'application/x-www-form-urlencoded') },
      body: method === 'GET' || method === 'HEAD' ? undefined : body,
      redirect: 'manual',
    });
    res.writeHead(passed.status, { 'Content-Type': passed.headers.get('content-type') ?? 'application/json' });
    res.end(Buffer.from(await passed.arrayBuffer()));
  }

  const server = createServer((req, res) => {
    handle(req, res).catch((err: Error) => {
      if (!res.headersSent)
        send(res, 500, JSON.stringify({ error: { type: 'api_error', message: `fake: ${err.message}` } }));
      else res.destroy();
    });
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port ?? 0, '127.0.0.1', () => resolve());
  });
  const port = (server.address() as AddressInfo).port;
  front = `http://127.0.0.1:${port}`;

  return {
    port,
    url: front,
    events,
    setWebhook(url, secret) {
      webhookUrl = url;
      if (secret) webhookSecret = secret;
    },
    holdWebhooks(h) {
      hold = h;
    },
    async releaseWebhooks(order = 'as-created') {
      const batch = held.splice(0, held.length);
      if (order === 'reversed') batch.reverse();
      const statuses: number[] = [];
      for (const e of batch) statuses.push(await deliver(e));
      return statuses;
    },
    sign,
    submitCard,
    env: fakeStripeEnv(port),
    stop: async () => {
      await new Promise<void>((resolve) => server.close(() => resolve()));
      server.closeAllConnections();
      if (emulator.child.exitCode === null) {
        const exited = new Promise((resolve) => emulator.child.once('exit', resolve));
        emulator.child.kill('SIGTERM');
        await Promise.race([exited, new Promise((r) => setTimeout(r, 2000))]);
        if (emulator.child.exitCode === null) emulator.child.kill('SIGKILL');
      }
    },
  };
}

/** Environment for the API that points it at the fake (LOCAL ONLY keys). */
export function fakeStripeEnv(port: number): Record<string, string> {
  return {
    STRIPE_SECRET_KEY: FAKE_STRIPE_KEYS.secretKey,
    STRIPE_WEBHOOK_SECRET: FAKE_STRIPE_KEYS.webhookSecret,
    STRIPE_API_HOST: '127.0.0.1',
    STRIPE_API_PORT: String(port),
    STRIPE_API_PROTOCOL: 'http',
  };
}
