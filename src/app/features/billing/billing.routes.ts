import { Routes } from '@angular/router';
import { leaveGuard } from '../../core/leave-guard';

/** `/billing` (owner): the price list and invoices. */
export default [
  { path: '', pathMatch: 'full', redirectTo: 'invoices' },
  {
    path: 'prices',
    title: 'Prices · Trailframe',
    loadComponent: () => import('./price-list/price-list').then((m) => m.PriceList),
    canDeactivate: [leaveGuard],
  },
  {
    path: 'invoices',
    title: 'Invoices · Trailframe',
    loadComponent: () => import('./invoice-list/invoice-list').then((m) => m.InvoiceList),
  },
  {
    path: 'invoices/new',
    title: 'New invoice · Trailframe',
    loadComponent: () => import('./invoice-form/invoice-form').then((m) => m.InvoiceForm),
    canDeactivate: [leaveGuard],
  },
  {
    path: 'invoices/:id/edit',
    title: 'Edit draft invoice · Trailframe',
    loadComponent: () => import('./invoice-form/invoice-form').then((m) => m.InvoiceForm),
    canDeactivate: [leaveGuard],
  },
  {
    path: 'invoices/:id',
    title: 'Invoice · Trailframe',
    loadComponent: () => import('./invoice-detail/invoice-detail').then((m) => m.InvoiceDetailPage),
  },
] satisfies Routes;
