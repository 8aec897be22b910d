import { createHmac } from 'node:crypto';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import cookieParser from 'cookie-parser';
import { doubleCsrf } from 'csrf-csrf';
import express, { type Express, type Request, type RequestHandler } from 'express';
import { mountRoutes, route, SAFE_METHODS } from './access/registry';
import { authRoutes } from './auth/auth.routes';
import { OidcClient } from './auth/oidc';
import { signInRateLimit } from './auth/rate-limit';
import { loadCaller, sessionMiddleware } from './auth/session';
import { EVERY_SESSION_KEY, SessionCache } from './auth/session-cache';
import { outboxUrlOf, type AuthConfig, type Config, type PaymentsConfig } from './core/config';
import { apiNotFound, errorHandler } from './core/errors';
import type { ChangeFeed } from './core/change-feed';
import { ReplyCache } from './core/reply-cache';
import { cookieValue } from './core/cookies';
import { requestLog } from './core/request-log';
import { securityHeaders } from './core/security-headers';
import type { Logger } from './core/logger';
import type { Db } from './db/db';
import { firmRoutes } from './firms/firms.routes';
import { healthHandler } from './health/health.routes';
import { peopleRoutes } from './people/people.routes';
import { projectRoutes } from './projects/projects.routes';
import { activityRoutes } from './activity/activity.routes';
import { deliverableRoutes } from './deliverables/deliverables.routes';
import { drawingRoutes } from './drawings/drawings.routes';
import { transmittalRoutes } from './transmittals/transmittals.routes';
import type { Jobs } from './jobs';
import { createNotices } from './notices/notices';
import { outboxRoutes } from './outbox/outbox.routes';
import { stageRoutes } from './stages/stages.routes';
import { feeRoutes } from './fees/fees.routes';
import { invoiceRoutes } from './invoices/invoices.routes';
import { paymentRoutes, STRIPE_WEBHOOK_PATH } from './payments/payments.routes';
import { createPayments, type Payments } from './payments/stripe-client';
import { schemeRoutes } from './schemes/schemes.routes';
import { schemeOutputRoutes } from './scheme-outputs/scheme-outputs.routes';
import { storageUnavailableHandler, type ObjectStore } from './storage';

export interface AppDeps {
  config: Pick<Config, 'CLIENT_DIST' | 'TRUST_PROXY'> &
    Partial<AuthConfig> &
    Partial<
      Pick<
        Config,
        | 'NODE_ENV'
        | 'UPLOAD_MAX_BYTES'
        | 'DEV_OUTBOX_URL'
        | 'MAIL_OUTBOX_URL'
        | 'HEALTH_MAX_AGE_MS'
        | 'LOG_SLOW_READ_MS'
      >
    > &
    /** The relay the health check greets; without SMTP_HOST it reports the mail relay as not set up. */
    Partial<Pick<Config, 'SMTP_HOST' | 'SMTP_PORT' | 'SMTP_SECURE'>> &
    Partial<PaymentsConfig>;
  db: Db;
  logger: Logger;
  version?: string;
  /** Deliverable files; without it, uploads and downloads answer 503. */
  store?: ObjectStore;
  /** The pg-boss queue that e-mail notices go through (main.ts always gives one). */
  jobs?: Jobs;
  /** Card payments; built from the STRIPE_* settings when not given. */
  payments?: Payments;
  /**
   * Changes to firms' lists, heard from PostgreSQL (main.ts starts it); with it, projects list
   * replies are kept until something in the firm's lists changes. Without it, every read queries.
   */
  changes?: ChangeFeed;
}

/** The cookie Angular's HttpClient reads and echoes as X-XSRF-TOKEN on every state change. */
export const CSRF_COOKIE = 'XSRF-TOKEN';

/**
 * `req.cookies`, parsed by `parse` (cookie-parser) when first read: most requests need only the
 * session cookie, which the session middleware finds in the header itself.
 */
function lazyCookies(parse: RequestHandler): RequestHandler {
  return (req, res, next) => {
    Object.defineProperty(req, 'cookies', {
      configurable: true,
      enumerable: true,
      get() {
        // The parser sets req.cookies itself (it skips a request that already has them).
        delete (req as { cookies?: unknown }).cookies;
        parse(req, res, () => undefined);
        return req.cookies as unknown;
      },
    });
    next();
  };
}

