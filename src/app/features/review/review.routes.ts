import { Routes } from '@angular/router';
import { leaveGuard } from '../../core/leave-guard';

/** `/athletes/:athleteId/assessments/:assessmentId/clips/:clipId/review` (owner and coach). */
export default [
  {
    path: '',
    title: 'Clip review · Trailframe',
    canDeactivate: [leaveGuard],
    loadComponent: () => import('./review-page/review-page').then((m) => m.ReviewPage),
  },
] satisfies Routes;
