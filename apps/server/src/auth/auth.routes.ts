import type { Request, RequestHandler, Response } from 'express';
import type { Me, LogoutResponse } from '@trabeate/contracts';
import type { Db } from '../db/db';
import { route, type RouteDecl } from '../access/registry';
import { bindAccount, touchSignIn } from '../people/people.repository';
import { OidcClient, ProviderUnavailable } from './oidc';
import { problem } from './pages';
import { SESSION_COOKIE } from './session';

/** A sign-in must come back from the provider within this time. */
const SIGN_IN_WINDOW_MS = 10 * 60_000;

export interface AuthRouteDeps {
  db: Db;
  oidc: OidcClient | undefined;
  publicUrl: string;
  absoluteHours: number;
  /** Limits sign-in starts (only starts: the callback needs a start of its own). */
  rateLimit: RequestHandler;
  issueCsrfToken: (req: Request, res: Response, overwrite: boolean) => void;
  clearCsrfToken: (res: Response) => void;
}

/**
 * Only a path on our own origin may follow sign-in: no scheme, no host, no "//" or "\" tricks.
 */
export function safeReturnTo(value: unknown): string {
  if (typeof value !== 'string' || value.length > 2000) return '/';
  // eslint-disable-next-line no-control-regex -- control characters are exactly what is refused here
  if (!value.startsWith('/') || value.startsWith('//') || value.includes('\\') || /[\u0000-\u001f]/.test(value))
    return '/';
  try {
    const url = new URL(value, 'http://trabeate.invalid');
    const resolved = url.pathname + url.search + url.hash;
    // Dot segments collapse ("/.//host" becomes "//host"), so the resolved path is checked again.
    return url.origin === 'http://trabeate.invalid' && !resolved.startsWith('//') ? resolved : '/';
  } catch {
    return '/';
  }
}

