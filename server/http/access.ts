import type { Request } from 'express';
import type { SessionUser } from '../../src/contracts/api';
import { UnauthorizedError } from '../errors';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // passport puts the deserialised user here.
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends SessionUser {}
  }
}

/**
 * The signed-in user of a request that passed a `permit(action)` guard (`server/policy/enforce.ts`);
 * who may do what is the policy's, not this file's.
 */
export function currentUser(req: Request): SessionUser {
  if (!req.user) throw new UnauthorizedError();
  return req.user;
}
