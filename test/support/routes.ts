import type { Express } from 'express';
import type { Action } from '../../server/policy/access-table';

/** Reads `METHOD /api/path` for every route registered under the API router of an app. */
export function listRoutes(app: Express): string[] {
  const out: string[] = [];
  type Layer = {
    route?: { path: string; methods: Record<string, boolean> };
    handle?: { stack?: Layer[] };
    name?: string;
    matchers?: unknown;
  };
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        for (const m of Object.keys(layer.route.methods)) out.push(`${m.toUpperCase()} ${prefix}${layer.route.path}`);
      } else if (layer.handle?.stack) {
        walk(layer.handle.stack, prefix);
      }
    }
  };
  const router = (app as unknown as { router: { stack: Layer[] } }).router;
  // The API router is mounted at /api; the client-app router has no API routes.
  for (const layer of router.stack) {
    if (layer.handle?.stack) walk(layer.handle.stack, '/api');
  }
  return [...new Set(out)].filter((r) => !r.includes('/api/*') && !r.includes('(?!'));
}

/**
 * The action each API route's guard names (`permit(action)` in `server/policy/enforce.ts`), by
 * `METHOD /api/path`; null for a route without one (public).
 */
export function listRouteActions(app: Express): Map<string, Action | null> {
  const out = new Map<string, Action | null>();
  type Handle = ((...args: unknown[]) => unknown) & { action?: Action; stack?: Layer[] };
  type Layer = { route?: { path: string; methods: Record<string, boolean>; stack: { handle: Handle }[] }; handle?: Handle };
  const walk = (stack: Layer[]) => {
    for (const layer of stack) {
      if (layer.route) {
        const action = layer.route.stack.map((l) => l.handle.action).find((a) => a !== undefined) ?? null;
        for (const m of Object.keys(layer.route.methods)) out.set(`${m.toUpperCase()} /api${layer.route.path}`, action);
      } else if (layer.handle?.stack) {
        walk(layer.handle.stack);
      }
    }
  };
  const router = (app as unknown as { router: { stack: Layer[] } }).router;
  for (const layer of router.stack) if (layer.handle?.stack) walk(layer.handle.stack);
  return out;
}
