import { STAGE_TITLES, type StageAction, type StageKey, type StageState } from '@trabeate/contracts';
import type { Role } from '@trabeate/contracts';

/**
 * The design-stage workflow in one place: which action moves a stage from which state, and who
 * may take it. The server enforces it; the client only shows the actions the server lists.
 *
 *   not_started --start--> in_progress --submit--> under_review --approve--> approved
 *                                                  under_review --return--> returned
 *   returned ---submit--> under_review             approved ----reopen---> in_progress
 *
 * A returned stage is already being worked on again: it offers one way on (submit once the
 * comments are addressed), not a second "start" that would only relabel it.
 */
interface Transition {
  from: StageState[];
  to: StageState;
  by: 'assignee' | 'principal';
}

export const TRANSITIONS: Record<StageAction, Transition> = {
  start: { from: ['not_started'], to: 'in_progress', by: 'assignee' },
  submit: { from: ['in_progress', 'returned'], to: 'under_review', by: 'assignee' },
  approve: { from: ['under_review'], to: 'approved', by: 'principal' },
  return: { from: ['under_review'], to: 'returned', by: 'principal' },
  reopen: { from: ['approved'], to: 'in_progress', by: 'principal' },
};

const ACTIONS = Object.keys(TRANSITIONS) as StageAction[];

export const STATE_WORDS: Record<StageState, string> = {
  not_started: 'not started',
  in_progress: 'in progress',
  under_review: 'under review',
  returned: 'returned',
  approved: 'approved',
};

const DOING: Record<StageAction, string> = {
  start: 'start it',
  submit: 'submit it for review',
  approve: 'approve it',
  return: 'return it with a comment',
  reopen: 'reopen it, giving a reason',
};

export interface StageFacts {
  key: StageKey;
  state: StageState;
  assigneeId: string | null;
}

export interface ActingCaller {
  userId: string;
  role: Role;
}

const mayAct = (t: Transition, stage: StageFacts, caller: ActingCaller) =>
  t.by === 'principal' ? caller.role === 'principal' : stage.assigneeId !== null && stage.assigneeId === caller.userId;

/** The actions this caller may take on the stage now. */
export function allowedActions(stage: StageFacts, caller: ActingCaller, archived = false): StageAction[] {
  if (archived) return [];
  return ACTIONS.filter((a) => TRANSITIONS[a].from.includes(stage.state) && mayAct(TRANSITIONS[a], stage, caller));
}

/** What can happen to a stage in this state, in words (for a 409 that says what is allowed). */
export function whatIsAllowed(stage: StageFacts): string {
  const next = ACTIONS.filter((a) => TRANSITIONS[a].from.includes(stage.state));
  const byAssignee = next.filter((a) => TRANSITIONS[a].by === 'assignee').map((a) => DOING[a]);
  const byPrincipal = next.filter((a) => TRANSITIONS[a].by === 'principal').map((a) => DOING[a]);
  const parts: string[] = [];
  if (byAssignee.length) parts.push(`the assigned engineer can ${join(byAssignee)}`);
  if (byPrincipal.length) parts.push(`the principal can ${join(byPrincipal)}`);
  return parts.join('; ');
}

export interface Refusal {
  status: 403 | 409;
  message: string;
}

/**
 * Why this caller may not take this action on the stage now, or null when they may. A move the
 * state does not allow is a 409 saying what is allowed; the right move by the wrong person is a 403.
 */
export function transitionRefusal(
  action: StageAction,
  stage: StageFacts,
  caller: ActingCaller,
  archived = false,
): Refusal | null {
  const title = STAGE_TITLES[stage.key];
  if (archived) return { status: 409, message: 'This project is archived; restore it before changing its stages.' };
  const t = TRANSITIONS[action];
  if (!t.from.includes(stage.state)) {
    return {
      status: 409,
      message: `${title} is ${STATE_WORDS[stage.state]}, so it cannot be ${pastTense(action)}. From ${STATE_WORDS[stage.state]}, ${whatIsAllowed(stage)}.`,
    };
  }
  if (t.by === 'assignee' && stage.assigneeId === null) {
    return { status: 409, message: `Nobody is assigned to ${title} yet; the principal assigns an engineer first.` };
  }
  if (!mayAct(t, stage, caller)) {
    return {
      status: 403,
      message:
        t.by === 'principal'
          ? `Only the principal can ${DOING[action]}.`
          : `Only the engineer assigned to ${title} can ${DOING[action]}.`,
    };
  }
  return null;
}

function pastTense(action: StageAction): string {
  return { start: 'started', submit: 'submitted', approve: 'approved', return: 'returned', reopen: 'reopened' }[action];
}

function join(items: string[]): string {
  return items.length <= 1 ? items.join('') : `${items.slice(0, -1).join(', ')} or ${items[items.length - 1]}`;
}

/** Deliverables may change while the work is open, not while it is reviewed or once approved. */
export function uploadRefusal(stage: StageFacts, archived: boolean): string | null {
  if (archived) return 'This project is archived; restore it before adding files.';
  if (stage.state === 'under_review')
    return `${STAGE_TITLES[stage.key]} is under review; files can be added once it is returned or reopened.`;
  if (stage.state === 'approved')
    return `${STAGE_TITLES[stage.key]} is approved; the principal reopens it before files can change.`;
  return null;
}
