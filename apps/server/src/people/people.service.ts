import { createHash, createHmac, randomUUID } from 'node:crypto';
import type { InvitationCreated, Person, PersonPatch, Role } from '@trabeate/contracts';
import { invitationCreateSchema } from '@trabeate/contracts';
import type { z } from 'zod';
import type { Db } from '../db/db';
import { HttpError, notFound } from '../core/errors';
import type { Caller } from '../access/policy';
import { endSessionsOf } from '../auth/session';
import { listPeople } from './people.repository';
import { insertActivity } from '../activity/activity.repository';
import type { Notices } from '../notices/notices';
import { datesOf } from '../firms/firms.repository';
import { printDay } from '../look/print-look';

export const hashToken = (token: string): string => createHash('sha256').update(token).digest('hex');

/**
 * An invitation's link token, derived from its id with the server's secret. The database keeps only
 * its hash, yet inviting the same address again can send the very same link: no second link, and
 * the first one keeps working.
 */
export const invitationToken = (secret: string, invitationId: string): string =>
  createHmac('sha256', secret).update(`invitation:${invitationId}`).digest('base64url');

const ONE_PENDING = 'invitations_one_pending_per_address';

const ROLE_WORDS: Record<Role, string> = {
  principal: 'a principal',
  engineer: 'an engineer',
  client: 'a client contact',
};

const kindOf = (role: Role) =>
  role === 'client' ? { firm_role: null } : { firm_role: role, client_organisation_id: null };

/**
 * Invites a person by e-mail: creates (or re-opens) their record with the role, their project
 * memberships and an invitation whose link is returned once. Their first sign-in with that e-mail
 * binds the account. An address has at most one pending invitation: inviting it again updates the
 * person and resends that invitation's link, good for a fresh period.
 */
export async function invite(
  db: Db,
  caller: Caller,
  input: z.output<typeof invitationCreateSchema>,
  opts: { publicUrl: string; ttlDays: number; linkSecret: string; notices?: Notices },
): Promise<InvitationCreated> {
  const expiresAt = new Date(Date.now() + opts.ttlDays * 86_400_000);
  const { userId, url } = await db
    .transaction(async (trx) => {
      if (input.clientOrganisationId) {
        const org = await trx('client_organisations')
          .where({ id: input.clientOrganisationId, firm_id: caller.firmId })
          .first('id');
        if (!org)
          throw new HttpError(400, 'validation_failed', 'No client organisation with this id.', {
            'body.clientOrganisationId': ['unknown client organisation'],
          });
      }
      const projectIds = [...new Set(input.projectIds)];
      if (input.role === 'principal' && projectIds.length) {
        throw new HttpError(400, 'validation_failed', 'The principal sees every project; leave projectIds empty.', {
          'body.projectIds': ['must be empty for a principal'],
        });
      }
      if (projectIds.length) {
        const projects = await trx('projects')
          .whereIn('id', projectIds)
          .where({ firm_id: caller.firmId })
          .select('id', 'client_organisation_id');
        const wrong = projectIds.filter((id) => {
          const p = projects.find((x) => x.id === id);
          return !p || (input.role === 'client' && p.client_organisation_id !== input.clientOrganisationId);
        });
        if (wrong.length) {
          throw new HttpError(
            400,
            'validation_failed',
            input.role === 'client'
              ? "A client contact can join only their own organisation's projects."
              : 'Some projects do not exist.',
            { 'body.projectIds': wrong.map((id) => `not allowed: ${id}`) },
          );
        }
      }
      // FOR UPDATE cannot lock a row that does not exist yet: two invitations of a new address at once
      // take turns on this lock instead, so the second re-opens the first rather than colliding with it.
      await trx.raw('select pg_advisory_xact_lock(hashtextextended(?, 0))', [
        `invitation:${caller.firmId}:${input.email.toLowerCase()}`,
      ]);
      const existing = await trx('users')
        .where({ firm_id: caller.firmId })
        .whereRaw('lower(email) = lower(?)', [input.email])
        .forUpdate()
        .first();
      if (existing && !existing.disabled_at && existing.oidc_subject) {
        throw new HttpError(409, 'conflict', `${input.email} already has access to Trabeate.`);
      }
      const row = {
        email: input.email,
        display_name: input.displayName,
        firm_role: input.role === 'client' ? null : input.role,
        client_organisation_id: input.role === 'client' ? input.clientOrganisationId : null,
        disabled_at: null,
        oidc_issuer: null,
        oidc_subject: null,
        updated_at: trx.fn.now(),
      };
      let id: string;
      if (existing) {
        id = existing.id;
        await trx('users').where({ id }).update(row);
        await trx('project_members').where({ user_id: id }).del();
      } else {
        [{ id }] = await trx('users')
          .insert({ ...row, firm_id: caller.firmId })
          .returning('id');
      }
      if (projectIds.length) {
        await trx('project_members').insert(
          projectIds.map((project_id) => ({ project_id, user_id: id, added_by: caller.userId })),
        );
        await insertActivity(
          trx,
          projectIds.map((projectId) => ({
            firmId: caller.firmId,
            projectId,
            actorId: caller.userId,
            action: 'membership.added',
            objectType: 'membership' as const,
            objectId: id,
            summary: `${caller.displayName} invited ${input.displayName} to the project team`,
          })),
        );
      }
      const pending = await trx('invitations')
        .where({ firm_id: caller.firmId })
        .whereRaw('lower(email) = lower(?)', [input.email])
        .whereNull('accepted_at')
        .forUpdate()
        .first('id', 'expires_at');
      let invitationId: string;
      if (pending && new Date(pending.expires_at).getTime() > Date.now()) {
        // The live invitation stays; its link is sent again. The hash is rewritten only if the
        // server's secret changed since (then the old link stops and the new one is the only one).
        invitationId = pending.id;
        await trx('invitations')
          .where({ id: invitationId })
          .update({
            user_id: id,
            invited_by: caller.userId,
            expires_at: expiresAt,
            token_hash: hashToken(invitationToken(opts.linkSecret, invitationId)),
          });
      } else {
        // An expired link is not brought back to life: a new invitation takes its place.
        if (pending) await trx('invitations').where({ id: pending.id }).del();
        invitationId = randomUUID();
        await trx('invitations').insert({
          id: invitationId,
          firm_id: caller.firmId,
          user_id: id,
          email: input.email,
          token_hash: hashToken(invitationToken(opts.linkSecret, invitationId)),
          invited_by: caller.userId,
          expires_at: expiresAt,
        });
      }
      const url = `${opts.publicUrl.replace(/\/$/, '')}/invitations/${invitationToken(opts.linkSecret, invitationId)}`;
      if (opts.notices) {
        const firm = await trx('firms').where({ id: caller.firmId }).first('name', 'date_locale', 'time_zone');
        // Queued in this transaction: an invitation that fails to save sends no mail.
        await opts.notices.send(trx, {
          to: input.email,
          template: 'invitation',
          data: {
            recipientName: input.displayName,
            firmName: firm.name,
            invitedBy: caller.displayName,
            role: ROLE_WORDS[input.role],
            link: url,
            expiresOn: printDay(expiresAt, datesOf(firm)),
          },
        });
      }
      return { userId: id, url };
    })
    .catch((err: { code?: string; constraint?: string }) => {
      // The advisory lock above makes this unreachable for invitations made here; the index is the backstop.
      if (err.code === '23505' && err.constraint === ONE_PENDING)
        throw new HttpError(409, 'conflict', `An invitation to ${input.email} is being sent just now; try again.`);
      throw err;
    });
  const [person] = await listPeople(db, caller.firmId, userId);
  return { person, invitation: { url, expiresAt: expiresAt.toISOString() } };
}

