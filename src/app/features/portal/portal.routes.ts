import { Routes } from '@angular/router';
import { leaveGuard } from '../../core/leave-guard';

/** `/portal` (athlete): their home and their own profile. */
export default [
  {
    path: '',
    title: 'Home · Trailframe',
    loadComponent: () => import('./portal-home/portal-home').then((m) => m.PortalHome),
  },
  {
    path: 'profile',
    title: 'My profile · Trailframe',
    canDeactivate: [leaveGuard],
    loadComponent: () => import('./portal-profile/portal-profile').then((m) => m.PortalProfile),
  },
] satisfies Routes;
