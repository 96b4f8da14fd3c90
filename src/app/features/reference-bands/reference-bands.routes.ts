import { Routes } from '@angular/router';
import { leaveGuard } from '../../core/leave-guard';

/** `/settings/reference-bands` (owner). */
export default [
  {
    path: '',
    title: 'Reference bands · Trailframe',
    loadComponent: () => import('./reference-bands-page/reference-bands-page').then((m) => m.ReferenceBandsPage),
    canDeactivate: [leaveGuard],
  },
] satisfies Routes;
