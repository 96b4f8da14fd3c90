import { HttpContextToken, HttpErrorResponse, HttpInterceptorFn, HttpXsrfTokenExtractor } from '@angular/common/http';
import { inject } from '@angular/core';
import { catchError, from, switchMap, throwError } from 'rxjs';
import { errorCode } from './api-error';
import { AuthStore } from './auth-store';

/** Marks a request already sent again with a fresh token (it is never retried twice). */
const CSRF_RETRIED = new HttpContextToken<boolean>(() => false);

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * A state-changing request refused with 403 `csrf_invalid` (the page's token no longer matches the
 * session: signed out or signed in again elsewhere, or a token older than the session) fetches a
 * fresh token and is sent once more with it. A session still alive then simply succeeds; one that
 * has ended answers 401, which the error interceptor turns into "Your session has ended. Sign in to
 * continue." — never the token words. The server still checks every token; this only reads a new
 * one from our own origin, and never resends when someone else has signed in on this browser
 * since the page loaded (the change would be made in their name). Registered inside `errorInterceptor`, so that sees only the last answer.
 */
export const csrfRetryInterceptor: HttpInterceptorFn = (req, next) => {
  if (SAFE_METHODS.has(req.method) || req.context.get(CSRF_RETRIED)) return next(req);
  const auth = inject(AuthStore);
  const xsrf = inject(HttpXsrfTokenExtractor);
  return next(req).pipe(
    catchError((err: unknown) => {
      if (!(err instanceof HttpErrorResponse) || err.status !== 403 || errorCode(err) !== 'csrf_invalid') return throwError(() => err);
      return from(auth.refreshCsrfForSameUser()).pipe(
        switchMap((sameUser) => {
          // Someone else signed in on this browser meanwhile: never send this page's change in their name.
          if (!sameUser) return throwError(() => err);
          const token = xsrf.getToken();
          const retry = req.clone({ context: req.context.set(CSRF_RETRIED, true) });
          return next(token ? retry.clone({ setHeaders: { 'X-XSRF-TOKEN': token } }) : retry);
        }),
      );
    }),
  );
};
