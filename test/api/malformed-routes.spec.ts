import { randomUUID } from 'node:crypto';
import request from 'supertest';
import type TestAgent from 'supertest/lib/agent';
import { DEMO } from '../../seeds/demo';
import type { FakeSmtp } from '../../scripts/fakes/smtp';
import { FAKE_STRIPE_KEYS, type FakeStripe } from '../../scripts/fakes/stripe';
import { testApp, type TestApp } from '../support/app';
import { startFakeSmtp, startFakeStripe, tinyPdf } from '../support/fakes';
import { signIn, xsrfToken } from '../support/identity';

// Each test sends one malformed input to every route; each sign-in runs argon2 at the provider.
jest.setTimeout(60_000);

// The project the sweep works on: a copy of Kestrel Yard's team, so the demo rows stay as they are.
const PROJECT = randomUUID();
// Archiving is tried on a project of its own, so the sweep's project stays open for uploads.
const ARCHIVABLE = randomUUID();
const SPARE_USER = randomUUID();
const STAGES = ['design_basis', 'column_layout', 'beam_framing', 'slab_panels', 'stairs', 'foundations'];

/** A real value for each path parameter, so requests get past the guard to the handlers. */
function concretePath(path: string, params: Record<string, string> = {}): string {
  const real: Record<string, string> = {
    projectId: /\/(archive|restore)$/.test(path) ? ARCHIVABLE : PROJECT,
    stageKey: 'beam_framing',
    deliverableId: randomUUID(),
    userId: SPARE_USER,
    id: SPARE_USER,
    token: 'sweep-invitation-token-that-does-not-exist',
    ...params,
  };
  return path.replace(/:(\w+)/g, (_m, name: string) => real[name] ?? randomUUID());
}

const BOUNDARY = 'sweep-boundary-7f3a';
const part = (fileName: string, data: Buffer, close = true) =>
  Buffer.concat([
    Buffer.from(
      `--${BOUNDARY}\r\nContent-Disposition: form-data; name="file"; filename="${fileName}"\r\n` +
        'Content-Type: application/pdf\r\n\r\n',
      'latin1',
    ),
    data,
    Buffer.from(close ? `\r\n--${BOUNDARY}--\r\n` : ''),
  ]);

// Field names the routes read, each given a hostile value; zod strips what a route does not know.
const withEvery = (value: unknown) =>
  Object.fromEntries(
    ['name', 'body', 'reference', 'displayName', 'email', 'role', 'action', 'dueDate', 'siteAddress', 'q'].map((k) => [
      k,
      value,
    ]),
  );
const deep = (depth: number) => '['.repeat(depth) + ']'.repeat(depth);

type Send = (req: request.Test) => request.Test;

interface Case {
  name: string;
  /** Path parameters to use instead of the real ones (already percent-encoded). */
  params?: Record<string, string>;
  query?: string;
  send: Send;
}

const json =
  (body: unknown): Send =>
  (req) =>
    req.set('Content-Type', 'application/json').send(JSON.stringify(body));
const raw =
  (contentType: string, body: string | Buffer, headers: Record<string, string> = {}): Send =>
  (req) =>
    req.set({ 'Content-Type': contentType, ...headers }).send(body);

/** The malformed inputs every route is sent. */
const CASES: Case[] = [
  { name: 'NUL in JSON strings', send: json(withEvery('Kestrel\u0000Yard')) },
  { name: 'NUL in a JSON key', send: json({ ['na\u0000me']: 'x', nested: { ['\u0000']: ['\u0000'] } }) },
  { name: 'NUL in the query', query: 'q=%00&page=%00&returnTo=%00&code=%00&state=%00', send: (r) => r },
  { name: 'broken JSON', send: raw('application/json', '{"name": "B4", ') },
  { name: 'JSON that is not an object', send: raw('application/json', '"just a string"') },
  { name: 'wrong content type', send: raw('text/plain', 'name=B4') },
  { name: 'XML body', send: raw('application/xml', '<project><name>B4</name></project>') },
  { name: 'urlencoded with a broken escape', send: raw('application/x-www-form-urlencoded', 'name=%ZZ&body=%') },
  {
    name: 'gzip header with a plain body',
    send: raw('application/json', JSON.stringify({ name: 'B4' }), { 'Content-Encoding': 'gzip' }),
  },
  { name: 'an unknown content encoding', send: raw('application/json', '{}', { 'Content-Encoding': 'x-squash' }) },
  { name: 'a charset we do not take', send: raw('application/json; charset=ebcdic', '{}') },
  { name: 'multipart without a boundary', send: raw('multipart/form-data', part('plan.pdf', tinyPdf())) },
  {
    name: 'multipart cut off mid-file',
    send: raw(`multipart/form-data; boundary=${BOUNDARY}`, part('plan.pdf', tinyPdf().subarray(0, 150), false)),
  },
  {
    name: 'multipart with NUL in the file name',
    send: raw(`multipart/form-data; boundary=${BOUNDARY}`, part('pl\u0000an.pdf', tinyPdf())),
  },
  {
    name: 'multipart with a header line that is not a header',
    send: raw(
      `multipart/form-data; boundary=${BOUNDARY}`,
      `--${BOUNDARY}\r\nthis is not a header\r\n\r\nx\r\n--${BOUNDARY}--\r\n`,
    ),
  },
  { name: 'bad percent-encoding in a parameter', params: allParams('%ZZ'), send: (r) => r },
  { name: 'truncated UTF-8 escape in a parameter', params: allParams('%E0%A4%A'), send: (r) => r },
  { name: 'NUL in a parameter', params: allParams('%00'), send: (r) => r },
  { name: 'a very long parameter', params: allParams('9'.repeat(4000)), send: (r) => r },
  { name: 'long strings (400 kB in all, under the body limit)', send: json(withEvery('x'.repeat(40_000))) },
  { name: 'numbers at the edge', send: json({ ...withEvery(1e308), storeys: 1e308, storeyHeightM: -0, page: -1 }) },
  { name: 'arrays and objects where text belongs', send: json(withEvery([{ a: [] }])) },
  { name: 'a lone surrogate', send: json(withEvery('\ud800')) },
  {
    name: 'JSON nested ten thousand deep',
    send: raw('application/json', `{"name":${deep(10_000)},"body":${deep(10_000)}}`),
  },
  {
    name: 'repeated, huge and badly escaped query values',
    query: 'q=a&q=b&page=99999999999999999999999&pageSize=-5&sort=%27%3B--&returnTo=//evil.example&x=%ZZ%E0%A4%A',
    send: (r) => r,
  },
];

