import { Routes } from '@angular/router';
import { leaveGuard } from '../../core/leave-guard';

/** `/athletes` (owner and coach); an athlete's assessments and comparison are mounted beside these in `app.routes.ts`. */
export default [
  {
    path: '',
    title: 'Athletes · Trailframe',
    loadComponent: () => import('./athlete-list/athlete-list').then((m) => m.AthleteList),
  },
  {
    path: 'new',
    title: 'Add athlete · Trailframe',
    loadComponent: () => import('./athlete-new/athlete-new').then((m) => m.AthleteNew),
  },
  {
    path: ':id',
    title: 'Athlete · Trailframe',
    canDeactivate: [leaveGuard],
    loadComponent: () => import('./athlete-profile/athlete-profile').then((m) => m.AthleteProfile),
  },
] satisfies Routes;
