import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import type { RequestHandler, Response } from 'express';
import { cookieValue } from '../core/cookies';
import type { Db } from '../db/db';
import type { Caller } from '../access/policy';
import type { PendingSignIn, SessionAuth } from '../access/request';
import { bindAccount } from '../people/people.repository';
import { loadCallerRow, sessionLoader, type SessionWithCaller } from './caller.repository';
import type { SessionCache } from './session-cache';

export const SESSION_COOKIE = 'trabeate.sid';

export interface SessionSettings {
  secrets: string[];
  idleMinutes: number;
  /** The idle expiry is pushed forward at most this often (seconds). */
  touchSeconds: number;
  absoluteHours: number;
  secureCookies: boolean;
}

/** What a session row keeps (table `sessions`, column `sess`), besides its id and expiry. */
export interface SessionData {
  auth?: SessionAuth;
  signIn?: PendingSignIn;
  /** When the idle expiry was last pushed forward (ms since 1970); see refreshIdleExpiry. */
  seenAt?: number;
}

/** The stored form: the data and the cookie's expiry, as the rows have always been written. */
interface StoredSession extends SessionData {
  cookie?: { expires?: string | null; originalMaxAge?: number };
}

/**
 * The session of one request. A request without a live session gets a new, empty one that is
 * written only when something is put in it and saved (a sign-in starting), so anonymous requests
 * leave no rows. Every change is saved explicitly (save, regenerate, destroy): nothing is written
 * behind the handler's back at the end of the response.
 */
export class RequestSession implements SessionData {
  auth?: SessionAuth;
  signIn?: PendingSignIn;
  seenAt?: number;
  /** When the session (row and cookie) ends unless pushed forward. */
  expires: Date;
  #id: string | undefined;

  constructor(
    private readonly owner: SessionRuntime,
    private readonly res: Response,
    id: string | undefined,
    stored: StoredSession | undefined,
  ) {
    this.#id = id;
    this.auth = stored?.auth;
    this.signIn = stored?.signIn;
    this.seenAt = stored?.seenAt;
    const expires = stored?.cookie?.expires ? new Date(stored.cookie.expires) : undefined;
    this.expires = expires && !Number.isNaN(expires.getTime()) ? expires : owner.idleExpiry();
  }

