import type { Routes } from '@angular/router';
import { areaData } from './core/areas';
import { areaRoleGuard, signedInGuard } from './core/role-guard';

/**
 * The router table. Pages outside the shell are public (sign-in and the e-mailed links).
 * Inside the shell, each area declares itself with `data: areaData({...})` and guards itself with
 * `canMatch: [areaRoleGuard]`: the side navigation and the home page cards are built from these
 * declarations, so a new feature adds one route here and appears for its roles.
 */
export const routes: Routes = [
  {
    path: 'sign-in',
    title: 'Sign in · Descentry',
    loadComponent: () => import('./sign-in/sign-in'),
  },
  {
    path: 'forgot-password',
    title: 'Forgot password · Descentry',
    loadComponent: () => import('./sign-in/forgot-password'),
  },
  {
    path: 'accept-invite',
    title: 'Accept invitation · Descentry',
    data: { kind: 'invite' },
    loadComponent: () => import('./account/set-password'),
  },
  {
    path: 'reset-password',
    title: 'Reset password · Descentry',
    data: { kind: 'reset' },
    loadComponent: () => import('./account/set-password'),
  },
  {
    path: '',
    loadComponent: () => import('./shell/shell'),
    canMatch: [signedInGuard],
    children: [
      {
        path: '',
        pathMatch: 'full',
        title: 'Home · Descentry',
        loadComponent: () => import('./home/home'),
      },
      {
        path: 'admin/people',
        title: 'People · Descentry',
        canMatch: [areaRoleGuard],
        data: areaData({
          label: 'People',
          icon: 'group',
          summary: 'Invite people, set their roles, disable accounts and send password resets.',
          roles: ['admin'],
          group: 'Administration',
        }),
        loadComponent: () => import('./admin/people/people'),
      },
      {
        path: 'admin/mail',
        title: 'Outgoing mail · Descentry',
        canMatch: [areaRoleGuard],
        data: areaData({
          label: 'Outgoing mail',
          icon: 'outgoing_mail',
          summary: 'Check what Descentry has sent or is about to send, and what the local mail catcher received.',
          roles: ['admin'],
          group: 'Administration',
        }),
        loadComponent: () => import('./admin/mail/outgoing-mail'),
      },
      {
        path: '**',
        title: 'Page not found · Descentry',
        loadComponent: () => import('./shell/not-found'),
      },
    ],
  },
  // Reached only when nobody is signed in (the shell did not match): sign in first.
  { path: '**', redirectTo: 'sign-in' },
];
