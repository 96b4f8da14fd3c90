import { Routes } from '@angular/router';

/** `/portal/invoices` (athlete): their invoices and paying one. Mounted in `app.routes.ts`. */
export default [
  {
    path: '',
    title: 'My invoices · Trailframe',
    loadComponent: () => import('./portal-invoices/portal-invoices').then((m) => m.PortalInvoices),
  },
  {
    path: ':id',
    title: 'Invoice · Trailframe',
    loadComponent: () => import('./portal-invoice/portal-invoice').then((m) => m.PortalInvoice),
  },
] satisfies Routes;