export function authRoutes(d: AuthRouteDeps): RouteDecl[] {
  const unavailable = (req: Request, res: Response, err: unknown) => {
    req.log?.error({ err }, 'identity provider unavailable during sign-in');
    problem(
      req,
      res,
      503,
      'identity_provider_unavailable',
      'Sign-in is unavailable',
      'The sign-in service is not answering at the moment. Try again in a minute.',
    );
  };

  return [
    route('get', '/auth/login', 'public', d.rateLimit, async (req, res) => {
      if (!d.oidc) {
        problem(
          req,
          res,
          503,
          'service_unavailable',
          'Sign-in is not configured',
          'This Trabeate server has no identity provider configured (OIDC_ISSUER).',
        );
        return;
      }
      let start;
      try {
        start = await d.oidc.authorizationUrl();
      } catch (err) {
        if (err instanceof ProviderUnavailable) return unavailable(req, res, err);
        throw err;
      }
      const { url, ...checks } = start;
      req.session.signIn = { ...checks, returnTo: safeReturnTo(req.query['returnTo']), startedAt: Date.now() };
      await req.session.save();
      res.setHeader('Cache-Control', 'no-store');
      res.redirect(302, url.href);
    }),

    route('get', '/auth/callback', 'public', async (req, res) => {
      const pending = req.session?.signIn;
      const params = new URL(req.originalUrl, d.publicUrl).searchParams;
      // Whatever happens next, this sign-in attempt is used up: a replayed callback finds nothing.
      if (pending) {
        delete req.session.signIn;
        await req.session.save();
      }
      if (params.get('error')) {
        req.log?.info({ error: params.get('error') }, 'sign-in cancelled or refused at the provider');
        return problem(
          req,
          res,
          400,
          'sign_in_cancelled',
          'Sign-in was not completed',
          'The sign-in was cancelled or refused at the identity provider. You can try again.',
        );
      }
      if (!pending || Date.now() - pending.startedAt > SIGN_IN_WINDOW_MS) {
        req.log?.warn(
          { hasPending: Boolean(pending) },
          'sign-in callback without a live sign-in (missing, replayed or expired)',
        );
        return problem(
          req,
          res,
          400,
          'sign_in_expired',
          'This sign-in has expired',
          'This sign-in link was already used or has expired. Start again from the sign-in button.',
        );
      }
      if (!params.get('state') || params.get('state') !== pending.state) {
        req.log?.warn('sign-in callback with a state that does not match this browser');
        return problem(
          req,
          res,
          400,
          'sign_in_failed',
          'Sign-in could not be checked',
          'The answer from the identity provider did not match the sign-in started in this browser. Start again.',
        );
      }
      if (!d.oidc)
        return problem(
          req,
          res,
          503,
          'service_unavailable',
          'Sign-in is not configured',
          'This Trabeate server has no identity provider configured.',
        );
      let identity;
      try {
        const callbackUrl = new URL('/api/auth/callback', d.publicUrl);
        callbackUrl.search = params.toString();
        identity = await d.oidc.finish(callbackUrl, pending);
      } catch (err) {
        if (err instanceof ProviderUnavailable) return unavailable(req, res, err);
        req.log?.warn({ err }, 'sign-in callback refused');
        return problem(
          req,
          res,
          400,
          'sign_in_failed',
          'Sign-in could not be checked',
          'The answer from the identity provider could not be verified. Start again.',
        );
      }
      const user = await bindAccount(d.db, identity);
      // A fresh session id at sign-in, so an id planted before sign-in is worth nothing after it.
      await req.session.regenerate();
      req.session.auth = { ...identity, userId: user?.id ?? null, signedInAt: Date.now() };
      if (user) {
        await touchSignIn(d.db, user.id);
        req.log?.info({ userId: user.id }, 'signed in');
      } else {
        req.log?.warn({ subject: identity.subject }, 'signed in at the provider without a Trabeate invitation');
      }
      await req.session.save();
      d.issueCsrfToken(req, res, true);
      res.redirect(302, pending.returnTo);
    }),

    route('post', '/auth/logout', 'public', async (req, res) => {
      const idToken = req.session?.auth?.idToken;
      await req.session.destroy();
      res.clearCookie(SESSION_COOKIE, { path: '/' });
      d.clearCsrfToken(res);
      const body: LogoutResponse = { endSessionUrl: idToken && d.oidc ? await d.oidc.endSessionUrl(idToken) : null };
      req.log?.info('signed out');
      res.json(body);
    }),

    route('get', '/me', 'identified', async (req, res) => {
      const auth = req.session.auth!;
      d.issueCsrfToken(req, res, false);
      res.setHeader('Cache-Control', 'no-store');
      const caller = req.caller;
      if (!caller) {
        const body: Me = {
          access: 'none',
          identity: { email: auth.email, name: auth.name },
          message:
            'You are signed in, but nobody at the firm has given you access to Trabeate yet. Ask the firm to invite this e-mail address.',
        };
        res.json(body);
        return;
      }
      // The names and the firm's date settings come with the caller (one query per request, kept
      // between requests while nothing changes); look them up only if absent.
      const [firm, org] =
        caller.firmName !== undefined && caller.firmDateLocale && caller.firmTimeZone
          ? [
              {
                id: caller.firmId,
                name: caller.firmName,
                dateLocale: caller.firmDateLocale,
                timeZone: caller.firmTimeZone,
              },
              caller.clientOrganisationId
                ? { id: caller.clientOrganisationId, name: caller.clientOrganisationName ?? '' }
                : null,
            ]
          : await Promise.all([
              d
                .db('firms')
                .where({ id: caller.firmId })
                .first('id', 'name', 'date_locale as dateLocale', 'time_zone as timeZone'),
              caller.clientOrganisationId
                ? d.db('client_organisations').where({ id: caller.clientOrganisationId }).first('id', 'name')
                : null,
            ]);
      const body: Me = {
        access: 'granted',
        user: {
          id: caller.userId,
          email: caller.email,
          displayName: caller.displayName,
          role: caller.role,
          clientOrganisation: org ?? null,
        },
        firm,
        session: {
          signedInAt: new Date(auth.signedInAt).toISOString(),
          expiresAt: new Date(auth.signedInAt + d.absoluteHours * 3_600_000).toISOString(),
        },
      };
      // Asked on every page load and never stored (no-store), so no ETag is worked out for it.
      res.type('json').end(JSON.stringify(body));
    }),
  ];
}
