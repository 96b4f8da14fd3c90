/**
 * The pure decisions over `ACCESS_TABLE`: given who asks, what they want to do and what it is
 * about, answer allowed (with the grant) or refused (with the status and words the API answers).
 * No Express, no Knex: `enforce.ts` turns refusals into typed errors, tests call these directly.
 */
import { grantOf, isListAction, type Action, type Condition, type Grant, type Role } from './access-table';

/** The caller as the policy sees them; null when nobody is signed in. */
export interface Actor {
  id: number;
  role: Role;
  clinicId: number;
  /** false for a deactivated account: it counts as signed out. Missing = active. */
  active?: boolean;
}

/** Who a resource belongs to: its clinic and, when it is about one athlete, that athlete's account. */
export interface Owner {
  clinicId: number;
  /**
   * The user account of the athlete the resource belongs to; null when that athlete has no account
   * (nobody signs in as them); undefined when the resource is the clinic's, not one athlete's.
   */
  athleteUserId?: number | null;
}

/** The state the conditions of a grant read; a condition whose field is missing does not hold. */
export interface ResourceState {
  /** Still or summary: published, ready, and (stills) with its image. */
  published?: boolean;
  /** Plan or invoice still a draft. */
  draft?: boolean;
  /** Clip with landmarks or gait events. */
  marked?: boolean;
  /** Clip: the account that uploaded it. */
  uploadedBy?: number | null;
  /** The fields a change sends. */
  fields?: readonly string[];
}

/** A resource the policy decides about: its owner and its state. */
export type Target = Owner & ResourceState;

/** Why a request is refused, as the API answers it. */
export interface Refusal {
  status: 401 | 403 | 404 | 409;
  code: string;
  message: string;
}

export type Decision = { allowed: true; grant: Grant } | ({ allowed: false } & Refusal);

/** The fields an athlete may change on their own profile (the rest are the clinic's). */
export const ATHLETE_SELF_FIELDS = ['firstName', 'lastName'] as const;

const SIGNED_OUT: Refusal = { status: 401, code: 'unauthorized', message: 'Please sign in.' };
const WRONG_ROLE: Refusal = { status: 403, code: 'forbidden', message: 'Your role does not allow this.' };
/** 404 without naming the resource; `enforce.ts` names it ("Clip not found."). */
const NOT_FOUND: Refusal = { status: 404, code: 'not_found', message: 'Resource not found.' };

/** What each condition reads and what it answers when it does not hold. */
export const CONDITIONS: Record<
  Condition,
  { holds: (state: ResourceState, actor: Actor) => boolean; refusal: (state: ResourceState) => Refusal }
> = {
  // Unpublished stills and summaries, and drafts, do not exist for the athlete.
  published: { holds: (s) => s.published === true, refusal: () => NOT_FOUND },
  'not-draft': { holds: (s) => s.draft === false, refusal: () => NOT_FOUND },
  // The athlete may change their clip's settings in general: its marked state stands in the way (409, not 403).
  unmarked: {
    holds: (s) => s.marked === false,
    refusal: () => ({
      status: 409,
      code: 'clip_marked',
      message:
        'Your clinician has already marked this clip, so its settings (near side, running direction, capture frame rate) are locked. Ask your clinician to change them.',
    }),
  },
  'own-upload': {
    holds: (s, actor) => s.uploadedBy === actor.id,
    refusal: () => ({ status: 403, code: 'forbidden', message: 'You can delete only clips you uploaded.' }),
  },
  'name-fields-only': {
    holds: (s) => s.fields !== undefined && s.fields.every((f) => (ATHLETE_SELF_FIELDS as readonly string[]).includes(f)),
    refusal: (s) => {
      const extra = (s.fields ?? []).filter((f) => !(ATHLETE_SELF_FIELDS as readonly string[]).includes(f));
      const not = extra.length ? ` (not ${extra.join(', ')})` : '';
      return { status: 403, code: 'forbidden', message: `You can change only your name here${not}.` };
    },
  },
};

/** Whether the actor counts as signed in (a deactivated account does not). */
function signedIn(actor: Actor | null): actor is Actor {
  return actor !== null && actor.active !== false;
}

/**
 * Role only: may this caller do this action at all? 401 when signed out, 403 for a role the
 * table does not name. What route guards ask before anything is loaded.
 */
export function decideRole(actor: Actor | null, action: Action): Decision {
  if (!signedIn(actor)) return { allowed: false, ...SIGNED_OUT };
  const grant = grantOf(action, actor.role);
  if (!grant) return { allowed: false, ...WRONG_ROLE };
  return { allowed: true, grant };
}

/**
 * Role and scope: may this caller reach a resource with this owner? Another clinic's resource, or
 * (scope `self`) anything not the caller's own athlete record, is 404. Conditions are not read.
 */
export function decideScope(actor: Actor | null, action: Action, owner: Owner): Decision {
  const byRole = decideRole(actor, action);
  if (!byRole.allowed) return byRole;
  const { grant } = byRole;
  const a = actor!;
  if (owner.clinicId !== a.clinicId) return { allowed: false, ...NOT_FOUND };
  if (grant.scope === 'self' && (owner.athleteUserId === undefined || owner.athleteUserId === null || owner.athleteUserId !== a.id)) {
    return { allowed: false, ...NOT_FOUND };
  }
  return { allowed: true, grant };
}

/**
 * The grant's conditions against the resource's state, in table order; the first that does not
 * hold answers. A list action's conditions filter its items instead, so they never refuse here.
 */
export function decideState(actor: Actor, action: Action, grant: Grant, state: ResourceState): Decision {
  if (isListAction(action)) return { allowed: true, grant };
  for (const condition of grant.when) {
    const c = CONDITIONS[condition];
    if (!c.holds(state, actor)) return { allowed: false, ...c.refusal(state) };
  }
  return { allowed: true, grant };
}

/** The whole decision about one resource: role (401/403), then scope (404), then conditions. */
export function decide(actor: Actor | null, action: Action, target: Target): Decision {
  const scoped = decideScope(actor, action, target);
  if (!scoped.allowed) return scoped;
  return decideState(actor!, action, scoped.grant, target);
}

/** Whether the caller's role may do the action at all (e.g. "are coach notes shown?"). */
export function may(actor: Actor | null, action: Action): boolean {
  return decideRole(actor, action).allowed;
}
