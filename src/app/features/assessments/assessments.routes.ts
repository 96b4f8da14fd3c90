import { inject } from '@angular/core';
import { Router, Routes } from '@angular/router';
import { leaveGuard } from '../../core/leave-guard';

/** `/athletes/:athleteId/assessments/…` (owner and coach); the clip review is mounted beside these in `app.routes.ts`. */
export default [
  {
    // The list lives on the athlete's profile.
    path: '',
    pathMatch: 'full',
    redirectTo: ({ params }) => inject(Router).createUrlTree(['/athletes', params['athleteId']], { queryParams: { tab: 'assessments' } }),
  },
  {
    path: ':id',
    title: 'Assessment · Trailframe',
    canDeactivate: [leaveGuard],
    loadComponent: () => import('./assessment-page/assessment-page').then((m) => m.AssessmentPage),
  },
] satisfies Routes;
