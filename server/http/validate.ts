import { z } from 'zod';
import { fromZod, NotFoundError } from '../errors';

/** Parses `value` with `schema`, throwing our 422 (with per-field details) when it does not fit. */
export function parse<S extends z.ZodType>(schema: S, value: unknown, where = 'Request body'): z.output<S> {
  const result = schema.safeParse(value);
  if (!result.success) throw fromZod(result.error, where);
  return result.data;
}

/** Route parameter that must be a positive integer id; anything else is "not found". */
export const IdParam = z.object({ id: z.coerce.number().int().positive().max(Number.MAX_SAFE_INTEGER) });

/** Route parameter holding an e-mailed token (base64url). */
export const TokenParam = z.object({ token: z.string().regex(/^[A-Za-z0-9_-]{20,100}$/) });

const PLAIN_ID = /^[1-9][0-9]{0,15}$/;

/** The `:id` route parameter, or "not found" (404) when it is not a positive integer. */
export function idParam(params: unknown, what: string): number {
  // The common form (plain digits, no leading zero) without the schema; it answers what the schema answers.
  const raw = (params as { id?: unknown } | null)?.id;
  if (typeof raw === 'string' && PLAIN_ID.test(raw)) {
    const id = Number(raw);
    if (id <= Number.MAX_SAFE_INTEGER) return id;
  }
  const r = IdParam.safeParse(params);
  if (!r.success) throw new NotFoundError(what);
  return r.data.id;
}
