/**
 * The access policy's pure decisions (`server/policy/access-table.ts`, `decide.ts`), table-driven:
 * every action × every kind of caller × every kind of target, plus each state condition and the
 * tricky callers (an athlete without an account, a deactivated coach, another clinic's owner).
 *
 * The expectations come from outside the table: `DOCUMENTED` copies the "who" column of the API
 * reference in DEVELOPERS.md (owner / owner, coach / athlete (own)) action by action, and the
 * statuses are the API's rules stated there: 401 signed out, 403 wrong role, 404 another clinic's
 * or another athlete's id.
 */
import { describe, expect, it } from 'vitest';
import { ACCESS_TABLE, ACTIONS, ROLES, isListAction, rolesFor, type Action, type Role } from '../../../server/policy/access-table';
import { decide, decideRole, decideState, may, type Actor, type Target } from '../../../server/policy/decide';
import { permit } from '../../../server/policy/enforce';
import { ForbiddenError, UnauthorizedError } from '../../../server/errors';

/** S = owner and coach (their clinic); O = owner only; +A = and the athlete (their own records); A = the athlete only. */
type Who = 'S' | 'O' | 'S+A' | 'O+A' | 'A';

/** DEVELOPERS.md, API tables, "who" column (field views such as coach notes: "null for athletes"). */
const DOCUMENTED: Record<Action, Who> = {
  'staff:list': 'O',
  'staff:invite': 'O',
  'staff:revoke-invitation': 'O',
  'staff:deactivate': 'O',
  'staff:reactivate': 'O',
  'coach:list': 'S',
  'athlete:list': 'S',
  'athlete:create': 'S',
  'athlete:read': 'S+A',
  'athlete:read-notes': 'S',
  'athlete:update': 'S+A',
  'athlete:update-intake': 'S+A',
  'athlete:invite': 'S',
  'assessment:list': 'S+A',
  'assessment:create': 'S',
  'assessment:read': 'S+A',
  'assessment:read-notes': 'S',
  'assessment:update': 'S',
  'assessment:delete': 'S',
  'clip:upload': 'S+A',
  'clip:read': 'S+A',
  'processing:follow': 'S+A',
  'processing:see-all': 'S',
  'processing:follow-clinic': 'S',
  'clip:read-media': 'S+A',
  'clip:update-settings': 'S+A',
  'clip:delete': 'S+A',
  'clip:retry': 'S+A',
  'annotation:read': 'S',
  'annotation:write': 'S',
  'event:propose': 'S',
  'landmark:follow': 'S',
  'measure:read': 'S',
  'comparison:read': 'S',
  'reference-band:list': 'S',
  'reference-band:change': 'O',
  'exercise:list': 'S',
  'exercise:create': 'S',
  'exercise:read': 'S',
  'exercise:update': 'S',
  'exercise:archive': 'S',
  'plan:list': 'S+A',
  'plan:create': 'S',
  'plan:read': 'S+A',
  'plan:read-notes': 'S',
  'plan:update': 'S',
  'plan:delete': 'S',
  'plan:transition': 'S',
  'plan:set-pain-rule': 'S',
  'plan:read-progress': 'S+A',
  'plan-alert:list': 'S',
  'plan-log:list': 'S+A',
  'plan-log:create': 'A',
  'plan-log:morning-check': 'A',
  'billing-settings:read': 'O',
  'billing-settings:update': 'O',
  'clinic-legal:read': 'O',
  'clinic-legal:update': 'O',
  'price:list': 'O',
  'price:create': 'O',
  'price:update': 'O',
  'price:archive': 'O',
  'invoice:list': 'O+A',
  'invoice:create': 'O',
  'invoice:read': 'O+A',
  'invoice:update': 'O',
  'invoice:delete': 'O',
  'invoice:issue': 'O',
  'invoice:cancel': 'O',
  'invoice:record-payment': 'O',
  'invoice:refund': 'O',
  'invoice:pay': 'A',
  'invoice:read-receipt': 'O+A',
  'still:create': 'S',
  'still:list': 'S+A',
  'still:read': 'S+A',
  'still:update': 'S',
  'still:publish': 'S',
  'still:delete': 'S',
  'summary:create': 'S',
  'summary:list': 'S+A',
  'summary:read': 'S+A',
  'summary:publish': 'S',
  'summary:delete': 'S',
  'annotated-clip:create': 'S',
  'annotated-clip:list': 'S+A',
  'annotated-clip:read': 'S+A',
  'annotated-clip:publish': 'S',
  'annotated-clip:delete': 'S',
  'portal-shared:list': 'A',
  'demo:list': 'S+A',
  'demo:read': 'S+A',
  'demo:create': 'S',
  'demo:update': 'S',
  'demo:delete': 'S',
  'clinic-brand:read': 'S+A',
  'clinic-logo:update': 'O',
  'athlete-data:read': 'O',
  'data-export:list': 'O+A',
  'data-export:create': 'O+A',
  'data-export:download': 'O+A',
  'athlete:erase': 'O',
  'clip:erase-all': 'O',
  'retention:read': 'O',
  'retention:update': 'O',
  'retention:review': 'O',
  'retention:confirm': 'O',
};

