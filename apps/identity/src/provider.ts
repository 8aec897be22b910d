import { createHmac, timingSafeEqual } from 'node:crypto';
import express, { type Express, type Request, type Response } from 'express';
import type { Knex } from 'knex';
import Provider, { errors, type ClientMetadata, type Configuration, type KoaContextWithOIDC } from 'oidc-provider';
import { rateLimit } from 'express-rate-limit';
import type { Logger } from 'pino';
import { PgAdapter } from './adapter';
import { checkPassword, findAccountById } from './accounts';
import { loadSecrets } from './keys';
import { accountKey, claimTry, DEFAULT_THROTTLE, forgiveTry, waitInWords, type ThrottlePolicy } from './throttle';
import { loginPage, logoutPage, messagePage } from './pages';

export interface IdentityClient {
  clientId: string;
  clientSecret: string;
  clientName?: string;
  redirectUris: string[];
  postLogoutRedirectUris: string[];
}

export interface IdentityProviderOptions {
  db: Knex;
  /** The issuer URL exactly as clients reach it, for example http://127.0.0.1:4311 */
  issuer: string;
  clients: IdentityClient[];
  logger: Logger;
  /** Failed password tries per address in 15 minutes (successful ones are not counted). */
  loginRateLimit?: number;
  /** How failed passwords for one account slow the next try (DEFAULT_THROTTLE unless given). */
  throttle?: Partial<ThrottlePolicy>;
}

const BAD_LINK =
  'The address of this page is not valid (a "%" in it is not followed by two hex digits). Go back to Trabeate and choose “Sign in” again.';

const PAGE_HEADERS: Record<string, string> = {
  'Content-Security-Policy':
    "default-src 'none'; style-src 'unsafe-inline'; img-src data:; frame-ancestors 'none'; base-uri 'none'",
  'X-Content-Type-Options': 'nosniff',
  // same-origin, not no-referrer: with no-referrer browsers send "Origin: null" on the form post.
  'Referrer-Policy': 'same-origin',
  'Cache-Control': 'no-store',
};

/**
 * Trabeate's local OpenID Connect provider: accounts in PostgreSQL with argon2id passwords, our
 * own sign-in page, PKCE required, keys generated once and kept in the database. The API talks to
 * it only through standard OpenID Connect, as it would to a firm's own provider.
 */
