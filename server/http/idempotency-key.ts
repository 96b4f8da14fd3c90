import type { Request } from 'express';
import { z } from 'zod';
import { parse } from './validate';

/** The `Idempotency-Key` header of a create or an act: letters, digits, `-` and `_` (a UUID fits). */
export const IdempotencyKey = z
  .string()
  .regex(/^[A-Za-z0-9_-]{8,64}$/, 'Idempotency-Key: 8 to 64 letters, digits, - or _.')
  .optional();

/** The request's `Idempotency-Key`, undefined without one; 422 when malformed. */
export function idempotencyKey(req: Request): string | undefined {
  return parse(IdempotencyKey, req.get('idempotency-key'), 'Header');
}
