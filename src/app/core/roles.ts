import type { Role } from '../../contracts/api';

/** How each role is named on screen. */
export const ROLE_LABELS: Record<Role, string> = {
  owner: 'Clinic owner',
  coach: 'Coach',
  athlete: 'Athlete',
};

/** Where a role lands after signing in or when opening `/`. */
export function homePathFor(role: Role | null): string {
  switch (role) {
    case 'athlete':
      return '/portal';
    case 'owner':
    case 'coach':
      return '/athletes';
    default:
      return '/sign-in';
  }
}

/**
 * A `returnUrl` is only followed when it is a path inside this app: it must start with a single
 * `/` and must not lead back to the sign-in page. Anything else yields `fallback`.
 */
export function safeReturnUrl(url: string | null | undefined, fallback: string): string {
  if (!url || !url.startsWith('/') || url.startsWith('//') || url.startsWith('/\\')) return fallback;
  if (url === '/sign-in' || url.startsWith('/sign-in?') || url.startsWith('/sign-in/')) return fallback;
  return url;
}
