import { Router } from 'express';
import type { Db } from '../db/knex';
import { currentUser } from '../http/access';
import { permit } from '../policy/enforce';
import { idParam, parse } from '../http/validate';
import { InviteCoachBody } from '../auth/auth-schemas';
import type { InvitationsService } from '../auth/invitations-service';
import { usersRepository } from '../auth/users-repository';
import { DeactivateBody } from './staff-schemas';
import type { StaffService } from './staff-service';

/** The clinic's team: staff list, coach invitations, deactivation (owner), coach picker (staff). */
export function staffRoutes(d: { db: Db; invitations: InvitationsService; staff: StaffService }): Router {
  const router = Router();

  router.get('/staff', permit('staff:list'), async (req, res) => {
    const user = currentUser(req);
    const [staff, invitations] = await Promise.all([
      usersRepository.listStaff(d.db, user.clinicId),
      d.invitations.listPending(user.clinicId),
    ]);
    res.json({ staff, invitations: invitations.filter((i) => i.role !== 'athlete') });
  });

  router.post('/staff/invitations', permit('staff:invite'), async (req, res) => {
    const user = currentUser(req);
    const body = parse(InviteCoachBody, req.body);
    const invitation = await d.invitations.invite({
      clinicId: user.clinicId,
      email: body.email,
      name: body.name,
      role: 'coach',
      athleteId: null,
      invitedBy: user.id,
    });
    res.status(201).json(invitation);
  });

  router.delete('/staff/invitations/:id', permit('staff:revoke-invitation'), async (req, res) => {
    const user = currentUser(req);
    const id = idParam(req.params, 'Invitation');
    await d.invitations.revoke(user.clinicId, id, user.id);
    res.status(204).end();
  });

  router.post('/staff/:id/deactivate', permit('staff:deactivate'), async (req, res) => {
    const id = idParam(req.params, 'Staff member');
    const body = parse(DeactivateBody, req.body ?? {});
    res.json(await d.staff.deactivate(currentUser(req), id, body.reassignTo));
  });

  router.post('/staff/:id/reactivate', permit('staff:reactivate'), async (req, res) => {
    const id = idParam(req.params, 'Staff member');
    res.json(await d.staff.reactivate(currentUser(req), id));
  });

  router.get('/coaches', permit('coach:list'), async (req, res) => {
    res.json({ coaches: await usersRepository.listCoaches(d.db, currentUser(req).clinicId) });
  });

  return router;
}
