import { Routes } from '@angular/router';

/** Walk's screens, one lazy chunk each; all of them read and write the device store only. */
export const WALK_ROUTES: Routes = [
  // Kept drawn while a collar or the map is open: back to a route of thousands of collars is then instant.
  { path: '', data: { keepScreen: true }, loadComponent: () => import('./walk').then((m) => m.Walk) },
  { path: 'start', title: 'Start of day · Fluxwalk', loadComponent: () => import('./start-of-day').then((m) => m.StartOfDay) },
  { path: 'visit/:collarId', title: 'Visit · Fluxwalk', loadComponent: () => import('./visit-page').then((m) => m.VisitPage) },
  { path: 'collars/:id', loadComponent: () => import('./collar-open').then((m) => m.CollarOpen) },
  { path: 'install', title: 'Install a collar · Fluxwalk', loadComponent: () => import('./install-page').then((m) => m.InstallPage) },
  {
    path: 'import',
    title: 'Logger file for the round · Fluxwalk',
    loadComponent: () => import('../closures/round-import').then((m) => m.RoundImport),
  },
  { path: 'map', title: 'Map · Fluxwalk', loadComponent: () => import('./walk-map').then((m) => m.WalkMap) },
];
