import { inject } from '@angular/core';
import { Router, Routes } from '@angular/router';
import { leaveGuard } from '../../core/leave-guard';

/** `/athletes/:athleteId/assessments/…` (owner and coach). */
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
  {
    path: ':assessmentId/clips/:clipId/review',
    loadChildren: () => import('../review/review.routes'),
  },
] satisfies Routes;
