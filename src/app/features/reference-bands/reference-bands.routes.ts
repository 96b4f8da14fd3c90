import { Routes } from '@angular/router';

/** `/settings/reference-bands` (owner). */
export default [
  {
    path: '',
    title: 'Reference bands · Trailframe',
    loadComponent: () => import('./reference-bands-page/reference-bands-page').then((m) => m.ReferenceBandsPage),
  },
] satisfies Routes;
