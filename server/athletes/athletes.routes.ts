import { Router } from 'express';
import { currentUser, requireRole, requireSignedIn } from '../http/access';
import { idParam, parse } from '../http/validate';
import { AthleteCreateBody, AthleteUpdateBody, IntakeBody } from './athletes-schemas';
import type { AthletesService } from './athletes-service';

/** Roster, profile, intake and athlete invitations. Thin: validate, call the service, answer. */
export function athletesRoutes(athletes: AthletesService): Router {
  const router = Router();
  router.get('/athletes', requireRole('owner', 'coach'), async (req, res) => {
    res.json({ athletes: await athletes.list(currentUser(req)) });
  });

  router.post('/athletes', requireRole('owner', 'coach'), async (req, res) => {
    const body = parse(AthleteCreateBody, req.body);
    res.status(201).json(await athletes.create(currentUser(req), body));
  });

  router.get('/athletes/:id', requireSignedIn, async (req, res) => {
    res.json(await athletes.get(currentUser(req), idParam(req.params, 'Athlete')));
  });

  router.patch('/athletes/:id', requireSignedIn, async (req, res) => {
    const athleteId = idParam(req.params, 'Athlete');
    const body = parse(AthleteUpdateBody, req.body);
    res.json(await athletes.update(currentUser(req), athleteId, body));
  });

  router.put('/athletes/:id/intake', requireSignedIn, async (req, res) => {
    const athleteId = idParam(req.params, 'Athlete');
    const body = parse(IntakeBody, req.body);
    res.json(await athletes.putIntake(currentUser(req), athleteId, body));
  });

  router.post('/athletes/:id/invitation', requireRole('owner', 'coach'), async (req, res) => {
    res.status(201).json(await athletes.invite(currentUser(req), idParam(req.params, 'Athlete')));
  });

  return router;
}
