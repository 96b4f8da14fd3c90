import { NavigationError } from '@angular/router';
import { isStaleChunkError, reloadOnStaleBuild } from './stale-build';

function fakeWindow() {
  const store = new Map<string, string>();
  const assigned: string[] = [];
  return {
    assigned,
    location: { assign: (url: string) => assigned.push(url) } as unknown as Location,
    sessionStorage: {
      getItem: (k: string) => store.get(k) ?? null,
      setItem: (k: string, v: string) => void store.set(k, v),
    } as unknown as Storage,
  };
}

describe('isStaleChunkError', () => {
  it('recognises the browsers’ words for a missing lazy chunk, and nothing else', () => {
    expect(isStaleChunkError(new TypeError('Failed to fetch dynamically imported module: http://x/chunk-AB12.js'))).toBe(true);
    expect(isStaleChunkError(new Error('error loading dynamically imported module'))).toBe(true);
    expect(isStaleChunkError(new TypeError('Importing a module script failed.'))).toBe(true);
    expect(isStaleChunkError(new Error('Cannot match any routes'))).toBe(false);
    expect(isStaleChunkError(undefined)).toBe(false);
  });
});

describe('reloadOnStaleBuild', () => {
  it('loads the wanted address from the server once, then lets the error show', () => {
    const win = fakeWindow();
    const stale = new NavigationError(1, '/athletes/4', new TypeError('Failed to fetch dynamically imported module'));
    expect(reloadOnStaleBuild(stale, win)).toBe(true);
    expect(win.assigned).toEqual(['/athletes/4']);
    expect(reloadOnStaleBuild(stale, win)).toBe(false);
    expect(win.assigned).toEqual(['/athletes/4']);
  });

  it('leaves other navigation errors alone', () => {
    const win = fakeWindow();
    expect(reloadOnStaleBuild(new NavigationError(2, '/x', new Error('boom')), win)).toBe(false);
    expect(win.assigned).toEqual([]);
  });
});
