/**
 * Who may read or change what: ONE table, consulted by every route guard (`permit`) and every
 * service check (`server/policy/enforce.ts`), and read by the access walk
 * (`test/server/access.test.ts`) to derive what each caller must get.
 *
 * Each action lists the roles that may do it and, per role, the grant's scope and conditions:
 * - scope `clinic`: any resource of the caller's own clinic;
 * - scope `self`: only what belongs to the athlete record linked to the caller's account (an
 *   athlete without an account belongs to nobody who can sign in);
 * - conditions (`when`): states the resource must be in (published, not a draft, not yet marked,
 *   uploaded by the caller, only the fields an athlete may change). For an action on one item they
 *   are checked against the item; for a list action (`…:list`) they say which items the list shows.
 *
 * A role missing from an action answers 403; a resource outside the scope (another clinic's, another
 * athlete's) answers 404, so its existence does not leak; each condition answers its own status
 * (see `CONDITIONS` in `decide.ts`). Pure data: no Express, no Knex.
 */
import type { Role } from '../../src/contracts/api';

export type { Role };

/** Every role, in the order tables and tests list them. */
export const ROLES: readonly Role[] = ['owner', 'coach', 'athlete'];

/** How far a grant reaches. */
export type Scope = 'clinic' | 'self';

/** A state the resource must be in for a grant to hold (see `CONDITIONS` for what each answers). */
export type Condition = 'published' | 'not-draft' | 'unmarked' | 'own-upload' | 'name-fields-only';

/** What one role may do with one action. */
export interface Grant {
  scope: Scope;
  when: readonly Condition[];
}

/** Grants of one action, by role; a role not named may not do it. */
export type Grants = Readonly<Partial<Record<Role, Grant>>>;

const CLINIC: Grant = { scope: 'clinic', when: [] };
const self = (...when: Condition[]): Grant => ({ scope: 'self', when });

/** Owner and coach, each for their whole clinic. */
const STAFF: Grants = { owner: CLINIC, coach: CLINIC };
/** The clinic's owner only. */
const OWNER: Grants = { owner: CLINIC };
/** Staff for the clinic, and the athlete for what is their own (under conditions). */
const staffAndSelf = (...when: Condition[]): Grants => ({ ...STAFF, athlete: self(...when) });
const ownerAndSelf = (...when: Condition[]): Grants => ({ ...OWNER, athlete: self(...when) });

