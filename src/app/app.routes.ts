import { Routes } from '@angular/router';
import { destinationGuard, homeRedirect, noDestinationsGuard, signedInGuard, signedOutGuard } from './core/auth/auth-guards';
import { PUBLIC_ACCOUNT_ROUTES, SIGNED_IN_ACCOUNT_ROUTES } from './features/accounts/account-routes';

/** One lazy chunk per screen family; the guards read the remembered user, so they work offline. */
export const routes: Routes = [
  {
    path: 'sign-in',
    canActivate: [signedOutGuard],
    title: 'Sign in · Fluxwalk',
    loadComponent: () => import('./features/sign-in/sign-in').then((m) => m.SignIn),
  },
  ...PUBLIC_ACCOUNT_ROUTES, // accept an invitation, forgot/reset password: reached from mail, no sign-in
  {
    path: '',
    canActivate: [signedInGuard],
    loadComponent: () => import('./features/shell/shell').then((m) => m.Shell),
    children: [
      { path: '', pathMatch: 'full', redirectTo: homeRedirect },
      {
        path: 'walk',
        canActivate: [destinationGuard('walk')],
        title: 'Walk · Fluxwalk',
        loadChildren: () => import('./features/walk/walk-routes').then((m) => m.WALK_ROUTES),
      },
      {
        path: 'board',
        canActivate: [destinationGuard('board')],
        title: 'Board · Fluxwalk',
        loadComponent: () => import('./features/board/board').then((m) => m.Board),
      },
      {
        path: 'bench',
        canActivate: [destinationGuard('bench')],
        title: 'Bench · Fluxwalk',
        loadComponent: () => import('./features/bench/bench').then((m) => m.Bench),
      },
      {
        path: 'bench/temperature-logs',
        canActivate: [destinationGuard('bench')],
        title: 'Temperature logs · Bench · Fluxwalk',
        loadComponent: () => import('./features/temperature-logs/temperature-log-import').then((m) => m.TemperatureLogImport),
      },
      {
        path: 'setup',
        canActivate: [destinationGuard('setup')],
        title: 'Setup · Fluxwalk',
        loadComponent: () => import('./features/setup/setup').then((m) => m.Setup),
      },
      {
        path: 'collars',
        canActivate: [destinationGuard('walk')],
        title: 'Collars · Fluxwalk',
        loadComponent: () => import('./features/collars/collar-list').then((m) => m.CollarList),
      },
      {
        path: 'collars/:id',
        canActivate: [destinationGuard('walk')],
        title: 'Collar · Fluxwalk',
        loadComponent: () => import('./features/collars/collar-page').then((m) => m.CollarPage),
      },
      {
        path: 'conflicts',
        title: 'Conflicts · Fluxwalk',
        loadComponent: () => import('./features/conflicts/conflicts').then((m) => m.Conflicts),
      },
      {
        path: 'backup',
        title: 'Backup files · Fluxwalk',
        loadComponent: () => import('./features/backup/backup-page').then((m) => m.BackupPage),
      },
      { path: 'accounts', children: SIGNED_IN_ACCOUNT_ROUTES }, // change password, invite (lazy pages)
      {
        path: 'no-destinations',
        canActivate: [noDestinationsGuard],
        title: 'Fluxwalk',
        loadComponent: () => import('./features/shell/no-destinations').then((m) => m.NoDestinations),
      },
    ],
  },
  { path: '**', redirectTo: '' },
];
