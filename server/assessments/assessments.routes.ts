import { idempotencyKey } from '../http/idempotency-key';
import { Router } from 'express';
import { currentUser } from '../http/access';
import { permit } from '../policy/enforce';
import { idParam, parse } from '../http/validate';
import { AssessmentBody, AssessmentPatchBody } from './assessments-schemas';
import type { AssessmentsService } from './assessments-service';

/** Assessments of an athlete. */
export function assessmentsRoutes(assessments: AssessmentsService): Router {
  const router = Router();
  router.get('/athletes/:id/assessments', permit('assessment:list'), async (req, res) => {
    res.json({ assessments: await assessments.list(currentUser(req), idParam(req.params, 'Athlete')) });
  });

  router.post('/athletes/:id/assessments', permit('assessment:create'), async (req, res) => {
    const athleteId = idParam(req.params, 'Athlete');
    const body = parse(AssessmentBody, req.body);
    res.status(201).json(await assessments.create(currentUser(req), athleteId, body, idempotencyKey(req)));
  });

  router.get('/assessments/:id', permit('assessment:read'), async (req, res) => {
    res.json(await assessments.get(currentUser(req), idParam(req.params, 'Assessment')));
  });

  router.patch('/assessments/:id', permit('assessment:update'), async (req, res) => {
    const assessmentId = idParam(req.params, 'Assessment');
    const body = parse(AssessmentPatchBody, req.body);
    res.json(await assessments.update(currentUser(req), assessmentId, body));
  });

  router.delete('/assessments/:id', permit('assessment:delete'), async (req, res) => {
    await assessments.remove(currentUser(req), idParam(req.params, 'Assessment'));
    res.status(204).end();
  });

  return router;
}
