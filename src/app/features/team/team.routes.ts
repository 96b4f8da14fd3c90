import { Routes } from '@angular/router';

/** `/team` (owner). */
export default [
  {
    path: '',
    title: 'Team · Trailframe',
    loadComponent: () => import('./team-page/team-page').then((m) => m.TeamPage),
  },
] satisfies Routes;
