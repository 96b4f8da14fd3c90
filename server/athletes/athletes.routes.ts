import { idempotencyKey } from '../http/idempotency-key';
import { Router } from 'express';
import { currentUser } from '../http/access';
import { permit } from '../policy/enforce';
import { idParam, parse } from '../http/validate';
import { AthleteCreateBody, AthleteUpdateBody, IntakeBody } from './athletes-schemas';
import type { AthletesService } from './athletes-service';

/** Roster, profile, intake and athlete invitations. Thin: validate, call the service, answer. */
export function athletesRoutes(athletes: AthletesService): Router {
  const router = Router();
  router.get('/athletes', permit('athlete:list'), async (req, res) => {
    res.json({ athletes: await athletes.list(currentUser(req)) });
  });

  router.post('/athletes', permit('athlete:create'), async (req, res) => {
    const body = parse(AthleteCreateBody, req.body);
    res.status(201).json(await athletes.create(currentUser(req), body, idempotencyKey(req)));
  });

  router.get('/athletes/:id', permit('athlete:read'), async (req, res) => {
    res.json(await athletes.get(currentUser(req), idParam(req.params, 'Athlete')));
  });

  router.patch('/athletes/:id', permit('athlete:update'), async (req, res) => {
    const athleteId = idParam(req.params, 'Athlete');
    const body = parse(AthleteUpdateBody, req.body);
    res.json(await athletes.update(currentUser(req), athleteId, body));
  });

  router.put('/athletes/:id/intake', permit('athlete:update-intake'), async (req, res) => {
    const athleteId = idParam(req.params, 'Athlete');
    const body = parse(IntakeBody, req.body);
    res.json(await athletes.putIntake(currentUser(req), athleteId, body));
  });

  router.post('/athletes/:id/invitation', permit('athlete:invite'), async (req, res) => {
    res.status(201).json(await athletes.invite(currentUser(req), idParam(req.params, 'Athlete')));
  });

  return router;
}
