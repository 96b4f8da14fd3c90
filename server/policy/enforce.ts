/**
 * The policy at work: route guards (`permit`) and the checks services make, turning the pure
 * decisions of `decide.ts` into the typed errors of `server/errors.ts` (401, 403, 404 naming the
 * resource, 409 with its code). Services never test roles themselves; they name an action.
 */
import type { RequestHandler } from 'express';
import type { SessionUser } from '../../src/contracts/api';
import { AppError, ConflictError, ForbiddenError, NotFoundError, UnauthorizedError } from '../errors';
import type { Action, Grant, ListAction } from './access-table';
import { decide, decideRole, decideScope, decideState, type Decision, type Owner, type ResourceState, type Target } from './decide';

/** A route guard that names its action; the access walk reads `action` off each mounted route. */
export type PermitGuard = RequestHandler & { readonly action: Action };

/** The typed error of a refusal; a 404 names what was not found ("Clip not found."). */
function refusalError(d: Exclude<Decision, { allowed: true }>, what: string): AppError {
  switch (d.status) {
    case 401:
      return new UnauthorizedError();
    case 403:
      return new ForbiddenError(d.message, d.code);
    case 404:
      return new NotFoundError(what);
    case 409:
      return new ConflictError(d.message, d.code);
  }
}

function granted(d: Decision, what: string): Grant {
  if (!d.allowed) throw refusalError(d, what);
  return d.grant;
}

/**
 * Route guard: 401 when signed out, 403 when the caller's role may not do `action` at all. The
 * service then checks scope and state with the same action.
 */
export function permit(action: Action): PermitGuard {
  const guard: RequestHandler = (req, _res, next) => {
    granted(decideRole(req.user ?? null, action), 'Resource');
    next();
  };
  return Object.assign(guard, { action });
}

/** 401/403 unless the user's role may do the action; answers the role's grant. */
export function assertRole(user: SessionUser, action: Action): Grant {
  return granted(decideRole(user, action), 'Resource');
}

/** Role and scope against a resource's owner (another clinic's or athlete's answers 404 naming `what`). */
export function assertScope(user: SessionUser, action: Action, owner: Owner, what: string): Grant {
  return granted(decideScope(user, action, owner), what);
}

/** The grant's conditions against the resource's state (e.g. a marked clip answers 409 `clip_marked`). */
export function assertState(user: SessionUser, action: Action, state: ResourceState, what: string): Grant {
  return granted(decideState(user, action, assertRole(user, action), state), what);
}

/** The whole check of one resource: role, scope, then conditions. */
export function assertAllowed(user: SessionUser, action: Action, target: Target, what: string): Grant {
  return granted(decide(user, action, target), what);
}

/**
 * What a list shows this user: 403 when the role may not list; otherwise the grant, whose scope
 * (`self`: only their own) and conditions (e.g. `published`) the caller's query applies.
 */
export function listGrant(user: SessionUser, action: ListAction): Grant {
  return assertRole(user, action);
}

/** Whether the user reaches the action's resources through an athlete's own (`self`) grant, e.g. to audit their views. */
export function throughSelfGrant(user: SessionUser, action: Action): boolean {
  return assertRole(user, action).scope === 'self';
}

/** Whether the user's role may do the action at all (e.g. whether coach notes are shown). */
export { may } from './decide';
