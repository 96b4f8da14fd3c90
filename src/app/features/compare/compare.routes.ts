import { Routes } from '@angular/router';

/** `/athletes/:athleteId/compare` (owner and coach). */
export default [
  {
    path: '',
    title: 'Re-test comparison · Trailframe',
    loadComponent: () => import('./compare-page/compare-page').then((m) => m.ComparePage),
  },
] satisfies Routes;