export async function createIdentityProvider(
  opts: IdentityProviderOptions,
): Promise<{ app: Express; provider: Provider }> {
  const { db, issuer, logger } = opts;
  const throttle: ThrottlePolicy = { ...DEFAULT_THROTTLE, ...opts.throttle };
  const { jwk, cookieKeys } = await loadSecrets(db);
  const clientNames = new Map(opts.clients.map((c) => [c.clientId, c.clientName ?? 'Trabeate']));

  const configuration: Configuration = {
    adapter: (name: string) => new PgAdapter(db, name),
    clients: opts.clients.map((c): ClientMetadata => ({
      client_id: c.clientId,
      client_secret: c.clientSecret,
      client_name: c.clientName ?? 'Trabeate',
      redirect_uris: c.redirectUris,
      post_logout_redirect_uris: c.postLogoutRedirectUris,
      grant_types: ['authorization_code'],
      response_types: ['code'],
      token_endpoint_auth_method: 'client_secret_basic',
    })),
    async findAccount(_ctx, sub) {
      const account = await findAccountById(db, sub);
      if (!account) return undefined;
      return {
        accountId: account.id,
        claims: () => ({ sub: account.id, email: account.email, email_verified: true, name: account.name }),
      };
    },
    claims: { openid: ['sub'], email: ['email', 'email_verified'], profile: ['name'] },
    scopes: ['openid', 'email', 'profile'],
    // Put e-mail and name in the ID token itself, so the relying party needs no userinfo call.
    conformIdTokenClaims: false,
    pkce: { required: () => true },
    responseTypes: ['code'],
    features: {
      devInteractions: { enabled: false },
      rpInitiatedLogout: {
        enabled: true,
        logoutSource: async (ctx: KoaContextWithOIDC, form: string) => {
          ctx.set(PAGE_HEADERS);
          ctx.type = 'html';
          ctx.body = logoutPage(form);
        },
        postLogoutSuccessSource: async (ctx: KoaContextWithOIDC) => {
          ctx.set(PAGE_HEADERS);
          ctx.type = 'html';
          ctx.body = messagePage('Signed out', 'You are signed out of the sign-in service. You can close this tab.');
        },
      },
    },
    interactions: { url: (_ctx, interaction) => `/interaction/${interaction.uid}` },
    cookies: { keys: cookieKeys },
    jwks: { keys: [jwk as never] },
    ttl: {
      AccessToken: 600,
      AuthorizationCode: 60,
      IdToken: 3600,
      Interaction: 900,
      Session: 8 * 3600,
      Grant: 8 * 3600,
    },
    // Trabeate is a first-party client: its users are not asked to consent to it.
    async loadExistingGrant(ctx) {
      const session = ctx.oidc.session;
      const client = ctx.oidc.client;
      if (!session?.accountId || !client) return undefined;
      const grantId = ctx.oidc.result?.consent?.grantId || session.grantIdFor(client.clientId);
      if (grantId) {
        const existing = await ctx.oidc.provider.Grant.find(grantId);
        if (existing) return existing;
      }
      const grant = new ctx.oidc.provider.Grant({ clientId: client.clientId, accountId: session.accountId });
      grant.addOIDCScope('openid email profile');
      await grant.save();
      return grant;
    },
    async renderError(ctx, out, error) {
      logger.warn({ err: error, out }, 'identity provider error page');
      ctx.set(PAGE_HEADERS);
      ctx.type = 'html';
      ctx.body = messagePage(
        'Sign-in could not continue',
        String(out.error_description ?? out.error ?? 'Something was wrong with the sign-in request.'),
      );
    },
  };

  const provider = new Provider(issuer, configuration);
  provider.on('server_error', (_ctx, err) => logger.error({ err }, 'identity provider server error'));

  const csrfKey = cookieKeys[0];
  const csrfFor = (uid: string) => createHmac('sha256', csrfKey).update(`login:${uid}`).digest('base64url');
  const issuerOrigin = new URL(issuer).origin;

  const app = express();
  app.disable('x-powered-by');
  const send = (res: Response, status: number, html: string): void =>
    void res.status(status).set(PAGE_HEADERS).type('html').send(html);
  // The provider's own routes (Koa) would answer such a path 404 or fail decoding its parameters;
  // one check here gives every page the same plain 400.
  app.use((req, res, next) => {
    try {
      decodeURIComponent(req.path);
    } catch {
      return void send(res, 400, messagePage('This link is damaged', BAD_LINK));
    }
    next();
  });
  const expired = (res: Response): void =>
    void send(
      res,
      400,
      messagePage('This sign-in page has expired', 'Go back to Trabeate and choose “Sign in” again.'),
    );

  app.get('/interaction/:uid', async (req, res): Promise<void> => {
    const details = await provider.interactionDetails(req, res);
    if (details.uid !== req.params['uid']) return expired(res);
    if (details.prompt.name !== 'login') {
      // Consent is granted by loadExistingGrant; any other prompt is not offered here.
      return send(
        res,
        400,
        messagePage('Sign-in could not continue', 'This sign-in asked for something this service does not offer.'),
      );
    }
    send(
      res,
      200,
      loginPage({
        uid: details.uid,
        csrf: csrfFor(details.uid),
        clientName: clientNames.get(String(details.params['client_id'])) ?? 'Trabeate',
      }),
    );
  });

  app.post(
    '/interaction/:uid/login',
    express.urlencoded({ extended: false, limit: '10kb' }),
    // A backstop against one address trying many accounts; an office signing in successfully
    // behind one address never meets it. Each account has its own growing wait (below).
    rateLimit({
      windowMs: 15 * 60_000,
      limit: opts.loginRateLimit ?? 100,
      skipSuccessfulRequests: true,
      standardHeaders: 'draft-8',
      legacyHeaders: false,
      handler: (req, res) => {
        logger.warn({ ip: req.ip }, 'sign-in attempts rate limited');
        send(
          res,
          429,
          messagePage(
            'Too many attempts',
            'Too many sign-in attempts came from your network. Wait a few minutes and try again.',
          ),
        );
      },
    }),
    async (req: Request, res: Response): Promise<void> => {
      const details = await provider.interactionDetails(req, res);
      const uid = details.uid;
      if (uid !== req.params['uid'] || details.prompt.name !== 'login') return expired(res);
      const origin = req.headers.origin;
      const token = typeof req.body?.csrf === 'string' ? req.body.csrf : '';
      const expected = csrfFor(uid);
      if (
        (origin && origin !== issuerOrigin) ||
        token.length !== expected.length ||
        !timingSafeEqual(Buffer.from(token), Buffer.from(expected))
      ) {
        logger.warn({ uid, origin }, 'sign-in form refused: CSRF check failed');
        return send(
          res,
          403,
          messagePage(
            'Sign-in refused',
            'The sign-in form did not come from this page. Go back to Trabeate and start again.',
          ),
        );
      }
      const email = typeof req.body.email === 'string' ? req.body.email.slice(0, 254) : '';
      const password = typeof req.body.password === 'string' ? req.body.password.slice(0, 1024) : '';
      const clientName = clientNames.get(String(details.params['client_id'])) ?? 'Trabeate';
      if (!email || !password) {
        return send(
          res,
          400,
          loginPage({ uid, csrf: expected, email, clientName, error: 'Enter your e-mail address and password.' }),
        );
      }
      // The same words and the same waits whether or not an account has this e-mail address.
      const key = accountKey(email);
      const claim = await claimTry(db, key, throttle);
      if (!claim.allowed) {
        logger.warn({ uid }, 'sign-in refused: this account is waiting after failed passwords');
        res.setHeader('Retry-After', String(Math.max(1, Math.ceil(claim.waitSeconds))));
        return send(
          res,
          429,
          loginPage({
            uid,
            csrf: expected,
            email,
            clientName,
            error: `Too many wrong passwords for this e-mail address. Wait ${waitInWords(claim.waitSeconds)}, then try again. The password was not checked.`,
          }),
        );
      }
      const account = await checkPassword(db, email, password);
      if (!account) {
        logger.info({ uid, failures: claim.failures }, 'sign-in failed: e-mail and password do not match');
        if (claim.waitSeconds > 0) res.setHeader('Retry-After', String(Math.ceil(claim.waitSeconds)));
        return send(
          res,
          401,
          loginPage({
            uid,
            csrf: expected,
            email,
            clientName,
            error:
              'That e-mail address and password do not match.' +
              (claim.waitSeconds > 0
                ? ` Wait ${waitInWords(claim.waitSeconds)} before the next try: each wrong password makes the wait longer.`
                : ''),
          }),
        );
      }
      await forgiveTry(db, key);
      logger.info({ accountId: account.id }, 'signed in at the identity provider');
      await provider.interactionFinished(
        req,
        res,
        { login: { accountId: account.id } },
        { mergeWithLastSubmission: false },
      );
    },
  );

  app.get('/interaction/:uid/abort', async (req, res): Promise<void> => {
    const details = await provider.interactionDetails(req, res);
    if (details.uid !== req.params['uid']) return expired(res);
    await provider.interactionFinished(
      req,
      res,
      { error: 'access_denied', error_description: 'The person cancelled the sign-in.' },
      { mergeWithLastSubmission: false },
    );
  });

  app.use('/interaction', (err: unknown, _req: Request, res: Response, _next: express.NextFunction): void => {
    if (err instanceof errors.SessionNotFound || err instanceof errors.InvalidRequest) return void expired(res);
    logger.error({ err }, 'sign-in page failed');
    send(
      res,
      500,
      messagePage('Something went wrong', 'The sign-in service had a problem. It has been logged; try again.'),
    );
  });

  app.use(provider.callback());
  return { app, provider };
}