const documentedRoles = (who: Who): Role[] =>
  ({ S: ['owner', 'coach'], O: ['owner'], 'S+A': ['owner', 'coach', 'athlete'], 'O+A': ['owner', 'athlete'], A: ['athlete'] })[
    who
  ] as Role[];

// ─── Callers and targets ──────────────────────────────────────────────────────────────────
const CLINIC = 1;
const OTHER_CLINIC = 2;
const ATHLETE_USER = 11;
type Caller =
  | 'anonymous'
  | 'deactivated coach'
  | 'owner'
  | 'coach'
  | 'athlete (self)'
  | 'athlete (another of the clinic)'
  | "other clinic's owner"
  | "other clinic's coach"
  | "other clinic's athlete";
const CALLERS: Record<Caller, Actor | null> = {
  anonymous: null,
  'deactivated coach': { id: 12, role: 'coach', clinicId: CLINIC, active: false },
  owner: { id: 13, role: 'owner', clinicId: CLINIC },
  coach: { id: 14, role: 'coach', clinicId: CLINIC },
  'athlete (self)': { id: ATHLETE_USER, role: 'athlete', clinicId: CLINIC },
  'athlete (another of the clinic)': { id: 15, role: 'athlete', clinicId: CLINIC },
  "other clinic's owner": { id: 21, role: 'owner', clinicId: OTHER_CLINIC },
  "other clinic's coach": { id: 22, role: 'coach', clinicId: OTHER_CLINIC },
  "other clinic's athlete": { id: 23, role: 'athlete', clinicId: OTHER_CLINIC },
};

type TargetKind = 'the athlete (self)' | 'an athlete without account' | 'the clinic (no athlete)' | "another clinic's athlete";
const TARGETS: Record<TargetKind, Target> = {
  'the athlete (self)': { clinicId: CLINIC, athleteUserId: ATHLETE_USER },
  'an athlete without account': { clinicId: CLINIC, athleteUserId: null },
  'the clinic (no athlete)': { clinicId: CLINIC },
  // The other clinic's athlete with an account whose user id is the same number as ours: ids alone never cross clinics.
  "another clinic's athlete": { clinicId: OTHER_CLINIC, athleteUserId: ATHLETE_USER },
};
/** A state every condition of the table accepts (published, not a draft, unmarked, the caller's upload, names only). */
const HAPPY = (actor: Actor | null) => ({
  published: true,
  draft: false,
  marked: false,
  uploadedBy: actor?.id ?? -1,
  fields: ['firstName'],
});

/** The API's rules, from DEVELOPERS.md: 401 signed out (a deactivated account is), 403 wrong role, 404 outside one's clinic or own records. */
function documentedStatus(action: Action, caller: Caller, target: TargetKind): number {
  const actor = CALLERS[caller];
  if (!actor || actor.active === false) return 401;
  if (!documentedRoles(DOCUMENTED[action]).includes(actor.role)) return 403;
  const t = TARGETS[target];
  if (t.clinicId !== actor.clinicId) return 404;
  if (actor.role === 'athlete' && t.athleteUserId !== actor.id) return 404;
  return 200;
}

const statusOf = (d: ReturnType<typeof decide>) => (d.allowed ? 200 : d.status);

describe('access table', () => {
  it('names every action the API reference lists, and no other', () => {
    expect([...ACTIONS].sort()).toEqual(Object.keys(DOCUMENTED).sort());
  });

  it.each(ACTIONS)("%s: the roles are the API reference's, staff reach their clinic and an athlete only their own", (action) => {
    expect(rolesFor(action)).toEqual(ROLES.filter((r) => documentedRoles(DOCUMENTED[action]).includes(r)));
    for (const role of rolesFor(action)) {
      const grant = ACCESS_TABLE[action][role as keyof (typeof ACCESS_TABLE)[typeof action]] as { scope: string };
      expect(grant.scope).toBe(role === 'athlete' ? 'self' : 'clinic');
    }
  });
});