/** The agent's CSRF token; none once signing out has cleared it (the session is gone too). */
function tokenOf(agent: TestAgent): string {
  try {
    return xsrfToken(agent);
  } catch {
    return '';
  }
}

function allParams(value: string): Record<string, string> {
  return Object.fromEntries(['projectId', 'stageKey', 'deliverableId', 'userId', 'id', 'token'].map((k) => [k, value]));
}

describe('malformed input sent to every route never makes the API answer 5xx', () => {
  let t: TestApp;
  let smtp: FakeSmtp;
  let stripe: FakeStripe;
  let principal: TestAgent;
  let leaving: TestAgent;

  const signedIn = async () => {
    const api = request.agent(t.app);
    const steps = await signIn(api, t.identity!, DEMO.users.principal.email);
    if (steps.callback?.status !== 302) throw new Error('the principal could not sign in');
    await api.get('/api/me'); // the XSRF-TOKEN cookie, as the client would hold it
    return api;
  };

  beforeAll(async () => {
    smtp = await startFakeSmtp({ httpPort: 0 });
    // Card payments set up, so the webhook route is swept past its "not set up" answer too.
    stripe = await startFakeStripe();
    t = await testApp({
      seed: true,
      identity: true,
      config: {
        DEV_OUTBOX_URL: `http://127.0.0.1:${smtp.httpPort}`,
        STRIPE_SECRET_KEY: FAKE_STRIPE_KEYS.secretKey,
        STRIPE_WEBHOOK_SECRET: FAKE_STRIPE_KEYS.webhookSecret,
        STRIPE_API_HOST: '127.0.0.1',
        STRIPE_API_PORT: stripe.port,
      },
    });
    for (const [id, reference] of [
      [PROJECT, 'SQ-SWEEP'],
      [ARCHIVABLE, 'SQ-SWEEP-A'],
    ]) {
      await t.db('projects').insert({
        id,
        firm_id: DEMO.firm.id,
        reference,
        name: 'Sweep annex',
        client_organisation_id: DEMO.clients.fenwick.id,
        storeys: 2,
      });
      await t.db('stages').insert(
        STAGES.map((key, i) => ({
          project_id: id,
          key,
          position: i + 1,
          state: key === 'beam_framing' ? 'in_progress' : 'not_started',
          assignee_id: DEMO.users.engineerA.id,
        })),
      );
      await t.db('project_members').insert({ project_id: id, user_id: DEMO.users.engineerA.id });
    }
    await t.db('users').insert({
      id: SPARE_USER,
      firm_id: DEMO.firm.id,
      email: 'sweep.spare@sablequay.example',
      display_name: 'Sweep Spare',
      firm_role: 'engineer',
    });
    principal = await signedIn();
    // Signing out ends the session it is sent with: that route gets a session of its own.
    leaving = await signedIn();
  });
  afterAll(async () => {
    await t?.close();
    await smtp?.stop();
    await stripe?.stop();
  });

  it('sweeps a non-empty list of routes, multipart upload among them', () => {
    const routes = t.app.locals['routes'] as Array<{ method: string; path: string }>;
    expect(routes.length).toBeGreaterThan(20);
    expect(routes).toContainEqual(
      expect.objectContaining({ method: 'post', path: '/projects/:projectId/stages/:stageKey/deliverables' }),
    );
  });

  // The routes as mounted: the access registry's list, the same one the authorization matrix reads.
  const declared = (): Array<{ method: 'get' | 'post' | 'put' | 'patch' | 'delete'; path: string }> =>
    t.app.locals['routes'];

  it.each(CASES.map((c) => [c.name, c] as const))(
    'answers %s below 500 on every route, in the error shape',
    async (_name, c) => {
      const failures: string[] = [];
      for (const r of declared()) {
        const agent = r.path === '/auth/logout' ? leaving : principal;
        const url = `/api${concretePath(r.path, c.params)}${c.query ? `?${c.query}` : ''}`;
        let req = agent[r.method](url);
        if (r.method !== 'get') req = req.set('X-XSRF-TOKEN', tokenOf(agent));
        const res = await c.send(req);
        const label = `${r.method.toUpperCase()} ${r.path}: ${res.status}`;
        if (res.status >= 500) {
          failures.push(`${label} ${JSON.stringify(res.body)}`);
          continue;
        }
        if (res.status >= 400 && res.headers['content-type']?.startsWith('application/json')) {
          const e = res.body?.error;
          if (typeof e?.code !== 'string' || typeof e?.message !== 'string' || e.message.length < 10)
            failures.push(`${label} without a readable error: ${res.text.slice(0, 200)}`);
        }
        // The sweep means nothing if the guard turned it away: it must reach the handlers.
        if (['csrf_failed', 'unauthenticated', 'no_access', 'session_expired'].includes(res.body?.error?.code))
          failures.push(`${label} stopped at the guard (${res.body.error.code})`);
      }
      expect(failures).toEqual([]);
    },
  );
});