  /** The session id (made when a new session first needs one: a save, or a CSRF token bound to it). */
  get id(): string {
    return (this.#id ??= randomBytes(24).toString('base64url'));
  }

  /** Pushes the idle expiry forward (written by the next save). */
  touch(): void {
    this.expires = this.owner.idleExpiry();
  }

  /** Writes the session row and sends the cookie that names it. */
  async save(): Promise<void> {
    await this.owner.write(this.id, this.stored(), this.expires);
    this.owner.sendCookie(this.res, this.id, this.expires);
  }

  /** A new id with nothing in it: the old row is deleted (sign-in, against session fixation). */
  async regenerate(): Promise<void> {
    if (this.#id) await this.owner.remove(this.#id);
    this.#id = undefined;
    this.clear();
  }

  /** Ends the session: its row is deleted and nothing in it is used for the rest of the request. */
  async destroy(): Promise<void> {
    if (this.#id) await this.owner.remove(this.#id);
    this.clear();
  }

  private clear(): void {
    this.auth = undefined;
    this.signIn = undefined;
    this.seenAt = undefined;
    this.expires = this.owner.idleExpiry();
  }

  private stored(): StoredSession {
    return {
      cookie: { expires: this.expires.toISOString(), originalMaxAge: this.owner.idleMs },
      ...(this.auth ? { auth: this.auth } : {}),
      ...(this.signIn ? { signIn: this.signIn } : {}),
      ...(this.seenAt !== undefined ? { seenAt: this.seenAt } : {}),
    };
  }
}

interface SessionRuntime {
  idleMs: number;
  idleExpiry(): Date;
  write(sid: string, sess: StoredSession, expires: Date): Promise<void>;
  remove(sid: string): Promise<void>;
  sendCookie(res: Response, sid: string, expires: Date): void;
}

/** The signature after the id in the cookie value `s:<id>.<signature>` (HMAC-SHA256, base64, no padding). */
function signatureOf(sid: string, secret: string): string {
  return createHmac('sha256', secret).update(sid).digest('base64').replace(/=+$/, '');
}

/**
 * The session id a cookie value names, when one of the secrets signed it (the first secret signs;
 * the others are older ones still accepted while they are rotated out).
 */
export function unsignSessionId(value: string, secrets: string[]): string | undefined {
  if (!value.startsWith('s:')) return undefined;
  const dot = value.lastIndexOf('.');
  if (dot < 3) return undefined;
  const sid = value.slice(2, dot);
  const given = Buffer.from(value.slice(dot + 1));
  for (const secret of secrets) {
    const expected = Buffer.from(signatureOf(sid, secret));
    if (expected.length === given.length && timingSafeEqual(expected, given)) return sid;
  }
  return undefined;
}

/** The raw value of the session cookie in a Cookie header, if there is one. */
function sessionCookieValue(header: string | undefined): string | undefined {
  return cookieValue(header, SESSION_COOKIE);
}

/**
 * Sessions in PostgreSQL (table `sessions`), so every API process sees the same ones, behind a
 * signed cookie. A read request writes nothing: the idle expiry moves forward only every
 * `touchSeconds` (see refreshIdleExpiry). The session row and the person it names are read in one
 * query, shared by the requests arriving together (see sessionLoader); the person goes on the
 * request for loadCaller. With a `cache` (a live change feed), a row read once is used again until
 * PostgreSQL's notice says it or its person changed (SessionCache).
 */
export function sessionMiddleware(db: Db, s: SessionSettings, cache?: SessionCache): RequestHandler {
  const sessions = sessionLoader(db);
  const idleMs = s.idleMinutes * 60_000;
  const runtime: SessionRuntime = {
    idleMs,
    idleExpiry: () => new Date(Date.now() + idleMs),
    write: async (sid, sess, expires) => {
      cache?.forget(sid);
      await db.raw(
        `insert into sessions (sid, sess, expire) values (?, ?::json, ?)
         on conflict (sid) do update set sess = excluded.sess, expire = excluded.expire`,
        [sid, JSON.stringify(sess), expires],
      );
    },
    remove: async (sid) => {
      cache?.forget(sid);
      await db('sessions').where({ sid }).del();
    },
    sendCookie: (res, sid, expires) => {
      if (res.headersSent) return;
      // One session cookie per response: a later save (after regenerate, say) replaces an earlier one.
      const earlier = res.getHeader('Set-Cookie');
      if (earlier !== undefined) {
        const others = ([] as Array<string | number>)
          .concat(earlier)
          .filter((c) => !String(c).startsWith(`${SESSION_COOKIE}=`))
          .map(String);
        res.setHeader('Set-Cookie', others);
      }
      res.cookie(SESSION_COOKIE, `s:${sid}.${signatureOf(sid, s.secrets[0])}`, {
        httpOnly: true,
        sameSite: 'lax',
        secure: s.secureCookies,
        path: '/',
        expires,
      });
    },
  };
  const refresh = refreshIdleExpiry(s.idleMinutes, s.touchSeconds);
  // Cookie values whose signature was checked: a session's every request sends the same one.
  const verified = new Map<string, string>();
  const sessionIdOf = (value: string): string | undefined => {
    const known = verified.get(value);
    if (known !== undefined) return known;
    const sid = unsignSessionId(value, s.secrets);
    if (sid === undefined) return undefined;
    if (verified.size >= 10_000) verified.clear();
    verified.set(value, sid);
    return sid;
  };
  const use = (
    req: Parameters<RequestHandler>[0],
    res: Response,
    next: Parameters<RequestHandler>[2],
    sid: string,
    found: SessionWithCaller | undefined,
  ) => {
    if (!found) {
      req.session = new RequestSession(runtime, res, undefined, undefined);
      return next();
    }
    const stored = (typeof found.sess === 'string' ? JSON.parse(found.sess) : found.sess) as StoredSession;
    req.session = new RequestSession(runtime, res, sid, stored);
    req.preloadedCaller = found.caller;
    refresh(req, res, next);
  };
  return (req, res, next) => {
    const value = sessionCookieValue(req.headers.cookie);
    const sid = value === undefined ? undefined : sessionIdOf(value);
    if (sid === undefined) {
      req.session = new RequestSession(runtime, res, undefined, undefined);
      return next();
    }
    // A session kept since PostgreSQL last said it changed: no query, no promise.
    const kept = cache?.get(sid);
    if (kept) return use(req, res, next, sid, kept);
    const started = cache?.start(sid);
    sessions.load(sid).then((found) => {
      if (found) cache?.keep(sid, started, found);
      use(req, res, next, sid, found);
    }, next);
  };
}

/**
 * Pushes a signed-in session's idle expiry forward when it was last pushed more than
 * `touchSeconds` ago, writing the row and sending the cookie again, both with the new expiry, in
 * the one write; other requests leave both alone.
 */
export function refreshIdleExpiry(idleMinutes: number, touchSeconds: number): RequestHandler {
  const idleMs = idleMinutes * 60_000;
  return (req, _res, next) => {
    const s = req.session;
    if (!s?.auth || s.expires.getTime() - Date.now() >= idleMs - touchSeconds * 1000) return next();
    s.seenAt = Date.now();
    s.touch();
    s.save().then(() => next(), next);
  };
}

/**
 * Puts the caller on the request: ends sessions past their absolute limit, notes a cookie that
 * matched no live session (expired, ended or tampered), and re-reads the person on every request so
 * a changed role or removed access takes effect at once. Someone who signed in before being
 * invited gets access as soon as the invitation exists.
 */
export function loadCaller(db: Db, absoluteHours: number): RequestHandler {
  /** What needs the database: ending a session past its limit, a person to read or to bind. */
  const slow = async (req: Parameters<RequestHandler>[0], auth: SessionAuth): Promise<void> => {
    if (Date.now() - auth.signedInAt > absoluteHours * 3_600_000) {
      req.log?.info({ userId: auth.userId }, 'session reached its absolute limit');
      await req.session.destroy();
      req.sessionProblem = 'expired';
      return;
    }
    // Normally read with the session itself (sessionMiddleware); null there means no active person.
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
        await req.session.save();
        req.log?.info({ userId: bound.id }, 'signed-in identity bound to an invitation');
        user = await loadCallerRow(db, bound.id);
      }
    }
    if (user) req.caller = toCaller(user);
  };
  // Synchronous for the usual request: a live session whose person came with it.
  return (req, _res, next) => {
    const auth = req.session?.auth;
    if (!auth) {
      if (hasSessionCookie(req.headers.cookie)) {
        req.sessionProblem = 'expired';
        req.log?.info('session cookie matched no live session (expired, signed out or tampered)');
      }
      return next();
    }
    const preloaded = req.preloadedCaller;
    if (auth.userId && preloaded !== undefined && Date.now() - auth.signedInAt <= absoluteHours * 3_600_000) {
      if (preloaded) req.caller = toCaller(preloaded);
      return next();
    }
    slow(req, auth).then(() => next(), next);
  };
}

function hasSessionCookie(cookieHeader: string | undefined): boolean {
  return sessionCookieValue(cookieHeader) !== undefined;
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
  firm_date_locale?: string;
  firm_time_zone?: string;
}

export function toCaller(u: UserRow): Caller {
  const caller: Caller = {
    userId: u.id,
    firmId: u.firm_id,
    email: u.email,
    displayName: u.display_name,
    role: u.firm_role ?? 'client',
    clientOrganisationId: u.client_organisation_id,
  };
  // Made on every signed-in request: no spread of a throwaway object.
  if (u.firm_name !== undefined) {
    caller.firmName = u.firm_name;
    caller.clientOrganisationName = u.org_name ?? null;
    caller.firmDateLocale = u.firm_date_locale;
    caller.firmTimeZone = u.firm_time_zone;
  }
  return caller;
}

/** Ends every session of a person (access removed or role changed). */
export async function endSessionsOf(db: Db, userId: string): Promise<number> {
  return db('sessions').whereRaw(`(sess::jsonb -> 'auth') ->> 'userId' = ?`, [userId]).del();
}
