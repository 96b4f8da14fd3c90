import { HttpErrorResponse, HttpInterceptorFn } from '@angular/common/http';
import { inject } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router } from '@angular/router';
import { catchError, throwError } from 'rxjs';
import { errorMessage } from './api-error';
import { AuthStore } from './auth-store';
import { SKIP_ERROR_SNACKBAR, isSnackbarSkipped } from './http-context';

/** Requests whose 401 is an answer, not an ended session. */
const SESSION_PROBES = ['/api/auth/me', '/api/auth/sign-in'];

function isSessionProbe(url: string): boolean {
  const path = url.split('?')[0];
  return SESSION_PROBES.some((probe) => path === probe || path.endsWith(probe));
}

/**
 * Central HTTP error handling.
 *
 * - 401 (except from the session probes): forget the user and go to
 *   `/sign-in?returnUrl=<current url>`.
 * - anything else: a snackbar with the server's `error.message` (or a clear fallback), unless the
 *   request opted out with `SKIP_ERROR_SNACKBAR` because its page shows the error inline.
 *
 * The error is always re-thrown so callers can still react to it.
 */
export const errorInterceptor: HttpInterceptorFn = (req, next) => {
  const auth = inject(AuthStore);
  const router = inject(Router);
  const snackBar = inject(MatSnackBar);

  return next(req).pipe(
    catchError((err: unknown) => {
      if (!(err instanceof HttpErrorResponse)) return throwError(() => err);

      if (err.status === 401 && !isSessionProbe(req.url)) {
        const wasSignedIn = auth.isSignedIn();
        auth.clear();
        const current = router.url;
        if (!current.startsWith('/sign-in')) {
          const returnUrl = current && current !== '/' ? current : null;
          void router.navigate(['/sign-in'], returnUrl ? { queryParams: { returnUrl } } : {});
        }
        if (wasSignedIn) {
          snackBar.open('Your session has ended. Sign in to continue.', 'Dismiss', {
            duration: 6000,
          });
        }
      } else if (err.status !== 401 && !isSnackbarSkipped(req.context.get(SKIP_ERROR_SNACKBAR), err.status)) {
        snackBar.open(errorMessage(err), 'Dismiss', { duration: 8000 });
      }
      return throwError(() => err);
    }),
  );
};
