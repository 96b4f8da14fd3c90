/**
 * routesByPrefix: a request reaches the same handler as when every router is mounted one after
 * another (checked against Express itself, mounting the same routers directly), while routers with
 * no route under its first segment are not walked.
 */
import express, { Router, type NextFunction, type Request, type Response } from 'express';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { firstSegment, routesByPrefix } from '../../../server/http/routes-by-prefix';

/** Three routers as the app's are written, each counting the requests it is handed. */
function routers(walked: string[]) {
  const counted = (name: string, router: Router) => {
    const outer = ((req: Request, res: Response, next: NextFunction) => {
      walked.push(name);
      router(req, res, next);
    }) as unknown as Router;
    (outer as unknown as { stack: unknown }).stack = router.stack;
    return outer;
  };
  const athletes = Router();
  athletes.get('/athletes', (_req, res) => void res.json({ from: 'athletes list' }));
  athletes.get('/athletes/:id', (req, res, next) =>
    req.params['id'] === 'skip' ? next() : res.json({ from: 'athlete', id: req.params['id'] }),
  );
  const assessments = Router();
  assessments.get('/athletes/:id/assessments', (_req, res) => void res.json({ from: 'visits' }));
  assessments.get('/athletes/:id', (_req, res) => void res.json({ from: 'second athlete route' }));
  assessments.get('/assessments/:id', (_req, res) => void res.json({ from: 'assessment' }));
  const anywhere = Router();
  anywhere.get('/:kind/:id/notes', (_req, res) => void res.json({ from: 'notes' }));
  return [counted('athletes', athletes), counted('assessments', assessments), counted('anywhere', anywhere)];
}

function app(dispatch: boolean, walked: string[]) {
  const a = express();
  const list = routers(walked);
  if (dispatch) a.use(routesByPrefix(list));
  else for (const r of list) a.use(r);
  a.use((req, res) => void res.status(404).json({ from: 'not found', path: req.path }));
  return a;
}

const PATHS = [
  '/athletes',
  '/Athletes',
  '/athletes/',
  '/athletes/7',
  '/athletes/skip',
  '/athletes/7/assessments',
  '/assessments/3',
  '/plans/2/notes',
  '/athletes/2/notes',
  '/nothing',
  '/',
  '/athletes?x=1',
];

describe('routesByPrefix', () => {
  it.each(PATHS)('GET %s answers what the routers mounted one after another answer', async (path) => {
    const direct = await request(app(false, [])).get(path);
    const dispatched = await request(app(true, [])).get(path);
    expect(dispatched.status).toBe(direct.status);
    expect(dispatched.body).toEqual(direct.body);
  });

  it('hands a request only to the routers with a route under its first segment, and to those with parameter-first routes', async () => {
    const walked: string[] = [];
    await request(app(true, walked)).get('/assessments/3');
    expect(walked).toEqual(['assessments']);
    walked.length = 0;
    await request(app(true, walked)).get('/plans/2/notes');
    expect(walked).toEqual(['anywhere']);
    walked.length = 0;
    await request(app(true, walked)).get('/athletes/skip');
    expect(walked).toEqual(['athletes', 'assessments']);
  });

  it('passes errors on to the error handler', async () => {
    const r = Router();
    r.get('/boom', () => {
      throw new Error('boom');
    });
    const a = express();
    a.use(routesByPrefix([r]));
    a.use((err: Error, _req: Request, res: Response, _next: NextFunction) => void res.status(500).json({ error: err.message }));
    const res = await request(a).get('/boom');
    expect(res.status).toBe(500);
    expect(res.body).toEqual({ error: 'boom' });
  });

  it('reads a route path’s first segment', () => {
    expect(firstSegment('/athletes/:id')).toBe('athletes');
    expect(firstSegment('/auth')).toBe('auth');
    expect(firstSegment('/:kind/x')).toBeNull();
    expect(firstSegment('/')).toBeNull();
    expect(firstSegment(/^\/x/)).toBeNull();
    expect(firstSegment(['/a', '/b'])).toBeNull();
    expect(firstSegment('/a{b}')).toBeNull();
  });
});
