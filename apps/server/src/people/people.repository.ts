import type { Knex } from 'knex';
import type { Person } from '@trabeate/contracts';
import type { Db } from '../db/db';
import type { UserRow } from '../auth/session';

const USER_COLUMNS = ['id', 'firm_id', 'email', 'display_name', 'firm_role', 'client_organisation_id'] as const;

export async function loadActiveUser(db: Db | Knex.Transaction, id: string): Promise<UserRow | undefined> {
  return db('users')
    .where({ id })
    .whereNull('disabled_at')
    .first(...USER_COLUMNS);
}

/**
 * Finds the Trabeate person for a signed-in identity: first by the provider's subject, then (the
 * first sign-in) by e-mail among people not yet bound to any identity, binding them.
 */
export async function bindAccount(
  db: Db,
  identity: { issuer: string; subject: string; email: string | null },
): Promise<UserRow | undefined> {
  const bound = await db('users')
    .where({ oidc_issuer: identity.issuer, oidc_subject: identity.subject })
    .whereNull('disabled_at')
    .first(...USER_COLUMNS);
  if (bound) return bound;
  if (!identity.email) return undefined;
  return db.transaction(async (trx) => {
    const candidate = await trx('users')
      .whereRaw('lower(email) = lower(?)', [identity.email])
      .whereNull('oidc_subject')
      .whereNull('disabled_at')
      .forUpdate()
      .first(...USER_COLUMNS);
    if (!candidate) return undefined;
    const pending = await trx('invitations')
      .where({ user_id: candidate.id })
      .whereNull('accepted_at')
      .orderBy('created_at', 'desc')
      .first();
    // Invited people must arrive while their invitation is valid; people added without one (the demo) bind directly.
    if (pending && new Date(pending.expires_at).getTime() < Date.now()) return undefined;
    await trx('users')
      .where({ id: candidate.id })
      .update({ oidc_issuer: identity.issuer, oidc_subject: identity.subject, updated_at: trx.fn.now() });
    await trx('invitations')
      .where({ user_id: candidate.id })
      .whereNull('accepted_at')
      .update({ accepted_at: trx.fn.now() });
    return candidate;
  });
}

export async function touchSignIn(db: Db, userId: string): Promise<void> {
  await db('users').where({ id: userId }).update({ last_signed_in_at: db.fn.now() });
}

interface PersonRow extends UserRow {
  disabled_at: Date | null;
  oidc_subject: string | null;
  last_signed_in_at: Date | null;
  org_name: string | null;
}

/** Everyone in the firm, with their projects and pending invitation, in the shape the API answers. */
export async function listPeople(db: Db | Knex.Transaction, firmId: string, onlyId?: string): Promise<Person[]> {
  const q = db('users as u')
    .leftJoin('client_organisations as o', 'o.id', 'u.client_organisation_id')
    .where('u.firm_id', firmId)
    .orderBy([{ column: 'u.firm_role', order: 'asc', nulls: 'last' }, { column: 'u.display_name' }])
    .select(
      'u.id',
      'u.firm_id',
      'u.email',
      'u.display_name',
      'u.firm_role',
      'u.client_organisation_id',
      'u.disabled_at',
      'u.oidc_subject',
      'u.last_signed_in_at',
      'o.name as org_name',
    );
  if (onlyId) q.andWhere('u.id', onlyId);
  const rows: PersonRow[] = await q;
  const ids = rows.map((r) => r.id);
  const memberships: Array<{ user_id: string; id: string; reference: string; name: string }> = ids.length
    ? await db('project_members as m')
        .join('projects as p', 'p.id', 'm.project_id')
        .whereIn('m.user_id', ids)
        .orderBy('p.reference')
        .select('m.user_id', 'p.id', 'p.reference', 'p.name')
    : [];
  const invitations: Array<{ user_id: string; expires_at: Date }> = ids.length
    ? await db('invitations').whereIn('user_id', ids).whereNull('accepted_at').select('user_id', 'expires_at')
    : [];
  return rows.map((r) => {
    const invitation = invitations.filter((i) => i.user_id === r.id).sort((a, b) => +b.expires_at - +a.expires_at)[0];
    return {
      id: r.id,
      email: r.email,
      displayName: r.display_name,
      role: r.firm_role ?? 'client',
      clientOrganisation: r.client_organisation_id ? { id: r.client_organisation_id, name: r.org_name ?? '' } : null,
      status: r.disabled_at ? 'removed' : r.oidc_subject || !invitation ? 'active' : 'invited',
      projects: memberships
        .filter((m) => m.user_id === r.id)
        .map(({ id, reference, name }) => ({ id, reference, name })),
      lastSignedInAt: r.last_signed_in_at ? new Date(r.last_signed_in_at).toISOString() : null,
      invitationExpiresAt: invitation && !r.oidc_subject ? new Date(invitation.expires_at).toISOString() : null,
    };
  });
}