/** Changes a person's name, role or organisation. Changing kind (firm/client) or organisation clears their projects. */
export async function updatePerson(db: Db, caller: Caller, id: string, patch: PersonPatch): Promise<Person> {
  await db.transaction(async (trx) => {
    const user = await trx('users').where({ id, firm_id: caller.firmId }).forUpdate().first();
    if (!user) throw notFound('No person with this id.');
    const currentRole: Role = user.firm_role ?? 'client';
    const role = patch.role ?? currentRole;
    if (id === caller.userId && role !== currentRole) {
      throw new HttpError(403, 'forbidden', 'You cannot change your own role; ask another principal.');
    }
    const orgId = role === 'client' ? (patch.clientOrganisationId ?? user.client_organisation_id) : null;
    if (role === 'client') {
      if (!orgId)
        throw new HttpError(400, 'validation_failed', 'A client contact needs a client organisation.', {
          'body.clientOrganisationId': ['required for a client contact'],
        });
      const org = await trx('client_organisations').where({ id: orgId, firm_id: caller.firmId }).first('id');
      if (!org)
        throw new HttpError(400, 'validation_failed', 'No client organisation with this id.', {
          'body.clientOrganisationId': ['unknown client organisation'],
        });
    } else if (patch.clientOrganisationId) {
      throw new HttpError(400, 'validation_failed', 'Firm staff do not belong to a client organisation.', {
        'body.clientOrganisationId': ['must be empty for firm staff'],
      });
    }
    // Memberships mean something else once the kind or organisation changes, so they start again.
    const clear =
      (role !== currentRole && (role === 'client' || currentRole === 'client' || role === 'principal')) ||
      orgId !== user.client_organisation_id;
    await trx('users')
      .where({ id })
      .update({
        display_name: patch.displayName ?? user.display_name,
        ...kindOf(role),
        client_organisation_id: orgId,
        updated_at: trx.fn.now(),
      });
    if (clear) await trx('project_members').where({ user_id: id }).del();
    // Only engineers carry stages; a stage left assigned to anyone else could not be moved.
    if (role !== 'engineer')
      await trx('stages').where({ assignee_id: id }).update({ assignee_id: null, updated_at: trx.fn.now() });
  });
  const [person] = await listPeople(db, caller.firmId, id);
  return person;
}

/** Removes a person's access and ends all their sessions at once. */
export async function removeAccess(db: Db, caller: Caller, id: string): Promise<void> {
  if (id === caller.userId) throw new HttpError(403, 'forbidden', 'You cannot remove your own access.');
  const updated = await db('users')
    .where({ id, firm_id: caller.firmId })
    .update({ disabled_at: db.fn.now(), updated_at: db.fn.now() });
  if (!updated) throw notFound('No person with this id.');
  await db('invitations').where({ user_id: id }).whereNull('accepted_at').del();
  await endSessionsOf(db, id);
}
