import type { RequestHandler, Router } from 'express';
import type { Db } from '../db/db';
import type { VisibleProject } from './request';
import { HttpError, notFound } from '../core/errors';
import { rejectNulCharacters } from '../core/validate';
import { canSeeProject, firmRefusal, projectRefusal, type Caller, type ProjectAction, type Rule } from './policy';

export type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

/** One API route and the access rule it runs under. Every API route is declared this way. */
export interface RouteDecl {
  method: Method;
  /** Path below /api, in Express syntax (for example /projects/:projectId). */
  path: string;
  rule: Rule;
  handlers: RequestHandler[];
}

export function route(method: Method, path: string, rule: Rule, ...handlers: RequestHandler[]): RouteDecl {
  if (rule.startsWith('project:') && !path.includes(':projectId')) {
    throw new Error(`${method.toUpperCase()} ${path}: a project rule needs :projectId in the path`);
  }
  return { method, path, rule, handlers };
}

export interface GuardDeps {
  db: Db;
  /** True when the request carries a valid CSRF token (cookie XSRF-TOKEN = header X-XSRF-TOKEN). */
  csrfValid: (req: Parameters<RequestHandler>[0]) => boolean;
}

/** Mounts the declared routes, each behind the guard for its rule; returns what was mounted. */
export function mountRoutes(
  router: Router,
  routes: RouteDecl[],
  deps: GuardDeps,
): Array<Pick<RouteDecl, 'method' | 'path' | 'rule'>> {
  // NUL is refused before anything, the guard's own queries included, can pass it to PostgreSQL.
  for (const r of routes) router[r.method](r.path, rejectNulCharacters, guard(r.rule, deps), ...r.handlers);
  return routes.map(({ method, path, rule }) => ({ method, path, rule }));
}

/** Methods that change nothing: no CSRF header needed. */
export const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/**
 * The one place access is enforced: 401 for the anonymous, 403 `no_access` for someone signed
 * in without an invitation, 403 `csrf_failed` for a state change without the CSRF header, 404 for
 * a project the caller may not see, 403 with the reason for an action the role may not take.
 */
export function guard(rule: Rule, { db, csrfValid }: GuardDeps): RequestHandler {
  const project = rule.startsWith('project:') ? projectGuard(rule.slice('project:'.length) as ProjectAction, db) : null;
  // Synchronous but for the project rules' one query: most requests pass without a promise.
  return (req, _res, next) => {
    // Any state change made with a signed-in session needs the CSRF header, whatever the rule.
    const signedIn = Boolean(req.session?.auth);
    if (signedIn && !SAFE_METHODS.has(req.method) && !csrfValid(req)) {
      throw new HttpError(
        403,
        'csrf_failed',
        'This change was refused because the request did not carry the X-XSRF-TOKEN header matching the XSRF-TOKEN cookie. Reload the page and try again.',
      );
    }
    if (rule === 'public') return next();
    if (!signedIn) {
      throw req.sessionProblem === 'expired'
        ? new HttpError(401, 'session_expired', 'Your session has ended. Sign in again.')
        : new HttpError(401, 'unauthenticated', 'Sign in to use Trabeate.');
    }
    if (rule === 'identified') return next();
    const caller = req.caller;
    if (!caller) {
      throw new HttpError(
        403,
        'no_access',
        'You are signed in, but nobody at the firm has given you access to Trabeate yet.',
      );
    }
    if (rule === 'signedIn') return next();
    if (rule === 'firm' || rule === 'principal') {
      const refusal = firmRefusal(caller.role, rule);
      if (refusal) throw new HttpError(403, 'forbidden', refusal);
      return next();
    }
    return project!(req, caller, next);
  };
}

/** The project rules: the project exists in the caller's firm, they may see it, and their role may act. */
function projectGuard(action: ProjectAction, db: Db) {
  const missing = () => notFound('No project with this id.');
  return async (req: Parameters<RequestHandler>[0], caller: Caller, next: () => void): Promise<void> => {
    const projectId = req.params['projectId'];
    if (typeof projectId !== 'string' || !UUID.test(projectId)) throw missing();
    // The project and the caller's membership in one query: this runs on every project request.
    const found = await db('projects as p')
      .where({ 'p.id': projectId, 'p.firm_id': caller.firmId })
      .first(
        'p.id',
        'p.firm_id',
        'p.client_organisation_id',
        db.raw('exists (select 1 from project_members m where m.project_id = p.id and m.user_id = ?) as is_member', [
          caller.userId,
        ]),
      );
    if (!found) throw missing();
    const { is_member: isMember, ...project } = found as VisibleProject & { is_member: boolean };
    const visible = canSeeProject(caller, {
      firmId: project.firm_id,
      clientOrganisationId: project.client_organisation_id,
      callerIsMember: isMember,
    });
    if (!visible) throw missing();
    const refusal = projectRefusal(caller.role, action);
    if (refusal) throw new HttpError(403, 'forbidden', refusal);
    req.project = project;
    next();
  };
}
