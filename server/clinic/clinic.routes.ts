import { Router } from 'express';
import { currentUser } from '../http/access';
import { permit } from '../policy/enforce';
import { parse } from '../http/validate';
import { LegalDetailsBody } from './clinic-schemas';
import type { ClinicService } from './clinic-service';

/** The owner's clinic settings. Thin: parse, call, answer. */
export function clinicRoutes(clinic: ClinicService): Router {
  const router = Router();
  router.get('/clinic/legal-details', permit('clinic-legal:read'), async (req, res) => {
    res.json(await clinic.legalDetails(currentUser(req)));
  });
  router.put('/clinic/legal-details', permit('clinic-legal:update'), async (req, res) => {
    res.json(await clinic.putLegalDetails(currentUser(req), parse(LegalDetailsBody, req.body)));
  });
  return router;
}