describe('decide: every action × caller × target (state that meets every condition)', () => {
  for (const action of ACTIONS) {
    it(`${action}`, () => {
      for (const caller of Object.keys(CALLERS) as Caller[]) {
        for (const target of Object.keys(TARGETS) as TargetKind[]) {
          const actor = CALLERS[caller];
          const got = statusOf(decide(actor, action, { ...TARGETS[target], ...HAPPY(actor) }));
          expect(got, `${action} by ${caller} on ${target}`).toBe(documentedStatus(action, caller, target));
        }
      }
    });
  }
});

describe('decide: the tricky callers and targets', () => {
  it("an athlete without an account is nobody's own: every athlete caller gets 404, staff of the clinic get through", () => {
    const target = { ...TARGETS['an athlete without account'], ...HAPPY(null) };
    for (const action of ACTIONS.filter((a) => rolesFor(a).includes('athlete') && !isListAction(a))) {
      for (const caller of ['athlete (self)', 'athlete (another of the clinic)', "other clinic's athlete"] as Caller[]) {
        expect(statusOf(decide(CALLERS[caller], action, target)), `${action} by ${caller}`).toBe(404);
      }
    }
    expect(decide(CALLERS.coach, 'athlete:read', target).allowed).toBe(true);
    expect(decide(CALLERS.owner, 'invoice:read', target).allowed).toBe(true);
  });

  it('a deactivated coach counts as signed out (401) for every action, even those coaches may do', () => {
    for (const action of ACTIONS) {
      expect(decideRole(CALLERS['deactivated coach'], action)).toMatchObject({ allowed: false, status: 401 });
      expect(decide(CALLERS['deactivated coach'], action, TARGETS['the clinic (no athlete)'])).toMatchObject({
        allowed: false,
        status: 401,
      });
    }
    expect(may(CALLERS['deactivated coach'], 'plan:read-notes')).toBe(false);
  });

  it("another clinic's owner: 404 for this clinic's records of every owner action, yet their own clinic's lists and new records are theirs", () => {
    const otherOwner = CALLERS["other clinic's owner"];
    for (const action of ACTIONS.filter((a) => rolesFor(a).includes('owner'))) {
      expect(statusOf(decide(otherOwner, action, { clinicId: CLINIC, ...HAPPY(otherOwner) })), action).toBe(404);
      expect(statusOf(decide(otherOwner, action, { clinicId: OTHER_CLINIC, ...HAPPY(otherOwner) })), action).toBe(200);
    }
    // Coach-less billing: the other clinic's coach is refused by role first (403), not by clinic.
    expect(statusOf(decide(CALLERS["other clinic's coach"], 'invoice:read', { clinicId: CLINIC, draft: false }))).toBe(403);
  });

  it("the role is judged before the clinic: a wrong role answers 403 even for another clinic's record", () => {
    expect(decide(CALLERS['athlete (self)'], 'annotation:write', TARGETS["another clinic's athlete"])).toMatchObject({
      status: 403,
      code: 'forbidden',
    });
    expect(decide(CALLERS.coach, 'price:update', TARGETS["another clinic's athlete"])).toMatchObject({ status: 403 });
  });
});

