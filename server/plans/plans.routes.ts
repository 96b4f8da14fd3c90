import { idempotencyKey } from '../http/idempotency-key';
import { Router } from 'express';
import { currentUser } from '../http/access';
import { permit } from '../policy/enforce';
import { NotFoundError } from '../errors';
import { idParam as id, parse } from '../http/validate';
import {
  ExerciseBody,
  ExercisePatchBody,
  ExerciseQueryParams,
  LogBody,
  MorningBody,
  PainRuleBody,
  PlanBody,
  PlanPutBody,
  PlanKeyParams,
  TransitionBody,
} from './plans-schemas';
import type { ExercisesService } from './exercises-service';
import type { PlansService } from './plans-service';

/** Exercise library, plans with stages, progress and alerts, and the athlete's log. Thin. */
export function plansRoutes({ exercises, plans }: { exercises: ExercisesService; plans: PlansService }): Router {
  const router = Router();
  // ── Exercise library (clinic staff) ──
  router.get('/exercises', permit('exercise:list'), async (req, res) => {
    const query = parse(ExerciseQueryParams, req.query, 'Query');
    res.json({ exercises: await exercises.list(currentUser(req), query) });
  });
  router.post('/exercises', permit('exercise:create'), async (req, res) => {
    res.status(201).json(await exercises.create(currentUser(req), parse(ExerciseBody, req.body), idempotencyKey(req)));
  });
  router.get('/exercises/:id', permit('exercise:read'), async (req, res) => {
    res.json(await exercises.get(currentUser(req), id(req.params, 'Exercise')));
  });
  router.patch('/exercises/:id', permit('exercise:update'), async (req, res) => {
    const exerciseId = id(req.params, 'Exercise');
    res.json(await exercises.update(currentUser(req), exerciseId, parse(ExercisePatchBody, req.body)));
  });
  router.delete('/exercises/:id', permit('exercise:archive'), async (req, res) => {
    await exercises.archive(currentUser(req), id(req.params, 'Exercise'));
    res.status(204).end();
  });

  // ── Plans ──
  router.get('/athletes/:id/plans', permit('plan:list'), async (req, res) => {
    res.json({ plans: await plans.list(currentUser(req), id(req.params, 'Athlete')) });
  });
  router.post('/athletes/:id/plans', permit('plan:create'), async (req, res) => {
    const athleteId = id(req.params, 'Athlete');
    res.status(201).json(await plans.create(currentUser(req), athleteId, parse(PlanBody, req.body), idempotencyKey(req)));
  });
  router.get('/plans/:id', permit('plan:read'), async (req, res) => {
    res.json(await plans.get(currentUser(req), id(req.params, 'Plan')));
  });
  router.put('/plans/:id', permit('plan:update'), async (req, res) => {
    const planId = id(req.params, 'Plan');
    res.json(await plans.replace(currentUser(req), planId, parse(PlanPutBody, req.body)));
  });
  router.delete('/plans/:id', permit('plan:delete'), async (req, res) => {
    await plans.remove(currentUser(req), id(req.params, 'Plan'));
    res.status(204).end();
  });
  router.post('/plans/:id/transitions', permit('plan:transition'), async (req, res) => {
    const planId = id(req.params, 'Plan');
    res.json(await plans.transition(currentUser(req), planId, parse(TransitionBody, req.body).action));
  });
  router.put('/plans/:id/pain-rule', permit('plan:set-pain-rule'), async (req, res) => {
    const planId = id(req.params, 'Plan');
    res.json(await plans.putRule(currentUser(req), planId, parse(PainRuleBody, req.body)));
  });
  router.get('/plans/:id/progress', permit('plan:read-progress'), async (req, res) => {
    res.json(await plans.progress(currentUser(req), id(req.params, 'Plan')));
  });
  router.get('/plan-alerts', permit('plan-alert:list'), async (req, res) => {
    res.json({ alerts: await plans.clinicAlerts(currentUser(req)) });
  });

  // ── The athlete's log ──
  router.get('/plans/:id/logs', permit('plan-log:list'), async (req, res) => {
    res.json({ logs: await plans.logs(currentUser(req), id(req.params, 'Plan')) });
  });
  router.post('/plans/:id/logs', permit('plan-log:create'), async (req, res) => {
    const planId = id(req.params, 'Plan');
    const body = parse(LogBody, req.body);
    const { entry, created } = await plans.addLog(currentUser(req), planId, body);
    res.status(created ? 201 : 200).json(entry);
  });
  router.put('/plans/:id/logs/:key/morning', permit('plan-log:morning-check'), async (req, res) => {
    const p = PlanKeyParams.safeParse(req.params);
    if (!p.success) throw new NotFoundError('Log entry');
    res.json(await plans.morningCheck(currentUser(req), p.data.id, p.data.key, parse(MorningBody, req.body).pain));
  });

  return router;
}
