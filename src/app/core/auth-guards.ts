import { inject } from '@angular/core';
import { CanActivateFn, CanMatchFn, Router, UrlSegment, UrlTree } from '@angular/router';
import type { Role } from '../../contracts/api';
import { AuthStore } from './auth-store';

/** A guard that works both as `canMatch` and `canActivate`. */
export type AccessGuard = CanMatchFn & CanActivateFn;

/** The URL being navigated to, for `returnUrl`; falls back to the matched segments. */
function targetUrl(router: Router, segments?: unknown): string {
  const navigation = router.currentNavigation();
  if (navigation) return router.serializeUrl(navigation.extractedUrl);
  if (Array.isArray(segments) && segments.every((s) => s instanceof UrlSegment)) {
    return '/' + segments.map((s: UrlSegment) => s.path).join('/');
  }
  return router.url;
}

function signInTree(router: Router, returnUrl: string): UrlTree {
  const keep = returnUrl && returnUrl !== '/' && !returnUrl.startsWith('/sign-in');
  return router.createUrlTree(['/sign-in'], keep ? { queryParams: { returnUrl } } : {});
}

/** Lets signed-in users through; sends everyone else to `/sign-in?returnUrl=…`. */
export const signedInGuard: AccessGuard = (_route: unknown, segments: unknown) => {
  const auth = inject(AuthStore);
  const router = inject(Router);
  return auth.isSignedIn() ? true : signInTree(router, targetUrl(router, segments));
};

/**
 * Lets users with one of `roles` through. Signed-out users go to sign-in; signed-in users with
 * another role go to their own home page rather than an error.
 */
export function roleGuard(...roles: Role[]): AccessGuard {
  return (_route: unknown, segments: unknown) => {
    const auth = inject(AuthStore);
    const router = inject(Router);
    const role = auth.role();
    if (role === null) return signInTree(router, targetUrl(router, segments));
    return roles.includes(role) ? true : router.parseUrl(auth.homePath());
  };
}

/** For the sign-in page: signed-in users are sent to their home page. */
export const anonymousOnlyGuard: AccessGuard = () => {
  const auth = inject(AuthStore);
  const router = inject(Router);
  // Signing out navigates here first (so unsaved-edit guards can ask), then signs out.
  if (router.currentNavigation()?.extras.state?.[SIGNING_OUT]) return true;
  return auth.isSignedIn() ? router.parseUrl(auth.homePath()) : true;
};

/** Navigation state key the shell sets while signing out. */
export const SIGNING_OUT = 'signingOut';

/** `redirectTo` for `/`: athletes to `/portal`, staff to `/athletes`. */
export function redirectHome(): string {
  return inject(AuthStore).homePath();
}
