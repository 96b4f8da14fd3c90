import { Routes } from '@angular/router';
import { leaveGuard } from '../../core/leave-guard';

/** `/portal/assessments/:id` (athlete): camera guidance, uploads and clips of their assessment. Mounted in `app.routes.ts`. */
export default [
  {
    path: ':id',
    title: 'Assessment · Trailframe',
    canDeactivate: [leaveGuard],
    loadComponent: () => import('./portal-assessment/portal-assessment').then((m) => m.PortalAssessment),
  },
] satisfies Routes;
