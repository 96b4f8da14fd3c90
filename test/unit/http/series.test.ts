/**
 * `series()` (server/http/series.ts): middlewares as one layer behave as the same middlewares
 * mounted one by one on a Router — order, errors, thrown and rejected errors, next('route') and
 * next('router') — checked on two apps side by side.
 */
import type { RequestHandler } from 'express';
import express from 'express';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { series } from '../../../server/http/series';

type Step = 'next' | 'route' | 'router' | 'error' | 'throw' | 'reject' | 'answer';

/** A middleware that notes its name and then does `step`. */
const mw =
  (name: string, step: Step): RequestHandler =>
  async (req, res, next) => {
    (res.locals['seen'] ??= []).push(name);
    if (step === 'next') return next();
    if (step === 'route') return next('route');
    if (step === 'router') return next('router');
    if (step === 'error') return next(new Error(`${name} failed`));
    if (step === 'throw') throw new Error(`${name} threw`);
    if (step === 'reject') return Promise.reject(new Error(`${name} rejected`)).then(() => undefined);
    res.json({ seen: res.locals['seen'], by: name });
  };

/** The app with `handlers` in one series, or each mounted on the router (`apart`). */
function app(handlers: RequestHandler[], apart: boolean) {
  const a = express();
  const r = express.Router();
  if (apart) handlers.forEach((h) => r.use(h));
  else r.use(series(handlers));
  r.get('/x', (_req, res) => void res.json({ seen: res.locals['seen'], by: 'route' }));
  a.use(r);
  a.use((_req, res) => void res.status(404).json({ seen: res.locals['seen'], by: 'after router' }));
  a.use(
    ((err, _req, res, _next) =>
      void res.status(500).json({ seen: res.locals['seen'], error: (err as Error).message })) as express.ErrorRequestHandler,
  );
  return a;
}

async function both(steps: Step[]) {
  const handlers = steps.map((s, i) => mw(`m${i}`, s));
  const [one, apart] = await Promise.all([request(app(handlers, false)).get('/x'), request(app(handlers, true)).get('/x')]);
  expect({ status: one.status, body: one.body }).toEqual({ status: apart.status, body: apart.body });
  return one;
}

describe('series', () => {
  it('runs in order and hands on to the route', async () => {
    expect((await both(['next', 'next', 'next'])).body).toEqual({ seen: ['m0', 'm1', 'm2'], by: 'route' });
  });
  it('stops where a middleware answers', async () => {
    expect((await both(['next', 'answer', 'next'])).body).toEqual({ seen: ['m0', 'm1'], by: 'm1' });
  });
  it('passes errors, thrown errors and rejections out, skipping the rest', async () => {
    for (const step of ['error', 'throw', 'reject'] as const) expect((await both(['next', step, 'next'])).status).toBe(500);
  });
  it("treats next('route') as going on and next('router') as leaving the router", async () => {
    expect((await both(['route', 'next'])).body.by).toBe('route');
    expect((await both(['next', 'router', 'next'])).body).toEqual({ seen: ['m0', 'm1'], by: 'after router' });
  });
});

describe('series as a mounted layer', () => {
  it('lists its middlewares in `stack`, so a walk of the mounted routes finds a router inside', () => {
    const inner = express.Router();
    inner.post('/hook', (_req, res) => void res.end());
    const s = series([inner, mw('m', 'next')]) as RequestHandler & { stack: { handle: unknown }[] };
    expect(s.stack.map((l) => l.handle)).toEqual([inner, expect.any(Function)]);
  });
});
