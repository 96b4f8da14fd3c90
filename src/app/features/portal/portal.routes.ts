import { Routes } from '@angular/router';

/**
 * `/portal` (athlete): their home. The athlete's pages of other features (plan, profile, invoices,
 * assessments) are mounted beside it in `app.routes.ts`, so this feature imports none of them.
 */
export default [
  {
    path: '',
    title: 'Home · Trailframe',
    loadComponent: () => import('./portal-home/portal-home').then((m) => m.PortalHome),
  },
] satisfies Routes;
