import { Routes } from '@angular/router';
import { authGuard, mailFakeGuard, roleGuard, signedOutGuard } from './auth/auth-guard';
import { ADMIN_ONLY } from './core/navigation';

export const routes: Routes = [
  {
    path: 'sign-in',
    title: 'Sign in · Specimetry',
    canActivate: [signedOutGuard],
    loadComponent: () => import('./auth/sign-in').then((m) => m.SignIn),
  },
  {
    path: 'accept-invitation',
    title: 'Accept invitation · Specimetry',
    loadComponent: () => import('./auth/accept-invitation').then((m) => m.AcceptInvitation),
  },
  {
    path: 'reset-password',
    title: 'Reset password · Specimetry',
    loadComponent: () => import('./auth/reset-password').then((m) => m.ResetPassword),
  },
  {
    path: '',
    canActivate: [authGuard],
    children: [
      { path: '', pathMatch: 'full', redirectTo: 'studies' },
      {
        path: 'studies',
        title: 'Studies · Specimetry',
        loadComponent: () => import('./studies/study-list').then((m) => m.StudyList),
      },
      // The calculator's study pages come before the study tabs, so they match without relying on backtracking.
      {
        path: 'studies/:id/derived',
        title: 'Derived responses · Specimetry',
        loadComponent: () => import('./calc/derived-responses').then((m) => m.DerivedResponses),
      },
      {
        path: 'studies/:id/runs/:runId/angle',
        title: 'Run angle · Specimetry',
        loadComponent: () => import('./calc/run-angle').then((m) => m.RunAngle),
      },
      {
        path: 'studies/:id',
        loadChildren: () => import('./studies/study.routes').then((m) => m.STUDY_ROUTES),
      },
      {
        path: 'calc/hill48',
        title: 'Hill 1948 calculator · Specimetry',
        loadComponent: () => import('./calc/hill-calculator').then((m) => m.HillCalculator),
      },
      {
        path: 'notifications',
        title: 'Notifications · Specimetry',
        loadComponent: () => import('./notifications/notifications-page').then((m) => m.NotificationsPage),
      },
      {
        path: 'account',
        title: 'Account · Specimetry',
        loadComponent: () => import('./account/account').then((m) => m.Account),
      },
      {
        path: 'tokens',
        title: 'API tokens · Specimetry',
        loadComponent: () => import('./tokens/tokens').then((m) => m.Tokens),
      },
      {
        path: 'api-docs',
        title: 'API reference · Specimetry',
        loadComponent: () => import('./api-docs/api-docs').then((m) => m.ApiDocs),
      },
      {
        path: 'admin',
        canActivate: [roleGuard(ADMIN_ONLY)],
        children: [
          { path: '', pathMatch: 'full', redirectTo: 'users' },
          {
            path: 'users',
            title: 'Users · Specimetry',
            loadComponent: () => import('./admin/users').then((m) => m.Users),
          },
          {
            path: 'invitations',
            title: 'Invitations · Specimetry',
            loadComponent: () => import('./admin/invitations').then((m) => m.Invitations),
          },
          {
            path: 'outbox',
            title: 'Mail outbox · Specimetry',
            canActivate: [mailFakeGuard],
            loadComponent: () => import('./admin/outbox').then((m) => m.Outbox),
          },
          {
            path: 'outbox/:id',
            title: 'Mail · Specimetry',
            canActivate: [mailFakeGuard],
            loadComponent: () => import('./admin/outbox-message').then((m) => m.OutboxMessage),
          },
        ],
      },
      {
        path: 'not-allowed',
        title: 'Not allowed · Specimetry',
        loadComponent: () => import('./core/not-allowed').then((m) => m.NotAllowed),
      },
    ],
  },
  {
    path: '**',
    title: 'Page not found · Specimetry',
    loadComponent: () => import('./core/not-found').then((m) => m.NotFound),
  },
];
