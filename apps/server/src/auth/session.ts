import { randomBytes } from 'node:crypto';
import type { RequestHandler } from 'express';
import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import type { Db } from '../db/db';
import type { Caller } from '../access/policy';
import type { SessionAuth } from '../access/request';
import { bindAccount, loadActiveUser } from '../people/people.repository';

export const SESSION_COOKIE = 'trabeate.sid';

export interface SessionSettings {
  secrets: string[];
  idleMinutes: number;
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

/** Sessions in PostgreSQL (table `sessions`), so every API process sees the same ones. */
export function sessionMiddleware(db: Db, s: SessionSettings): RequestHandler {
  const PgStore = connectPgSimple(session);
  const store = new PgStore({
    pool: knexPool(db) as never,
    tableName: 'sessions',
    createTableIfMissing: false,
    // Expired rows are skipped on read; pruning is a maintenance job, not a per-process timer.
    pruneSessionInterval: false,
  });
  return session({
    name: SESSION_COOKIE,
    secret: s.secrets,
    store,
    resave: false,
    saveUninitialized: false,
    // Each answer pushes the idle expiry forward; the absolute limit is checked in loadCaller.
    rolling: true,
    unset: 'destroy',
    genid: () => randomBytes(24).toString('base64url'),
    cookie: { httpOnly: true, sameSite: 'lax', secure: s.secureCookies, path: '/', maxAge: s.idleMinutes * 60_000 },
  });
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
    let user = auth.userId ? await loadActiveUser(db, auth.userId) : undefined;
    if (!auth.userId) {
      user = await bindAccount(db, auth);
      if (user) {
        req.session.auth = { ...auth, userId: user.id } satisfies SessionAuth;
        req.log?.info({ userId: user.id }, 'signed-in identity bound to an invitation');
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
}

export function toCaller(u: UserRow): Caller {
  return {
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
