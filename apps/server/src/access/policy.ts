import type { Role } from '@trabeate/contracts';

/**
 * Who may do what, in one place. Every API route declares one of these rules (see registry.ts);
 * the guard there applies it before the handler runs.
 *
 * - public: anyone, signed in or not.
 * - identified: signed in at the provider, with or without access to Trabeate (GET /api/me).
 * - signedIn: a person with access (any role).
 * - firm / principal: the firm's staff / the principal only.
 * - project:*: the project named by :projectId must be visible to the caller (else 404), and the
 *   caller's role must allow the action on it (else 403 saying why). `internal` is the firm's own
 *   work on a project (review threads, working files): clients see outcomes, not work in progress.
 */
export type ProjectAction =
  'read' | 'internal' | 'work' | 'manage' | 'finance' | 'pay' | 'acknowledge' | 'readSchemes' | 'editSchemes';
export type Rule = 'public' | 'identified' | 'signedIn' | 'firm' | 'principal' | `project:${ProjectAction}`;

export interface Caller {
  userId: string;
  firmId: string;
  email: string;
  displayName: string;
  role: Role;
  clientOrganisationId: string | null;
  /** Names loaded with the caller on each request (absent where a caller is built otherwise). */
  firmName?: string;
  clientOrganisationName?: string | null;
  /** The firm's date settings, loaded with the names (GET /api/me carries them). */
  firmDateLocale?: string;
  firmTimeZone?: string;
}

/** The facts about one project that visibility depends on. */
export interface ProjectAccessFacts {
  firmId: string;
  clientOrganisationId: string;
  /** Is the caller on the project's team (assigned engineer, or member client contact)? */
  callerIsMember: boolean;
}

/**
 * Can the caller know the project exists? The principal sees the whole firm; an engineer sees
 * projects they are assigned to; a client contact sees their organisation's projects they belong to.
 */
export function canSeeProject(caller: Caller, project: ProjectAccessFacts): boolean {
  if (project.firmId !== caller.firmId) return false;
  switch (caller.role) {
    case 'principal':
      return true;
    case 'engineer':
      return project.callerIsMember;
    case 'client':
      return project.callerIsMember && project.clientOrganisationId === caller.clientOrganisationId;
  }
}

/** Why the caller's role may not take this action on a project it can see; null when it may. */
export function projectRefusal(role: Role, action: ProjectAction): string | null {
  switch (action) {
    case 'read':
      return null;
    case 'internal':
      return role === 'client'
        ? "Review notes and working files stay with the firm; you see each stage's progress here and receive drawings when they are issued."
        : null;
    case 'work':
      return role === 'client' ? 'Client contacts can view this project but not change it.' : null;
    case 'manage':
      return role === 'principal' ? null : "Only the firm's principal can manage this project's team and settings.";
    case 'finance':
      return role === 'engineer'
        ? "Fees, invoices and payments are visible to the principal and the project's client only."
        : null;
    case 'pay':
      return role === 'client' ? null : "Invoices are paid by the client's contacts, not by the firm.";
    case 'acknowledge':
      return role === 'client' ? null : "Transmittals are acknowledged by the client's contacts, not by the firm.";
    // Schemes are the firm's working files: the principal and the engineers read them, the
    // project's engineers change them.
    case 'readSchemes':
      return role === 'client'
        ? "Structural schemes are the firm's working files; issued drawings are shared instead."
        : null;
    case 'editSchemes':
      return role === 'engineer'
        ? null
        : role === 'client'
          ? "Structural schemes are the firm's working files; issued drawings are shared instead."
          : "Schemes are laid out by the project's engineers; the principal reads and reviews them.";
  }
}

/** Why the caller may not use a firm-level route; null when they may. */
export function firmRefusal(role: Role, rule: 'firm' | 'principal'): string | null {
  if (rule === 'principal') return role === 'principal' ? null : "Only the firm's principal can do this.";
  return role === 'client' ? "This part of Trabeate is for the firm's staff." : null;
}

export function abilities(
  role: Role,
): Record<'work' | 'manage' | 'seeFinance' | 'seeInternal' | 'pay' | 'acknowledge', boolean> {
  return {
    work: projectRefusal(role, 'work') === null,
    manage: projectRefusal(role, 'manage') === null,
    seeFinance: projectRefusal(role, 'finance') === null,
    seeInternal: projectRefusal(role, 'internal') === null,
    pay: projectRefusal(role, 'pay') === null,
    acknowledge: projectRefusal(role, 'acknowledge') === null,
  };
}
