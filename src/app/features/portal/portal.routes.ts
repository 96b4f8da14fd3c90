import { Routes } from '@angular/router';
import { leaveGuard } from '../../core/leave-guard';

/** `/portal` (athlete): their home, their plan and log, their own profile and their assessments. */
export default [
  {
    path: '',
    title: 'Home · Trailframe',
    loadComponent: () => import('./portal-home/portal-home').then((m) => m.PortalHome),
  },
  {
    path: 'plan',
    title: 'My plan · Trailframe',
    canDeactivate: [leaveGuard],
    loadComponent: () => import('../plans/portal-plan/portal-plan').then((m) => m.PortalPlan),
  },
  {
    path: 'profile',
    title: 'My profile · Trailframe',
    canDeactivate: [leaveGuard],
    loadComponent: () => import('./portal-profile/portal-profile').then((m) => m.PortalProfile),
  },
  {
    path: 'invoices',
    title: 'My invoices · Trailframe',
    loadComponent: () => import('../billing/portal-invoices/portal-invoices').then((m) => m.PortalInvoices),
  },
  {
    path: 'invoices/:id',
    title: 'Invoice · Trailframe',
    loadComponent: () => import('../billing/portal-invoice/portal-invoice').then((m) => m.PortalInvoice),
  },
  {
    path: 'assessments/:id',
    title: 'Assessment · Trailframe',
    canDeactivate: [leaveGuard],
    loadComponent: () => import('./portal-assessment/portal-assessment').then((m) => m.PortalAssessment),
  },
] satisfies Routes;
