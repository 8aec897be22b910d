import type { Db } from '../db/db';
import type { UserRow } from './session';

export interface CallerRow extends UserRow {
  firm_name: string;
  org_name: string | null;
}

/**
 * The person behind a session, with their firm's and organisation's names, in one query: it runs
 * on every signed-in request, and GET /api/me then needs nothing more.
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
    );
}

/**
 * A live session row and, when it names an active person, that person as loadCallerRow gives
 * them: the two reads every signed-in request needs, in one round trip.
 */
export async function loadSessionWithCaller(
  db: Db,
  sid: string,
): Promise<{ sess: unknown; caller: CallerRow | null } | undefined> {
  const { rows } = await db.raw(
    `select s.sess, to_jsonb(c) as caller
     from sessions s
     left join lateral (
       select u.id, u.firm_id, u.email, u.display_name, u.firm_role, u.client_organisation_id,
              f.name as firm_name, o.name as org_name
       from users u
       join firms f on f.id = u.firm_id
       left join client_organisations o on o.id = u.client_organisation_id
       where u.disabled_at is null
         and u.id = case when s.sess::jsonb -> 'auth' ->> 'userId' ~ '^[0-9a-fA-F-]{36}$'
                         then (s.sess::jsonb -> 'auth' ->> 'userId')::uuid end
     ) c on true
     where s.sid = ? and s.expire >= now()`,
    [sid],
  );
  if (!rows.length) return undefined;
  return { sess: rows[0].sess, caller: rows[0].caller ?? null };
}
