import { Routes } from '@angular/router';

/** `/mailbox` (owner, demo mode). */
export default [
  {
    path: '',
    title: 'Mailbox · Trailframe',
    loadComponent: () => import('./mailbox-page/mailbox-page').then((m) => m.MailboxPage),
  },
] satisfies Routes;
