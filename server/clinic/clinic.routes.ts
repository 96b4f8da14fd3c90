import { Router } from 'express';
import { currentUser, requireRole } from '../http/access';
import { parse } from '../http/validate';
import { LegalDetailsBody } from './clinic-schemas';
import type { ClinicService } from './clinic-service';

/** The owner's clinic settings. Thin: parse, call, answer. */
export function clinicRoutes(clinic: ClinicService): Router {
  const router = Router();
  const owner = requireRole('owner');
  router.get('/clinic/legal-details', owner, async (req, res) => {
    res.json(await clinic.legalDetails(currentUser(req)));
  });
  router.put('/clinic/legal-details', owner, async (req, res) => {
    res.json(await clinic.putLegalDetails(currentUser(req), parse(LegalDetailsBody, req.body)));
  });
  return router;
}