describe('decide: state conditions', () => {
  const self = CALLERS['athlete (self)']!;
  const coach = CALLERS.coach!;
  const own = TARGETS['the athlete (self)'];
  const cases: { name: string; actor: Actor; action: Action; state: Partial<Target>; status: number; code?: string }[] = [
    {
      name: 'an unpublished still does not exist for the athlete',
      actor: self,
      action: 'still:read',
      state: { published: false },
      status: 404,
    },
    { name: "a published still is the athlete's to read", actor: self, action: 'still:read', state: { published: true }, status: 200 },
    { name: 'staff read unpublished stills', actor: coach, action: 'still:read', state: { published: false }, status: 200 },
    {
      name: 'an unpublished summary does not exist for the athlete',
      actor: self,
      action: 'summary:read',
      state: { published: false },
      status: 404,
    },
    { name: 'a draft plan does not exist for the athlete', actor: self, action: 'plan:read', state: { draft: true }, status: 404 },
    {
      name: 'the athlete logs only on a plan that is not a draft',
      actor: self,
      action: 'plan-log:create',
      state: { draft: true },
      status: 404,
    },
    { name: 'staff read draft plans', actor: coach, action: 'plan:read', state: { draft: true }, status: 200 },
    { name: 'a draft invoice does not exist for the athlete', actor: self, action: 'invoice:read', state: { draft: true }, status: 404 },
    { name: 'nor can it be paid', actor: self, action: 'invoice:pay', state: { draft: true }, status: 404 },
    { name: "an issued invoice is the athlete's to pay", actor: self, action: 'invoice:pay', state: { draft: false }, status: 200 },
    {
      name: "a marked clip's settings are locked for the athlete (409, the state not the role)",
      actor: self,
      action: 'clip:update-settings',
      state: { marked: true },
      status: 409,
      code: 'clip_marked',
    },
    {
      name: "an unmarked clip's settings are the athlete's",
      actor: self,
      action: 'clip:update-settings',
      state: { marked: false },
      status: 200,
    },
    { name: "staff change a marked clip's settings", actor: coach, action: 'clip:update-settings', state: { marked: true }, status: 200 },
    { name: 'the athlete deletes their own upload', actor: self, action: 'clip:delete', state: { uploadedBy: self.id }, status: 200 },
    {
      name: 'but not one the coach uploaded (403)',
      actor: self,
      action: 'clip:delete',
      state: { uploadedBy: coach.id },
      status: 403,
      code: 'forbidden',
    },
    { name: 'staff delete any clip of the clinic', actor: coach, action: 'clip:delete', state: { uploadedBy: self.id }, status: 200 },
    {
      name: 'the athlete changes their name',
      actor: self,
      action: 'athlete:update',
      state: { fields: ['firstName', 'lastName'] },
      status: 200,
    },
    {
      name: "but not the clinic's fields (403)",
      actor: self,
      action: 'athlete:update',
      state: { fields: ['firstName', 'notes'] },
      status: 403,
    },
    { name: 'staff change any field', actor: coach, action: 'athlete:update', state: { fields: ['notes', 'coachId'] }, status: 200 },
    // A state the caller forgot to give never lets the athlete through.
    { name: "a still of unknown publication is not the athlete's", actor: self, action: 'still:read', state: {}, status: 404 },
    { name: 'a clip of unknown marking is locked for the athlete', actor: self, action: 'clip:update-settings', state: {}, status: 409 },
    { name: 'a change without its fields is refused for the athlete', actor: self, action: 'athlete:update', state: {}, status: 403 },
  ];
  it.each(cases)('$name', ({ actor, action, state, status, code }) => {
    const d = decide(actor, action, { ...own, ...state });
    expect(statusOf(d)).toBe(status);
    if (code) expect(d).toMatchObject({ code });
  });

  it('the 403 for fields names the fields the athlete may not change', () => {
    expect(decide(self, 'athlete:update', { ...own, fields: ['firstName', 'notes', 'coachId'] })).toMatchObject({
      status: 403,
      message: 'You can change only your name here (not notes, coachId).',
    });
  });

  it('the refusals an athlete meets say why, in words for them', () => {
    expect(decide(self, 'athlete:update', { ...own })).toMatchObject({
      status: 403,
      code: 'forbidden',
      message: 'You can change only your name here.',
    });
    const locked = decide(self, 'clip:update-settings', { ...own, marked: true });
    expect(locked).toMatchObject({ status: 409, message: expect.stringContaining('already marked this clip') });
    expect(locked).toMatchObject({ message: expect.stringContaining('Ask your clinician') });
    expect(decide(self, 'clip:delete', { ...own, uploadedBy: coach.id })).toMatchObject({
      status: 403,
      message: 'You can delete only clips you uploaded.',
    });
  });

  it("a list's conditions say what it shows, they never refuse", () => {
    const d = decideState(self, 'still:list', { scope: 'self', when: ['published'] }, {});
    expect(d.allowed).toBe(true);
    expect(decideRole(self, 'still:list')).toMatchObject({ allowed: true, grant: { scope: 'self', when: ['published'] } });
    expect(decideRole(coach, 'still:list')).toMatchObject({ allowed: true, grant: { scope: 'clinic', when: [] } });
    expect(decideRole(self, 'invoice:list')).toMatchObject({ grant: { scope: 'self', when: ['not-draft'] } });
    expect(decideRole(coach, 'invoice:list')).toMatchObject({ allowed: false, status: 403 });
  });
});

describe('permit: the route guard', () => {
  const run = (user: Actor | undefined) => {
    let passed = false;
    permit('still:create')({ user } as never, {} as never, () => {
      passed = true;
    });
    return passed;
  };
  it('names its action for the access walk', () => {
    expect(permit('invoice:pay').action).toBe('invoice:pay');
  });
  it('answers 401 signed out, 403 for a role the table does not name, and lets the others on', () => {
    expect(() => run(undefined)).toThrow(UnauthorizedError);
    expect(() => run(CALLERS['athlete (self)']!)).toThrow(ForbiddenError);
    expect(run(CALLERS.coach!)).toBe(true);
    expect(run(CALLERS.owner!)).toBe(true);
  });
});
