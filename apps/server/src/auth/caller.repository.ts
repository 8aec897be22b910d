import type { Db } from '../db/db';
import type { UserRow } from './session';

export interface CallerRow extends UserRow {
  firm_name: string;
  org_name: string | null;
  firm_date_locale: string;
  firm_time_zone: string;
}

/**
 * The person behind a session, with their firm's and organisation's names and the firm's date
 * settings, in one query: it runs on every signed-in request, and GET /api/me then needs nothing more.
 */
export async function loadCallerRow(db: Db, userId: string): Promise<CallerRow | undefined> {
  return db('users as u')
    .join('firms as f', 'f.id', 'u.firm_id')
    .leftJoin('client_organisations as o', 'o.id', 'u.client_organisation_id')
    .where('u.id', userId)
    .whereNull('u.disabled_at')
    .first(
      'u.id',
      'u.firm_id',
      'u.email',
      'u.display_name',
      'u.firm_role',
      'u.client_organisation_id',
      'f.name as firm_name',
      'o.name as org_name',
      'f.date_locale as firm_date_locale',
      'f.time_zone as firm_time_zone',
    );
}

export interface SessionWithCaller {
  sess: unknown;
  caller: CallerRow | null;
  /** When the row ends unless pushed forward (ms since 1970). */
  expiresAt: number;
}

/** The session rows with these ids (live ones only), each with the active person it names. */
async function loadSessionsWithCallers(db: Db, sids: string[]): Promise<Map<string, SessionWithCaller>> {
  const { rows } = await db.raw(
    `select s.sid, s.sess, s.expire, to_jsonb(c) as caller
     from sessions s
     left join lateral (
       select u.id, u.firm_id, u.email, u.display_name, u.firm_role, u.client_organisation_id,
              f.name as firm_name, o.name as org_name,
              f.date_locale as firm_date_locale, f.time_zone as firm_time_zone
       from users u
       join firms f on f.id = u.firm_id
       left join client_organisations o on o.id = u.client_organisation_id
       where u.disabled_at is null
         and u.id = case when s.sess::jsonb -> 'auth' ->> 'userId' ~ '^[0-9a-fA-F-]{36}$'
                         then (s.sess::jsonb -> 'auth' ->> 'userId')::uuid end
     ) c on true
     where s.sid in (${sids.map(() => '?').join(', ')}) and s.expire >= now()`,
    sids,
  );
  return new Map(
    (rows as Array<{ sid: string; sess: unknown; expire: Date; caller: CallerRow | null }>).map((r) => [
      r.sid,
      { sess: r.sess, caller: r.caller ?? null, expiresAt: r.expire.getTime() },
    ]),
  );
}

/**
 * A live session row and, when it names an active person, that person as loadCallerRow gives
 * them: the two reads every signed-in request needs, in one round trip.
 */
export async function loadSessionWithCaller(db: Db, sid: string): Promise<SessionWithCaller | undefined> {
  return (await loadSessionsWithCallers(db, [sid])).get(sid);
}

export interface SessionLoader {
  load(sid: string): Promise<SessionWithCaller | undefined>;
}

/**
 * loadSessionWithCaller for a busy server: the lookups asked for while the event loop handles one
 * round of arriving requests go to PostgreSQL together, as one query by primary key, and while
 * `maxInFlight` such queries are running, new lookups wait for the next one. Each lookup reads
 * the database after its request arrived; what is shared is the round trip, which under load was
 * the largest cost of a signed-in read (one socket write and one PostgreSQL statement per
 * request). Keeping rows between requests is SessionCache's job, and only with a live change feed.
 */
export function sessionLoader(db: Db, { maxInFlight = 2, maxBatch = 200 } = {}): SessionLoader {
  type Waiter = { sid: string; resolve: (v: SessionWithCaller | undefined) => void; reject: (e: unknown) => void };
  let waiting: Waiter[] = [];
  let inFlight = 0;
  let scheduled = false;

  const flush = () => {
    scheduled = false;
    while (waiting.length && inFlight < maxInFlight) {
      const batch = waiting.slice(0, maxBatch);
      waiting = waiting.slice(maxBatch);
      inFlight++;
      loadSessionsWithCallers(db, [...new Set(batch.map((w) => w.sid))])
        .then(
          (found) => batch.forEach((w) => w.resolve(found.get(w.sid))),
          (err: unknown) => batch.forEach((w) => w.reject(err)),
        )
        .finally(() => {
          inFlight--;
          schedule();
        });
    }
  };
  const schedule = () => {
    if (scheduled || !waiting.length || inFlight >= maxInFlight) return;
    scheduled = true;
    // After the poll phase: every request whose bytes arrived in this turn has asked by then.
    setImmediate(flush);
  };
  return {
    load: (sid) =>
      new Promise((resolve, reject) => {
        waiting.push({ sid, resolve, reject });
        schedule();
      }),
  };
}
