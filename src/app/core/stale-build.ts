import type { NavigationError } from '@angular/router';

/**
 * Whether a navigation failed because the page still refers to code chunks of an older build that
 * the server no longer has (after an update). Chromium, Firefox and Safari word it differently.
 */
export function isStaleChunkError(error: unknown): boolean {
  const message = error instanceof Error ? error.message : String(error ?? '');
  return /Failed to fetch dynamically imported module|error loading dynamically imported module|Importing a module script failed/i.test(
    message,
  );
}

/** Session key that stops a reload loop when the chunk is missing for another reason. */
const RELOADED_KEY = 'tf.reloadedFor';

/**
 * Navigation error handler: after an update, load the page the user was going to from the
 * server (the new build) instead of failing silently — once per address, so a truly missing
 * chunk still shows the error.
 */
export function reloadOnStaleBuild(e: NavigationError, win: Pick<Window, 'location' | 'sessionStorage'> = window): boolean {
  if (!isStaleChunkError(e.error)) return false;
  if (win.sessionStorage.getItem(RELOADED_KEY) === e.url) return false;
  win.sessionStorage.setItem(RELOADED_KEY, e.url);
  win.location.assign(e.url);
  return true;
}
