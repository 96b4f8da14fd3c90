import { Router } from 'express';
import { currentUser, requireRole, requireSignedIn } from '../http/access';
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
  PlanKeyParams,
  TransitionBody,
} from './plans-schemas';
import type { ExercisesService } from './exercises-service';
import type { PlansService } from './plans-service';

/** Exercise library, plans with stages, progress and alerts, and the athlete's log. Thin. */
export function plansRoutes({ exercises, plans }: { exercises: ExercisesService; plans: PlansService }): Router {
  const router = Router();
  const staff = requireRole('owner', 'coach');
  // ── Exercise library (clinic staff) ──
  router.get('/exercises', staff, async (req, res) => {
    const query = parse(ExerciseQueryParams, req.query, 'Query');
    res.json({ exercises: await exercises.list(currentUser(req), query) });
  });
  router.post('/exercises', staff, async (req, res) => {
    res.status(201).json(await exercises.create(currentUser(req), parse(ExerciseBody, req.body)));
  });
  router.get('/exercises/:id', staff, async (req, res) => {
    res.json(await exercises.get(currentUser(req), id(req.params, 'Exercise')));
  });
  router.patch('/exercises/:id', staff, async (req, res) => {
    const exerciseId = id(req.params, 'Exercise');
    res.json(await exercises.update(currentUser(req), exerciseId, parse(ExercisePatchBody, req.body)));
  });
  router.delete('/exercises/:id', staff, async (req, res) => {
    await exercises.archive(currentUser(req), id(req.params, 'Exercise'));
    res.status(204).end();
  });

  // ── Plans ──
  router.get('/athletes/:id/plans', requireSignedIn, async (req, res) => {
    res.json({ plans: await plans.list(currentUser(req), id(req.params, 'Athlete')) });
  });
  router.post('/athletes/:id/plans', staff, async (req, res) => {
    const athleteId = id(req.params, 'Athlete');
    res.status(201).json(await plans.create(currentUser(req), athleteId, parse(PlanBody, req.body)));
  });
  router.get('/plans/:id', requireSignedIn, async (req, res) => {
    res.json(await plans.get(currentUser(req), id(req.params, 'Plan')));
  });
  router.put('/plans/:id', staff, async (req, res) => {
    const planId = id(req.params, 'Plan');
    res.json(await plans.replace(currentUser(req), planId, parse(PlanBody, req.body)));
  });
  router.delete('/plans/:id', staff, async (req, res) => {
    await plans.remove(currentUser(req), id(req.params, 'Plan'));
    res.status(204).end();
  });
  router.post('/plans/:id/transitions', staff, async (req, res) => {
    const planId = id(req.params, 'Plan');
    res.json(await plans.transition(currentUser(req), planId, parse(TransitionBody, req.body).action));
  });
  router.put('/plans/:id/pain-rule', staff, async (req, res) => {
    const planId = id(req.params, 'Plan');
    res.json(await plans.putRule(currentUser(req), planId, parse(PainRuleBody, req.body)));
  });
  router.get('/plans/:id/progress', requireSignedIn, async (req, res) => {
    res.json(await plans.progress(currentUser(req), id(req.params, 'Plan')));
  });
  router.get('/plan-alerts', staff, async (req, res) => {
    res.json({ alerts: await plans.clinicAlerts(currentUser(req)) });
  });

  // ── The athlete's log ──
  router.get('/plans/:id/logs', requireSignedIn, async (req, res) => {
    res.json({ logs: await plans.logs(currentUser(req), id(req.params, 'Plan')) });
  });
  router.post('/plans/:id/logs', requireRole('athlete'), async (req, res) => {
    const planId = id(req.params, 'Plan');
    const body = parse(LogBody, req.body);
    const { entry, created } = await plans.addLog(currentUser(req), planId, body);
    res.status(created ? 201 : 200).json(entry);
  });
  router.put('/plans/:id/logs/:key/morning', requireRole('athlete'), async (req, res) => {
    const p = PlanKeyParams.safeParse(req.params);
    if (!p.success) throw new NotFoundError('Log entry');
    res.json(await plans.morningCheck(currentUser(req), p.data.id, p.data.key, parse(MorningBody, req.body).pain));
  });

  return router;
}
