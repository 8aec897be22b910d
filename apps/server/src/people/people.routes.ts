import type { Request } from 'express';
import { z } from 'zod';
import {
  clientOrganisationSchema,
  invitationCreateSchema,
  personPatchSchema,
  personSchema,
  type InvitationPreview,
} from '@trabeate/contracts';
import type { Db } from '../db/db';
import { notFound } from '../core/errors';
import { validate } from '../core/validate';
import { route, type RouteDecl } from '../access/registry';
import type { Caller } from '../access/policy';
import type { Notices } from '../notices/notices';
import { listPeople } from './people.repository';
import { hashToken, invite, removeAccess, updatePerson } from './people.service';

const idParams = z.object({ id: z.uuid() });
const tokenParams = z.object({ token: z.string().min(20).max(100) });
// The guard has checked the rule, so a caller is present on every non-public route here.
const callerOf = (req: Request): Caller => req.caller as Caller;

export function peopleRoutes(
  db: Db,
  opts: { publicUrl: string; invitationTtlDays: number; linkSecret: string; notices?: Notices },
): RouteDecl[] {
  return [
    route('get', '/people', 'principal', async (req, res) => {
      res.json(personSchema.array().parse(await listPeople(db, callerOf(req).firmId)));
    }),
    route('get', '/client-organisations', 'principal', async (req, res) => {
      res.json(
        clientOrganisationSchema.array().parse(
          await db('client_organisations')
            .where({ firm_id: callerOf(req).firmId })
            .orderBy('name')
            .select('id', 'name'),
        ),
      );
    }),
    route('post', '/invitations', 'principal', validate({ body: invitationCreateSchema }), async (req, res) => {
      const created = await invite(db, callerOf(req), req.body, {
        publicUrl: opts.publicUrl,
        ttlDays: opts.invitationTtlDays,
        linkSecret: opts.linkSecret,
        notices: opts.notices,
      });
      req.log?.info({ personId: created.person.id, role: created.person.role }, 'invitation created');
      res.status(201).json(created);
    }),
    route('get', '/invitations/:token', 'public', validate({ params: tokenParams }), async (req, res) => {
      const row = await db('invitations as i')
        .join('users as u', 'u.id', 'i.user_id')
        .join('firms as f', 'f.id', 'i.firm_id')
        .where('i.token_hash', hashToken(String(req.params['token'])))
        .whereNull('u.disabled_at')
        .first('u.email', 'u.display_name', 'u.firm_role', 'f.name as firm_name', 'i.expires_at', 'i.accepted_at');
      if (!row) throw notFound('This invitation link is not valid. Ask the firm for a new one.');
      const body: InvitationPreview = {
        email: row.email,
        displayName: row.display_name,
        role: row.firm_role ?? 'client',
        firmName: row.firm_name,
        status: row.accepted_at ? 'accepted' : new Date(row.expires_at).getTime() < Date.now() ? 'expired' : 'pending',
        expiresAt: new Date(row.expires_at).toISOString(),
        signInUrl: '/api/auth/login?returnTo=/',
      };
      res.json(body);
    }),
    route(
      'patch',
      '/people/:id',
      'principal',
      validate({ params: idParams, body: personPatchSchema }),
      async (req, res) => {
        res.json(await updatePerson(db, callerOf(req), String(req.params['id']), req.body));
      },
    ),
    route('delete', '/people/:id/access', 'principal', validate({ params: idParams }), async (req, res) => {
      await removeAccess(db, callerOf(req), String(req.params['id']));
      req.log?.info({ personId: req.params['id'] }, 'access removed; sessions ended');
      res.status(204).end();
    }),
  ];
}
