import type { NextFunction, Request, RequestHandler, Response } from 'express';

/**
 * Middlewares run one after another as a single one: what a router would do with each mounted at
 * the same path, without its per-layer matching. An error (or `next('router')`) leaves the series
 * for the enclosing router; `next('route')` goes on to the next middleware, as a router treats it.
 * Like a Router, it lists its middlewares in `stack`, so code that walks the mounted routes (the
 * access walk) finds the routers among them.
 */
export function series(handlers: RequestHandler[]): RequestHandler {
  const run = (req: Request, res: Response, next: NextFunction): void => {
    let at = 0;
    const step = (err?: unknown): void => {
      if (err !== undefined && err !== null && err !== 'route') return next(err);
      const handler = handlers[at++];
      if (!handler) return next();
      try {
        const ran = handler(req, res, step) as unknown;
        // An async middleware's rejection is an error, as Express 5 treats it.
        if (ran instanceof Promise) ran.catch((e: unknown) => step(e ?? new Error('a middleware rejected without a reason')));
      } catch (e) {
        step(e);
      }
    };
    step();
  };
  // Its middlewares as layers, as a Router lists what it mounts: what walks the mounted routes still finds them.
  return Object.assign(run, { stack: handlers.map((handle) => ({ handle })) });
}
