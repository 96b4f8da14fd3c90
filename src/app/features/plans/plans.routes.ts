import { Routes } from '@angular/router';
import { leaveGuard } from '../../core/leave-guard';

/** `/plans/…` (owner and coach): build a plan for an athlete, follow it, edit it. */
export default [
  {
    path: 'new',
    title: 'New plan · Trailframe',
    canDeactivate: [leaveGuard],
    loadComponent: () => import('./plan-builder/plan-builder').then((m) => m.PlanBuilder),
  },
  {
    path: ':id',
    title: 'Plan · Trailframe',
    loadComponent: () => import('./plan-page/plan-page').then((m) => m.PlanPage),
  },
  {
    path: ':id/edit',
    title: 'Edit plan · Trailframe',
    canDeactivate: [leaveGuard],
    loadComponent: () => import('./plan-builder/plan-builder').then((m) => m.PlanBuilder),
  },
] satisfies Routes;
