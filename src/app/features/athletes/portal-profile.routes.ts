import { Routes } from '@angular/router';
import { leaveGuard } from '../../core/leave-guard';

/** `/portal/profile` (athlete): their own profile and intake. Mounted in `app.routes.ts`. */
export default [
  {
    path: '',
    title: 'My profile · Trailframe',
    canDeactivate: [leaveGuard],
    loadComponent: () => import('./portal-profile/portal-profile').then((m) => m.PortalProfile),
  },
] satisfies Routes;
