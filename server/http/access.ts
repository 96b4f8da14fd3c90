import type { Request, RequestHandler } from 'express';
import type { Role, SessionUser } from '../../src/contracts/api';
import { ForbiddenError, UnauthorizedError } from '../errors';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // passport puts the deserialised user here.
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends SessionUser {}
  }
}

/** Answers 401 unless someone is signed in. */
export const requireSignedIn: RequestHandler = (req, _res, next) => {
  if (!req.user) throw new UnauthorizedError();
  next();
};

/** Answers 401 when signed out, 403 when signed in with another role. */
export function requireRole(...roles: Role[]): RequestHandler {
  return (req, _res, next) => {
    if (!req.user) throw new UnauthorizedError();
    if (!roles.includes(req.user.role)) throw new ForbiddenError();
    next();
  };
}

/** The signed-in user of a request that passed {@link requireSignedIn} or {@link requireRole}. */
export function currentUser(req: Request): SessionUser {
  if (!req.user) throw new UnauthorizedError();
  return req.user;
}

/** Whether the user is clinic staff (owner or coach). */
export function isStaff(user: SessionUser): boolean {
  return user.role === 'owner' || user.role === 'coach';
}
