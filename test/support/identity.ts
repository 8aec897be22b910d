import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import pino from 'pino';
import request from 'supertest';
import type TestAgent from 'supertest/lib/agent';
import type { Db } from '../../apps/server/src/db/db';
import { createIdentityProvider } from '../../apps/identity/src/provider';
import type { ThrottlePolicy } from '../../apps/identity/src/throttle';
import { DEMO_PASSWORD } from '../../seeds/identity';

/** Where the API under test says it lives; nothing listens there, tests only take the path. */
export const TEST_PUBLIC_URL = 'http://127.0.0.1:4310';
export const TEST_CLIENT = { clientId: 'trabeate-test', clientSecret: 'test-client-secret-not-for-use' };

export interface TestIdentity {
  issuer: string;
  stop: () => Promise<void>;
}

/** The real local identity provider, in this process on a free port, on the test file's database. */
export async function startIdentity(
  db: Db,
  opts: { loginRateLimit?: number; throttle?: Partial<ThrottlePolicy> } = {},
): Promise<TestIdentity> {
  // Assigned once the provider is built; the server must listen first to know its own issuer URL.
  // eslint-disable-next-line prefer-const
  let handler: ((req: never, res: never) => void) | undefined;
  const server: Server = createServer((req, res) => (handler ? handler(req as never, res as never) : res.end()));
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const issuer = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const { app } = await createIdentityProvider({
    db,
    issuer,
    logger: pino({ level: process.env.TEST_LOG_LEVEL ?? 'silent' }),
    loginRateLimit: opts.loginRateLimit ?? 1000,
    throttle: opts.throttle,
    clients: [
      {
        ...TEST_CLIENT,
        redirectUris: [`${TEST_PUBLIC_URL}/api/auth/callback`],
        postLogoutRedirectUris: [`${TEST_PUBLIC_URL}/`],
      },
    ],
  });
  handler = app as never;
  return {
    issuer,
    stop: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}

const pathOf = (location: string) => {
  const u = new URL(location, TEST_PUBLIC_URL);
  return u.pathname + u.search;
};

/** Follows the provider's own redirects; stops at a page or at a redirect that leaves the provider. */
async function followProvider(idp: TestAgent, issuer: string, res: request.Response): Promise<request.Response> {
  for (let i = 0; i < 10 && [302, 303].includes(res.status); i++) {
    const location = String(res.headers['location']);
    if (!location.startsWith('/') && !location.startsWith(issuer)) return res;
    res = await idp.get(pathOf(location));
  }
  return res;
}

export interface SignInSteps {
  /** The answer to GET /api/auth/login. */
  start: request.Response;
  /** The provider's sign-in page. */
  loginPage: request.Response;
  /** The provider's answer to the password form (before following it). */
  afterPassword: request.Response;
  /** The path of the callback the provider sent the browser to, or null if it did not. */
  callbackPath: string | null;
  /** The API's answer to the callback (null when the callback was not followed). */
  callback: request.Response | null;
  idp: TestAgent;
}

/**
 * Signs a person in the way a browser would: the API's login redirect, the provider's page and
 * form, its redirects, then the API's callback. Two agents keep each side's cookies.
 */
export async function signIn(
  api: TestAgent,
  identity: TestIdentity,
  email: string,
  opts: { password?: string; returnTo?: string; followCallback?: boolean } = {},
): Promise<SignInSteps> {
  const start = await api.get(`/api/auth/login?returnTo=${encodeURIComponent(opts.returnTo ?? '/')}`);
  if (start.status !== 302) throw new Error(`login answered ${start.status}: ${start.text}`);
  const idp = request.agent(identity.issuer);
  const loginPage = await followProvider(idp, identity.issuer, await idp.get(pathOf(start.headers['location'])));
  const csrf = /name="csrf" value="([^"]+)"/.exec(loginPage.text)?.[1];
  const action = /<form method="post" action="([^"]+)"/.exec(loginPage.text)?.[1];
  if (!csrf || !action)
    throw new Error(`no sign-in form on the provider's page (${loginPage.status}): ${loginPage.text.slice(0, 300)}`);
  const afterPassword = await idp
    .post(action)
    .type('form')
    .send({ csrf, email, password: opts.password ?? DEMO_PASSWORD });
  const final = await followProvider(idp, identity.issuer, afterPassword);
  const location = final.headers['location'] ? String(final.headers['location']) : '';
  const callbackPath = location.startsWith(`${TEST_PUBLIC_URL}/api/auth/callback`) ? pathOf(location) : null;
  const callback = callbackPath && opts.followCallback !== false ? await api.get(callbackPath) : null;
  return { start, loginPage, afterPassword, callbackPath, callback, idp };
}

/** The XSRF-TOKEN value an agent holds (what Angular would echo in X-XSRF-TOKEN). */
export function xsrfToken(api: TestAgent): string {
  const cookie = (
    api as unknown as { jar: { getCookie(name: string, info: unknown): { value: string } | undefined } }
  ).jar.getCookie('XSRF-TOKEN', { domain: '127.0.0.1', path: '/', secure: false, script: true });
  if (!cookie) throw new Error('the agent holds no XSRF-TOKEN cookie');
  return cookie.value;
}
