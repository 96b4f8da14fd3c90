import type { NextFunction, Request, RequestHandler, Response, Router } from 'express';

/** The first segment of a route's path (`/athletes/:id` → `athletes`), or null when it is a parameter, a pattern or not a string. */
export function firstSegment(path: unknown): string | null {
  if (typeof path !== 'string') return null;
  const segment = /^\/([^/]*)/.exec(path)?.[1];
  return segment && /^[A-Za-z0-9_.~-]+$/.test(segment) ? segment : null;
}

/** What the index needs of a router: its layers, each with its route's path when it is a route. */
interface RouterLike {
  (req: Request, res: Response, next: NextFunction): void;
  stack: { route?: { path?: unknown } }[];
}

/**
 * The feature routers as one middleware that hands a request only to the routers with a route
 * under its first path segment (`/athletes…` → the routers that declare `/athletes…`), in the order
 * given, instead of walking every router's every route. A router with a middleware of its own
 * (`router.use`) or a route whose first segment is a parameter or a pattern sees every request, as
 * when mounted directly; so does every router when the index finds nothing for a segment. The
 * index is built at the first request, once every route is declared. Like a Router, it lists what
 * it mounts in `stack` (one layer per router), so code that walks the mounted routes finds them.
 */
export function routesByPrefix(routers: Router[]): RequestHandler {
  const all = routers as unknown as RouterLike[];
  let index: Map<string, RouterLike[]> | null = null;
  let everywhere: RouterLike[] = all;
  const build = (): Map<string, RouterLike[]> => {
    const segmentsOf = all.map((router) => {
      const segments = new Set<string>();
      for (const layer of router.stack) {
        const segment = layer.route ? firstSegment(layer.route.path) : null;
        if (segment === null) return null;
        // Express matches paths without regard to case, and so does the index.
        segments.add(segment.toLowerCase());
      }
      return segments;
    });
    everywhere = all.filter((_, i) => segmentsOf[i] === null);
    const bySegment = new Map<string, RouterLike[]>();
    for (const segments of segmentsOf) for (const s of segments ?? []) bySegment.set(s, []);
    for (const [segment, list] of bySegment) {
      all.forEach((router, i) => {
        if (segmentsOf[i] === null || segmentsOf[i]!.has(segment)) list.push(router);
      });
    }
    return bySegment;
  };
  const dispatch = (req: Request, res: Response, next: NextFunction): void => {
    index ??= build();
    const path = req.path;
    const end = path.indexOf('/', 1);
    const list = index.get(path.slice(1, end === -1 ? undefined : end).toLowerCase()) ?? everywhere;
    let at = 0;
    const step = (err?: unknown): void => {
      // A router left with next('router') hands on like one that had no route for the request.
      if (err && err !== 'router' && err !== 'route') return next(err);
      const router = list[at++];
      if (!router) return next();
      router(req, res, step);
    };
    step();
  };
  // Its routers as layers, as a Router lists what it mounts: what walks the mounted routes still finds them.
  return Object.assign(dispatch, { stack: all.map((router) => ({ handle: router })) });
}
