import { Router } from 'express';
import { currentUser } from '../http/access';
import { permit } from '../policy/enforce';
import { parse } from '../http/validate';
import { receivePicture } from '../pictures/picture-upload';
import { LegalDetailsBody } from './clinic-schemas';
import type { ClinicService } from './clinic-service';

/** The owner's clinic settings, and the clinic's brand for everyone of it. Thin: parse, call, answer. */
export function clinicRoutes(clinic: ClinicService): Router {
  const router = Router();
  router.get('/clinic/legal-details', permit('clinic-legal:read'), async (req, res) => {
    res.json(await clinic.legalDetails(currentUser(req)));
  });
  router.put('/clinic/legal-details', permit('clinic-legal:update'), async (req, res) => {
    res.json(await clinic.putLegalDetails(currentUser(req), parse(LegalDetailsBody, req.body)));
  });
  router.get('/clinic/brand', permit('clinic-brand:read'), async (req, res) => {
    res.json(await clinic.brand(currentUser(req)));
  });
  router.get('/clinic/logo.png', permit('clinic-brand:read'), async (req, res) => {
    const stream = await clinic.logo(currentUser(req));
    res.setHeader('Content-Type', 'image/png');
    // The URL carries the version (`?v=`), so a new logo is a new URL.
    res.setHeader('Cache-Control', 'private, max-age=86400');
    res.setHeader('X-Content-Type-Options', 'nosniff');
    stream.pipe(res);
  });
  router.put('/clinic/logo', permit('clinic-logo:update'), receivePicture(), async (req, res) => {
    res.json(await clinic.putLogo(currentUser(req), req.file!.buffer));
  });
  router.delete('/clinic/logo', permit('clinic-logo:update'), async (req, res) => {
    await clinic.removeLogo(currentUser(req));
    res.status(204).end();
  });
  return router;
}
