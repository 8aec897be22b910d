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
