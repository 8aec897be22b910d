import { randomBytes } from 'node:crypto';
import type { Request, RequestHandler } from 'express';
import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import type { Db } from '../db/db';
import type { Caller } from '../access/policy';
import type { SessionAuth } from '../access/request';
import { bindAccount } from '../people/people.repository';
import { loadCallerRow, sessionLoader, type CallerRow } from './caller.repository';

export const SESSION_COOKIE = 'trabeate.sid';

const PRELOADED_CALLER = Symbol('preloaded caller');

export interface SessionSettings {
  secrets: string[];
  idleMinutes: number;
  /** The idle expiry is pushed forward at most this often (seconds). */
  touchSeconds: number;
  absoluteHours: number;
  secureCookies: boolean;
}

/**
 * A pg-compatible query object over Knex's own pool, so the session store shares the app's
 * connections instead of opening a second pool.
 */
function knexPool(db: Db) {
  return {
    query: async (text: string, params: unknown[]) => {
      const conn = await db.client.acquireConnection();
      try {
        return await conn.query(text, params);
      } finally {
        await db.client.releaseConnection(conn);
      }
    },
  };
}

/**
 * Sessions in PostgreSQL (table `sessions`), so every API process sees the same ones. A read
 * request writes nothing: the store's per-request touch is off and the idle expiry moves forward
 * only every `touchSeconds` (see refreshIdleExpiry), which at 100 concurrent requests was the
 * largest single cost of a signed-in read.
 */
export function sessionMiddleware(db: Db, s: SessionSettings): RequestHandler {
  const PgStore = connectPgSimple(session);
  const sessions = sessionLoader(db);
  /**
   * Reads the session and the person it names in one query (see sessionLoader) and hands the
   * person to loadCaller on the request. Nothing is kept between requests.
   */
  class SessionAndCallerStore extends PgStore {
    override get(sid: string, fn: (err: unknown, sess?: session.SessionData | null) => void): void {
      sessions.load(sid).then((found) => {
        if (!found) return fn(null, null);
        const sess = (typeof found.sess === 'string' ? JSON.parse(found.sess) : found.sess) as session.SessionData;
        Object.defineProperty(sess, PRELOADED_CALLER, { value: found.caller, enumerable: false });
        fn(null, sess);
      }, fn);
    }
    override createSession(req: Request, sess: session.SessionData): session.Session & session.SessionData {
      const preloaded = (sess as unknown as Record<symbol, CallerRow | null | undefined>)[PRELOADED_CALLER];
      if (preloaded !== undefined) req.preloadedCaller = preloaded;
      return super.createSession(req, sess);
    }
  }
  const store = new SessionAndCallerStore({
    pool: knexPool(db) as never,
    tableName: 'sessions',
    createTableIfMissing: false,
    // Expired rows are skipped on read; pruning is a maintenance job, not a per-process timer.
    pruneSessionInterval: false,
  });
  // No touch at all (rather than the store's disableTouch, whose synchronous no-op callback sent
  // express-session down its write-twice path): express-session then skips it for unchanged sessions.
  Object.defineProperty(store, 'touch', { value: undefined });
  const handler = session({
    name: SESSION_COOKIE,
    secret: s.secrets,
    store,
    resave: false,
    saveUninitialized: false,
    // Not rolling: the cookie and the row are renewed together by refreshIdleExpiry.
    rolling: false,
    unset: 'destroy',
    genid: () => randomBytes(24).toString('base64url'),
    cookie: { httpOnly: true, sameSite: 'lax', secure: s.secureCookies, path: '/', maxAge: s.idleMinutes * 60_000 },
  });
  const refresh = refreshIdleExpiry(s.idleMinutes, s.touchSeconds);
  return (req, res, next) => handler(req, res, (err?: unknown) => (err ? next(err) : refresh(req, res, next)));
}

/**
 * Pushes a signed-in session's idle expiry forward when it was last pushed more than
 * `touchSeconds` ago. Changing `seenAt` marks the session modified, so express-session saves the
 * row and sends the cookie again, both with the new expiry, in the one write; other requests
 * leave both alone.
 */
export function refreshIdleExpiry(idleMinutes: number, touchSeconds: number): RequestHandler {
  const idleMs = idleMinutes * 60_000;
  return (req, _res, next) => {
    const s = req.session;
    const expires = s?.auth ? s.cookie.expires : undefined;
    if (s && expires && new Date(expires).getTime() - Date.now() < idleMs - touchSeconds * 1000) {
      s.seenAt = Date.now();
      s.touch();
    }
    next();
  };
}

/**
 * Puts the caller on the request: ends sessions past their absolute limit, notes a cookie that
 * matched no live session (expired, ended or tampered), and re-reads the person on every request so
 * a changed role or removed access takes effect at once. Someone who signed in before being
 * invited gets access as soon as the invitation exists.
 */
export function loadCaller(db: Db, absoluteHours: number): RequestHandler {
  return async (req, _res, next) => {
    const auth = req.session?.auth;
    if (!auth) {
      if (hasSessionCookie(req.headers.cookie)) {
        req.sessionProblem = 'expired';
        req.log?.info('session cookie matched no live session (expired, signed out or tampered)');
      }
      return next();
    }
    if (Date.now() - auth.signedInAt > absoluteHours * 3_600_000) {
      req.log?.info({ userId: auth.userId }, 'session reached its absolute limit');
      await new Promise<void>((resolve, reject) => req.session.destroy((err) => (err ? reject(err) : resolve())));
      req.sessionProblem = 'expired';
      return next();
    }
    // Normally read with the session itself (SessionAndCallerStore); null there means no active person.
    const preloaded = req.preloadedCaller;
    let user: UserRow | undefined =
      preloaded !== undefined
        ? (preloaded ?? undefined)
        : auth.userId
          ? await loadCallerRow(db, auth.userId)
          : undefined;
    if (!auth.userId) {
      const bound = await bindAccount(db, auth);
      if (bound) {
        req.session.auth = { ...auth, userId: bound.id } satisfies SessionAuth;
        req.log?.info({ userId: bound.id }, 'signed-in identity bound to an invitation');
        user = await loadCallerRow(db, bound.id);
      }
    }
    if (user) req.caller = toCaller(user);
    next();
  };
}

function hasSessionCookie(cookieHeader: string | undefined): boolean {
  return Boolean(cookieHeader && cookieHeader.split(';').some((c) => c.trim().startsWith(`${SESSION_COOKIE}=`)));
}

export interface UserRow {
  id: string;
  firm_id: string;
  email: string;
  display_name: string;
  firm_role: 'principal' | 'engineer' | null;
  client_organisation_id: string | null;
  /** Present when loaded with the names (loadCallerRow). */
  firm_name?: string;
  org_name?: string | null;
}

export function toCaller(u: UserRow): Caller {
  return {
    ...(u.firm_name === undefined ? {} : { firmName: u.firm_name, clientOrganisationName: u.org_name ?? null }),
    userId: u.id,
    firmId: u.firm_id,
    email: u.email,
    displayName: u.display_name,
    role: u.firm_role ?? 'client',
    clientOrganisationId: u.client_organisation_id,
  };
}

/** Ends every session of a person (access removed or role changed). */
export async function endSessionsOf(db: Db, userId: string): Promise<number> {
  return db('sessions').whereRaw(`(sess::jsonb -> 'auth') ->> 'userId' = ?`, [userId]).del();
}
