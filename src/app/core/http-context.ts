import { HttpContext, HttpContextToken } from '@angular/common/http';

/**
 * Opts a request out of the global error snackbar.
 *
 * `true` skips the snackbar for every error status; an array skips only those statuses (for
 * example `[422]` when a form shows validation errors inline). A 401 still leads to the sign-in
 * page either way, except for the requests that probe the session.
 */
export const SKIP_ERROR_SNACKBAR = new HttpContextToken<boolean | readonly number[]>(() => false);

/** Builds an `HttpContext` that skips the error snackbar for all errors, or only for `statuses`. */
export function skipErrorSnackbar(...statuses: number[]): HttpContext {
  return new HttpContext().set(SKIP_ERROR_SNACKBAR, statuses.length ? statuses : true);
}

/** Whether the snackbar should stay quiet for `status` given the token's value. */
export function isSnackbarSkipped(value: boolean | readonly number[], status: number): boolean {
  return value === true || (Array.isArray(value) && value.includes(status));
}