export const ACCESS_TABLE = {
  // ── Team (owner) ──
  'staff:list': OWNER,
  'staff:invite': OWNER,
  'staff:revoke-invitation': OWNER,
  'staff:deactivate': OWNER,
  'staff:reactivate': OWNER,
  'coach:list': STAFF,

  // ── Athletes ──
  'athlete:list': STAFF,
  'athlete:create': STAFF,
  'athlete:read': staffAndSelf(),
  /** Coach notes on the profile. */
  'athlete:read-notes': STAFF,
  'athlete:update': staffAndSelf('name-fields-only'),
  'athlete:update-intake': staffAndSelf(),
  'athlete:invite': STAFF,

  // ── Assessments and clips ──
  'assessment:list': staffAndSelf(),
  'assessment:create': STAFF,
  'assessment:read': staffAndSelf(),
  /** Coach notes on an assessment. */
  'assessment:read-notes': STAFF,
  'assessment:update': STAFF,
  'assessment:delete': STAFF,
  'clip:upload': staffAndSelf(),
  'clip:read': staffAndSelf(),
  'clip:read-media': staffAndSelf(),
  'clip:update-settings': staffAndSelf('unmarked'),
  'clip:delete': staffAndSelf('own-upload'),
  'clip:retry': staffAndSelf(),
  /** The progress stream of an athlete's processed items (the athlete sees the kinds that say so). */
  'processing:follow': staffAndSelf(),
  /** Every kind on that stream (stills and summaries still rendering, not only clips). */
  'processing:see-all': STAFF,
  /** The clinic's own progress stream: its processed items about no athlete (exercises' demonstration clips). */
  'processing:follow-clinic': STAFF,

  // ── Annotation, measures, comparison, reference bands (staff) ──
  'annotation:read': STAFF,
  'annotation:write': STAFF,
  /** Ask for gait events proposed from the clip's landmarks (saved as proposals). */
  'event:propose': STAFF,
  /** Follow the markers of one frame through the clip (saved as followed landmarks). */
  'landmark:follow': STAFF,
  'measure:read': STAFF,
  'comparison:read': STAFF,
  'reference-band:list': STAFF,
  'reference-band:change': OWNER,

  // ── Exercise library and plans ──
  'exercise:list': STAFF,
  'exercise:create': STAFF,
  'exercise:read': STAFF,
  'exercise:update': STAFF,
  'exercise:archive': STAFF,
  'plan:list': staffAndSelf('not-draft'),
  'plan:create': STAFF,
  'plan:read': staffAndSelf('not-draft'),
  /** The coach's notes on a plan. */
  'plan:read-notes': STAFF,
  'plan:update': STAFF,
  'plan:delete': STAFF,
  'plan:transition': STAFF,
  'plan:set-pain-rule': STAFF,
  'plan:read-progress': staffAndSelf('not-draft'),
  'plan-alert:list': STAFF,
  'plan-log:list': staffAndSelf('not-draft'),
  'plan-log:create': { athlete: self('not-draft') },
  'plan-log:morning-check': { athlete: self('not-draft') },
  /**
   * Demonstration pictures of an exercise. An athlete reaches them (scope `self`) only for an
   * exercise on a stage of one of their own plans that is not a draft.
   */
  'demo:list': staffAndSelf(),
  'demo:read': staffAndSelf(),
  'demo:create': STAFF,
  'demo:update': STAFF,
  'demo:delete': STAFF,

  // ── Billing (coaches have none) ──
  'billing-settings:read': OWNER,
  'billing-settings:update': OWNER,
  'clinic-legal:read': OWNER,
  'clinic-legal:update': OWNER,
  /** The caller's own clinic's name, legal details and logo, as its pages show them (no id: the caller's clinic). */
  'clinic-brand:read': staffAndSelf(),
  'clinic-logo:update': OWNER,
  'price:list': OWNER,
  'price:create': OWNER,
  'price:update': OWNER,
  'price:archive': OWNER,
  'invoice:list': ownerAndSelf('not-draft'),
  'invoice:create': OWNER,
  'invoice:read': ownerAndSelf('not-draft'),
  'invoice:update': OWNER,
  'invoice:delete': OWNER,
  'invoice:issue': OWNER,
  'invoice:cancel': OWNER,
  'invoice:record-payment': OWNER,
  'invoice:refund': OWNER,
  'invoice:pay': { athlete: self('not-draft') },
  'invoice:read-receipt': ownerAndSelf('not-draft'),

  // ── Athlete data: export, erasure, consent withdrawal, clip retention ──
  /** The owner's Data section of an athlete: consents, clips held, kept invoices. */
  'athlete-data:read': OWNER,
  'data-export:list': ownerAndSelf(),
  'data-export:create': ownerAndSelf(),
  'data-export:download': ownerAndSelf(),
  /** Erase everything about an athlete (invoices stay with a reference instead of the name). */
  'athlete:erase': OWNER,
  /** Erase an athlete's clips only (asked after consent to video is withdrawn). */
  'clip:erase-all': OWNER,
  'retention:read': OWNER,
  'retention:update': OWNER,
  'retention:review': OWNER,
  'retention:confirm': OWNER,

  // ── Stills, visit summaries and annotated clips ──
  'still:create': STAFF,
  'still:list': staffAndSelf('published'),
  'still:read': staffAndSelf('published'),
  'still:update': STAFF,
  'still:publish': STAFF,
  'still:delete': STAFF,
  'summary:create': STAFF,
  'summary:list': staffAndSelf('published'),
  'summary:read': staffAndSelf('published'),
  'summary:publish': STAFF,
  'summary:delete': STAFF,
  'annotated-clip:create': STAFF,
  'annotated-clip:list': staffAndSelf('published'),
  'annotated-clip:read': staffAndSelf('published'),
  'annotated-clip:publish': STAFF,
  'annotated-clip:delete': STAFF,
  /** The portal's "shared with you" section: the athlete's own published stills and summaries. */
  'portal-shared:list': { athlete: self('published') },
} as const satisfies Record<string, Grants>;

/** Every action the policy knows, `resource:verb`. */
export type Action = keyof typeof ACCESS_TABLE;

/** Actions on a collection: their conditions filter the items instead of refusing. */
export type ListAction = Extract<Action, `${string}:list`>;

/** Every action, in table order. */
export const ACTIONS = Object.keys(ACCESS_TABLE) as Action[];

/** Whether the action is about a collection (its conditions filter what the list shows). */
export function isListAction(action: Action): action is ListAction {
  return action.endsWith(':list');
}

/** The grant of a role for an action, or null when the role may not do it. */
export function grantOf(action: Action, role: Role): Grant | null {
  return (ACCESS_TABLE[action] as Grants)[role] ?? null;
}

/** The roles that may do an action at all (in any scope). */
export function rolesFor(action: Action): Role[] {
  return ROLES.filter((role) => grantOf(action, role) !== null);
}
