import { Router } from 'express';
import type { PortalShared } from '../../src/contracts/sharing';
import { currentUser } from '../http/access';
import { permit } from '../policy/enforce';
import { NotFoundError } from '../errors';
import type { StillsService } from '../stills/stills-service';
import type { SummariesService } from './summaries-service';

/** `GET /api/portal/shared`: what the signed-in athlete's clinic published to them. */
export function portalSharedRoutes(d: { stills: StillsService; summaries: SummariesService }): Router {
  const router = Router();
  router.get('/portal/shared', permit('portal-shared:list'), async (req, res) => {
    const user = currentUser(req);
    if (!user.athleteId) throw new NotFoundError('Athlete');
    const body: PortalShared = {
      stills: await d.stills.list(user, user.athleteId),
      summaries: await d.summaries.list(user, user.athleteId),
    };
    res.json(body);
  });
  return router;
}
