import { Routes } from '@angular/router';
import { anonymousOnlyGuard, redirectHome, roleGuard, signedInGuard } from './core/auth-guards';
import { Shell } from './core/shell/shell';

export const routes: Routes = [
  {
    path: 'sign-in',
    title: 'Sign in · Trailframe',
    canActivate: [anonymousOnlyGuard],
    loadComponent: () => import('./features/auth/sign-in/sign-in').then((m) => m.SignIn),
  },
  {
    path: 'forgot-password',
    title: 'Forgot password · Trailframe',
    loadComponent: () => import('./features/auth/forgot-password/forgot-password').then((m) => m.ForgotPassword),
  },
  {
    path: 'reset-password/:token',
    title: 'Choose a new password · Trailframe',
    loadComponent: () => import('./features/auth/reset-password/reset-password').then((m) => m.ResetPassword),
  },
  {
    path: 'invitation/:token',
    title: 'Join your clinic · Trailframe',
    loadComponent: () => import('./features/auth/invitation-accept/invitation-accept').then((m) => m.InvitationAccept),
  },
  {
    path: '',
    component: Shell,
    canMatch: [signedInGuard],
    children: [
      { path: '', pathMatch: 'full', redirectTo: redirectHome },
      {
        path: 'account',
        title: 'Account · Trailframe',
        loadComponent: () => import('./features/auth/account-page/account-page').then((m) => m.AccountPage),
      },
      {
        path: 'athletes',
        canMatch: [roleGuard('owner', 'coach')],
        // An athlete's assessments, review and comparison are other features' pages under the athlete's path.
        children: [
          {
            path: ':athleteId/assessments/:assessmentId/clips/:clipId/review',
            loadChildren: () => import('./features/review/review.routes'),
          },
          { path: ':athleteId/assessments', loadChildren: () => import('./features/assessments/assessments.routes') },
          { path: ':athleteId/compare', loadChildren: () => import('./features/compare/compare.routes') },
          { path: '', loadChildren: () => import('./features/athletes/athletes.routes') },
        ],
      },
      {
        path: 'exercises',
        canMatch: [roleGuard('owner', 'coach')],
        loadChildren: () => import('./features/plans/exercises.routes'),
      },
      {
        path: 'plans',
        canMatch: [roleGuard('owner', 'coach')],
        loadChildren: () => import('./features/plans/plans.routes'),
      },
      {
        path: 'billing',
        canMatch: [roleGuard('owner')],
        loadChildren: () => import('./features/billing/billing.routes'),
      },
      {
        path: 'team',
        canMatch: [roleGuard('owner')],
        loadChildren: () => import('./features/team/team.routes'),
      },
      {
        path: 'settings/reference-bands',
        canMatch: [roleGuard('owner')],
        loadChildren: () => import('./features/reference-bands/reference-bands.routes'),
      },
      {
        path: 'settings/clinic',
        canMatch: [roleGuard('owner')],
        loadChildren: () => import('./features/clinic-settings/clinic-settings.routes'),
      },
      {
        path: 'portal',
        canMatch: [roleGuard('athlete')],
        // The athlete's pages of each feature; features do not import each other, so they meet here.
        children: [
          { path: 'plan', loadChildren: () => import('./features/plans/portal-plan.routes') },
          { path: 'profile', loadChildren: () => import('./features/athletes/portal-profile.routes') },
          { path: 'invoices', loadChildren: () => import('./features/billing/portal-invoices.routes') },
          { path: 'assessments', loadChildren: () => import('./features/assessments/portal-assessments.routes') },
          { path: '', loadChildren: () => import('./features/portal/portal.routes') },
        ],
      },
    ],
  },
  {
    path: '**',
    title: 'Page not found · Trailframe',
    loadComponent: () => import('./core/not-found/not-found').then((m) => m.NotFound),
  },
];