/** Builds the Express app without listening, so tests can mount it with supertest. */
export function createApp({ config, db, logger, version = '0.1.0', store, jobs, payments, changes }: AppDeps): Express {
  const app = express();
  app.disable('x-powered-by');
  if (config.TRUST_PROXY) app.set('trust proxy', 1);

  app.use(requestLog(logger, { slowReadMs: config.LOG_SLOW_READ_MS ?? 500 }));
  app.use(securityHeaders(app));

  const publicUrl = (config.PUBLIC_URL ?? 'http://127.0.0.1:4310').replace(/\/$/, '');
  const secureCookies = publicUrl.startsWith('https:');
  // Config refuses a missing secret in production; elsewhere a per-process one keeps tests and
  // a quick local run working (sessions then end when the process restarts).
  const secrets = (config.SESSION_SECRET ?? randomBytes(32).toString('hex'))
    .split(',')
    .map((x) => x.trim())
    .filter(Boolean);
  if (!config.SESSION_SECRET) logger.warn('SESSION_SECRET is not set: using a random secret for this process only');
  const absoluteHours = config.SESSION_ABSOLUTE_HOURS ?? 12;

  const csrf = doubleCsrf({
    getSecret: () => secrets,
    getSessionIdentifier: (req) => req.session?.id ?? '',
    cookieName: CSRF_COOKIE,
    // Readable by the page (that is the point of the double submit); bound to the session by its HMAC.
    cookieOptions: { httpOnly: false, sameSite: 'lax', secure: secureCookies, path: '/' },
    getCsrfTokenFromRequest: (req) => req.headers['x-xsrf-token'] as string | undefined,
  });

  /**
   * The XSRF-TOKEN cookie the request carries was made for this session with one of our secrets.
   * A pair found valid stays valid (same secrets, same session), so it is checked once per process.
   */
  const validCsrfCookies = new Set<string>();
  const csrfCookieValid = (req: Request): boolean => {
    const current = cookieValue(req.headers.cookie, CSRF_COOKIE);
    if (!current) return false;
    const pair = `${req.session.id} ${current}`;
    if (validCsrfCookies.has(pair)) return true;
    // The library checks a cookie against the header; here the cookie is checked against itself.
    const asked = Object.create(req) as Request;
    Object.defineProperty(asked, 'headers', { value: { ...req.headers, 'x-xsrf-token': current } });
    if (!csrf.validateRequest(asked)) return false;
    if (validCsrfCookies.size >= 10_000) validCsrfCookies.clear();
    validCsrfCookies.add(pair);
    return true;
  };

  const oidc =
    config.OIDC_ISSUER && config.OIDC_CLIENT_ID && config.OIDC_CLIENT_SECRET
      ? new OidcClient(
          {
            issuer: config.OIDC_ISSUER,
            clientId: config.OIDC_CLIENT_ID,
            clientSecret: config.OIDC_CLIENT_SECRET,
            scopes: config.OIDC_SCOPES ?? 'openid email profile',
            allowInsecureHttp: config.OIDC_ALLOW_INSECURE_HTTP ?? false,
            redirectUri: `${publicUrl}/api/auth/callback`,
            postLogoutRedirectUri: `${publicUrl}/`,
          },
          logger,
        )
      : undefined;

  const notices = createNotices(jobs, publicUrl, logger);

  const routes = [
    route(
      'get',
      '/health',
      'public',
      healthHandler({
        db,
        version,
        store,
        jobs,
        maxAgeMs: config.HEALTH_MAX_AGE_MS,
        mailRelay: config.SMTP_HOST
          ? { host: config.SMTP_HOST, port: config.SMTP_PORT ?? 25, secure: config.SMTP_SECURE ?? false }
          : undefined,
      }),
    ),
    ...authRoutes({
      db,
      oidc,
      publicUrl,
      absoluteHours,
      rateLimit: signInRateLimit(db, config.SIGN_IN_RATE_LIMIT),
      // A valid cookie already bound to this session is left as it is (no HMAC and Set-Cookie on
      // every /api/me); sign-in asks for a new one, and a missing or foreign one is replaced.
      issueCsrfToken: (req, res, overwrite) => {
        if (!overwrite && csrfCookieValid(req)) return;
        csrf.generateCsrfToken(req, res, { overwrite: true });
      },
      clearCsrfToken: (res) => void res.clearCookie(CSRF_COOKIE, { path: '/' }),
    }),
    ...peopleRoutes(db, {
      publicUrl,
      invitationTtlDays: config.INVITATION_TTL_DAYS ?? 14,
      // Invitation links are derived from it, so the same link can be sent again.
      linkSecret: secrets[0],
      notices,
    }),
    ...firmRoutes(db),
    ...projectRoutes(db, changes && new ReplyCache(changes, { maxEntries: 2000, maxAgeMs: 60_000 })),
    ...stageRoutes(db, notices),
    ...deliverableRoutes(db, store, config.UPLOAD_MAX_BYTES ?? 1024 * 1024 * 1024),
    ...activityRoutes(db),
    ...schemeRoutes(db),
    ...schemeOutputRoutes({
      db,
      store,
      jobs,
      logger,
      pollingIntervalSeconds: config.NODE_ENV === 'production' ? 2 : 0.5,
    }),
    ...drawingRoutes(db, store, config.UPLOAD_MAX_BYTES ?? 1024 * 1024 * 1024),
    ...transmittalRoutes({
      db,
      store,
      notices,
      publicUrl,
      // Outside recipients' download links are signed with a key derived from the session secret.
      linkSecret: createHmac('sha256', secrets[0]).update('trabeate transmittal links').digest(),
    }),
    ...outboxRoutes(outboxUrlOf(config)),
    ...feeRoutes(db),
    ...invoiceRoutes({ db, notices, store }),
    ...paymentRoutes({ db, notices, publicUrl, payments: payments ?? createPayments(config) }),
  ];

  const api = express.Router();
  // Stripe signs the exact bytes it sends: that route keeps its raw body (express.json then skips it).
  api.use(STRIPE_WEBHOOK_PATH, express.raw({ type: () => true, limit: '1mb' }));
  api.use(express.json({ limit: '1mb' }));
  api.use(lazyCookies(cookieParser()));
  api.use(
    sessionMiddleware(
      db,
      {
        secrets,
        idleMinutes: config.SESSION_IDLE_MINUTES ?? 60,
        touchSeconds: config.SESSION_TOUCH_SECONDS ?? 300,
        absoluteHours,
        secureCookies,
      },
      changes && new SessionCache(changes, { maxEntries: 5000, maxAgeMs: 60_000 }),
    ),
  );
  api.use(loadCaller(db, absoluteHours));
  if (changes) {
    // This process's own changes are known at once (the database's notice follows), so the next
    // read of the person who made one already sees it: their firm's lists, and the kept sessions
    // (a change request may have changed a person, a role or a name they carry).
    api.use((req, res, next) => {
      if (!SAFE_METHODS.has(req.method))
        res.once('finish', () => {
          changes.changed(EVERY_SESSION_KEY);
          if (req.caller) changes.changed(req.caller.firmId);
        });
      next();
    });
  }
  // Every API route, with its access rule; the authorization matrix test reads this list.
  app.locals['routes'] = mountRoutes(api, routes, { db, csrfValid: (req) => csrf.validateRequest(req) });
  api.use(apiNotFound);
  app.use('/api', api);

  if (config.CLIENT_DIST && existsSync(path.join(config.CLIENT_DIST, 'index.html'))) {
    const dist = path.resolve(config.CLIENT_DIST);
    // Hashed bundles (name-HASH.ext) can be cached for a year; anything else, such as the
    // favicon and index.html, must be revalidated.
    app.use(
      express.static(dist, {
        index: false,
        setHeaders: (res, file) => {
          const hashed = /-[A-Z0-9]{8}\.(js|css|woff2?|ttf|svg|png)$/.test(file);
          res.setHeader('Cache-Control', hashed ? 'public, max-age=31536000, immutable' : 'no-cache');
        },
      }),
    );
    app.get('/{*path}', (_req, res) => {
      res.setHeader('Cache-Control', 'no-cache');
      res.sendFile(path.join(dist, 'index.html'));
    });
  }

  app.use(storageUnavailableHandler);
  app.use(errorHandler(logger));
  return app;
}
