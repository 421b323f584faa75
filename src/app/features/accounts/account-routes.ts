import { Routes } from '@angular/router';
import { destinationGuard } from '../../core/auth/auth-guards';

/** Signed-in account pages, shown inside the shell under /accounts. */
export const SIGNED_IN_ACCOUNT_ROUTES: Routes = [
  { path: 'password', title: 'Change password · Fluxwalk', loadComponent: () => import('./change-password').then((m) => m.ChangePassword) },
  {
    path: 'invite',
    canActivate: [destinationGuard('setup')],
    title: 'Invite · Fluxwalk',
    loadComponent: () => import('./invite-member').then((m) => m.InviteMember),
  },
];

/** Pages a mail links to, open without signing in (top level, outside the shell). */
export const PUBLIC_ACCOUNT_ROUTES: Routes = [
  {
    path: 'accept-invitation',
    title: 'Join · Fluxwalk',
    loadComponent: () => import('./accept-invitation').then((m) => m.AcceptInvitation),
  },
  {
    path: 'forgot-password',
    title: 'Forgot password · Fluxwalk',
    loadComponent: () => import('./forgot-password').then((m) => m.ForgotPassword),
  },
  {
    path: 'reset-password',
    title: 'New password · Fluxwalk',
    loadComponent: () => import('./reset-password').then((m) => m.ResetPassword),
  },
];
