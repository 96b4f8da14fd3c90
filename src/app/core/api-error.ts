import { HttpErrorResponse } from '@angular/common/http';
import type { ApiErrorBody } from '../../contracts/api';

/** One entry of a 422 answer's `details`: where the problem is and what to say about it. */
export interface FieldProblem {
  path: readonly (string | number)[];
  message: string;
}

/**
 * Finds the `HttpErrorResponse` behind an error, including one wrapped by a signal resource
 * (which keeps the original as `cause`). Returns null for anything else.
 */
export function asHttpError(err: unknown): HttpErrorResponse | null {
  if (err instanceof HttpErrorResponse) return err;
  if (err instanceof Error && err.cause instanceof HttpErrorResponse) return err.cause;
  return null;
}

function errorBody(err: HttpErrorResponse): ApiErrorBody['error'] | null {
  const body = err.error as Partial<ApiErrorBody> | null | undefined;
  const inner = body && typeof body === 'object' ? body.error : undefined;
  return inner && typeof inner === 'object' ? inner : null;
}

/** The server's `error.code`, e.g. `token_expired`, or null. */
export function errorCode(err: unknown): string | null {
  const http = asHttpError(err);
  const code = http ? errorBody(http)?.code : undefined;
  return typeof code === 'string' ? code : null;
}

/** The server's `error.details` (e.g. the stored record sent with a 409), or null. */
export function errorDetails(err: unknown): unknown {
  const http = asHttpError(err);
  return (http ? errorBody(http)?.details : undefined) ?? null;
}

/** HTTP status of an error, or null when it is not an HTTP error. */
export function errorStatus(err: unknown): number | null {
  return asHttpError(err)?.status ?? null;
}

/** Message for people: the server's own `error.message` when it sent one, else a clear fallback. */
export function errorMessage(err: unknown): string {
  const http = asHttpError(err);
  if (!http) return 'Something went wrong. Please try again.';
  const message = errorBody(http)?.message;
  if (typeof message === 'string' && message.trim()) return message;
  switch (http.status) {
    case 0:
      return "Can't reach the server. Check your connection and try again.";
    case 401:
      return 'Please sign in to continue.';
    case 403:
      return "You don't have access to that.";
    case 404:
      return 'Not found. It may have been removed, or the link is wrong.';
    case 409:
      return 'That conflicts with something that already exists.';
    case 422:
      return 'Some fields need attention.';
    case 429:
      return 'Too many attempts. Wait a minute and try again.';
    default:
      return http.status >= 500
        ? 'The server ran into a problem. Please try again in a moment.'
        : `The request failed (status ${http.status}).`;
  }
}

/** The `details` of a 422 answer as field problems; paths given as `a.0.b` strings are split. */
export function fieldProblems(err: unknown): FieldProblem[] {
  const http = asHttpError(err);
  const details = http ? errorBody(http)?.details : undefined;
  if (!Array.isArray(details)) return [];
  const problems: FieldProblem[] = [];
  for (const item of details as unknown[]) {
    if (!item || typeof item !== 'object') continue;
    const { path, message } = item as { path?: unknown; message?: unknown };
    if (typeof message !== 'string') continue;
    let parts: (string | number)[] = [];
    if (Array.isArray(path)) {
      parts = path.filter((p): p is string | number => typeof p === 'string' || typeof p === 'number');
    } else if (typeof path === 'string' && path) {
      parts = path.split('.').map((p) => (/^\d+$/.test(p) ? Number(p) : p));
    }
    problems.push({ path: parts, message });
  }
  return problems;
}
