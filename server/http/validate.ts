import { z } from 'zod';
import { fromZod, NotFoundError } from '../errors';

/** Parses `value` with `schema`, throwing our 422 (with per-field details) when it does not fit. */
export function parse<S extends z.ZodType>(schema: S, value: unknown, where = 'Request body'): z.output<S> {
  const result = schema.safeParse(value);
  if (!result.success) throw fromZod(result.error, where);
  return result.data;
}

/**
 * A route's positive integer id, written the one way ids are written (digits, no sign, no leading
 * zero, no spaces, no hex or exponent): anything else is "not found", so one resource answers at
 * one URL only.
 */
export const RouteId = z
  .union([
    z
      .string()
      .regex(/^[1-9][0-9]*$/)
      .transform(Number),
    z.number().int(),
  ])
  .pipe(z.number().positive().max(Number.MAX_SAFE_INTEGER));

/** Route parameter that must be an id ({@link RouteId}). */
export const IdParam = z.object({ id: RouteId });

/** A 0-based number in a route (a frame, a thumbnail), written the one way: `0`, or digits without a leading zero. */
export const RouteIndex = (max: number) =>
  z
    .union([
      z
        .string()
        .regex(/^(0|[1-9][0-9]*)$/)
        .transform(Number),
      z.number().int(),
    ])
    .pipe(z.number().min(0).max(max));

/** Route parameter holding an e-mailed token (base64url). */
export const TokenParam = z.object({ token: z.string().regex(/^[A-Za-z0-9_-]{20,100}$/) });

/** The `:token` route parameter, or "not found" (404) when it cannot be a token (a link cut short or mistyped is an unknown link). */
export function tokenParam(params: unknown, what: string): string {
  const r = TokenParam.safeParse(params);
  if (!r.success) throw new NotFoundError(what);
  return r.data.token;
}

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
