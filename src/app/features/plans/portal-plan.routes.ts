import { Routes } from '@angular/router';
import { leaveGuard } from '../../core/leave-guard';

/** `/portal/plan` (athlete): today's session, the morning check and their log. Mounted in `app.routes.ts`. */
export default [
  {
    path: '',
    title: 'My plan · Trailframe',
    canDeactivate: [leaveGuard],
    loadComponent: () => import('./portal-plan/portal-plan').then((m) => m.PortalPlan),
  },
] satisfies Routes;
