import { Routes } from '@angular/router';
import { leaveGuard } from '../../core/leave-guard';

/** `/team` (owner). */
export default [
  {
    path: '',
    title: 'Team · Trailframe',
    loadComponent: () => import('./team-page/team-page').then((m) => m.TeamPage),
    canDeactivate: [leaveGuard],
  },
] satisfies Routes;
