import type { Express } from 'express';

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
