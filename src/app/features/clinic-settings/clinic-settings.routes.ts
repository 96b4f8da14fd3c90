import { Routes } from '@angular/router';
import { leaveGuard } from '../../core/leave-guard';

/** `/settings/clinic` (owner): the clinic's details. */
export default [
  {
    path: '',
    title: 'Clinic details · Trailframe',
    loadComponent: () => import('./clinic-details-page/clinic-details-page').then((m) => m.ClinicDetailsPage),
    canDeactivate: [leaveGuard],
  },
] satisfies Routes;
