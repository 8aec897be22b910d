import type { Request } from 'express';
import { z } from 'zod';
import type { ProjectDetail, ProjectSummary } from '@trabeate/contracts';
import type { Db } from '../db/db';
import { HttpError, notFound } from '../core/errors';
import { validate } from '../core/validate';
import { route, type RouteDecl } from '../access/registry';
import { abilities, type Caller } from '../access/policy';

const callerOf = (req: Request): Caller => req.caller as Caller;
const memberParams = z.object({ projectId: z.uuid(), userId: z.uuid() });

interface ProjectRow {
  id: string;
  reference: string;
  name: string;
  client_organisation_id: string;
  org_name: string;
  site_address: string;
  building_use: string;
  storeys: number;
  storey_height_m: string;
  floor_area_m2: string | null;
  estimated_cost: string | null;
  currency: string;
}

function projectsQuery(db: Db, firmId: string) {
  return db('projects as p')
    .join('client_organisations as o', 'o.id', 'p.client_organisation_id')
    .where('p.firm_id', firmId)
    .select('p.id', 'p.reference', 'p.name', 'p.client_organisation_id', 'o.name as org_name', 'p.site_address', 'p.building_use',
      'p.storeys', 'p.storey_height_m', 'p.floor_area_m2', 'p.estimated_cost', 'p.currency');
}

/** Limits a project query to what the caller may see (the same rule as canSeeProject in access/policy.ts). */
function visibleTo<Q extends ReturnType<typeof projectsQuery>>(q: Q, caller: Caller): Q {
  if (caller.role === 'principal') return q;
  q.whereExists((sub) => sub.select(sub.client.raw('1')).from('project_members as m').whereRaw('m.project_id = p.id').andWhere('m.user_id', caller.userId));
  if (caller.role === 'client') q.andWhere('p.client_organisation_id', caller.clientOrganisationId);
  return q;
}

const summary = (r: ProjectRow): ProjectSummary => ({
  id: r.id,
  reference: r.reference,
  name: r.name,
  clientOrganisation: { id: r.client_organisation_id, name: r.org_name },
  siteAddress: r.site_address,
  buildingUse: r.building_use,
  storeys: r.storeys,
});

export function projectRoutes(db: Db): RouteDecl[] {
  return [
    route('get', '/projects', 'signedIn', async (req, res) => {
      const rows: ProjectRow[] = await visibleTo(projectsQuery(db, callerOf(req).firmId), callerOf(req)).orderBy('p.reference');
      res.json(rows.map(summary));
    }),
    route('get', '/projects/:projectId', 'project:read', async (req, res) => {
      const caller = callerOf(req);
      const row: ProjectRow = await projectsQuery(db, caller.firmId).andWhere('p.id', req.project!.id).first();
      const members = await db('project_members as m').join('users as u', 'u.id', 'm.user_id')
        .where('m.project_id', row.id).whereNull('u.disabled_at').orderBy('u.display_name')
        .select('u.id', 'u.display_name', 'u.firm_role');
      const can = abilities(caller.role);
      const body: ProjectDetail = {
        ...summary(row),
        storeyHeightM: Number(row.storey_height_m),
        floorAreaM2: row.floor_area_m2 === null ? null : Number(row.floor_area_m2),
        members: members.map((m) => ({ id: m.id, displayName: m.display_name, role: m.firm_role ?? 'client' })),
        finance: can.seeFinance ? { estimatedCost: row.estimated_cost === null ? null : Number(row.estimated_cost), currency: row.currency.trim() } : null,
        abilities: can,
      };
      res.json(body);
    }),
    route('put', '/projects/:projectId/members/:userId', 'project:manage', validate({ params: memberParams }), async (req, res) => {
      const caller = callerOf(req);
      const project = req.project!;
      const user = await db('users').where({ id: req.params['userId'], firm_id: caller.firmId }).whereNull('disabled_at').first();
      if (!user) throw notFound('No person with this id.');
      if (user.firm_role === 'principal') throw new HttpError(409, 'conflict', 'The principal sees every project already.');
      if (!user.firm_role && user.client_organisation_id !== project.client_organisation_id) {
        throw new HttpError(409, 'conflict', "This person is a contact of another client organisation; they cannot join this project.");
      }
      await db('project_members').insert({ project_id: project.id, user_id: user.id, added_by: caller.userId }).onConflict(['project_id', 'user_id']).ignore();
      res.status(204).end();
    }),
    route('delete', '/projects/:projectId/members/:userId', 'project:manage', validate({ params: memberParams }), async (req, res) => {
      await db('project_members').where({ project_id: req.project!.id, user_id: req.params['userId'] }).del();
      res.status(204).end();
    }),
  ];
}
