import { provideHttpClient, withInterceptors } from '@angular/common/http';
import {
  ApplicationConfig,
  inject,
  isDevMode,
  provideAppInitializer,
  provideBrowserGlobalErrorListeners,
  provideZonelessChangeDetection,
} from '@angular/core';
import { MatIconRegistry } from '@angular/material/icon';
import { RouteReuseStrategy, provideRouter, withComponentInputBinding, withInMemoryScrolling } from '@angular/router';
import { provideServiceWorker } from '@angular/service-worker';
import { routes } from './app.routes';
import { apiInterceptor } from './core/api/api-interceptor';
import { KeptScreens } from './core/router/kept-screens';
import { AppUpdate } from './core/sw-update/app-update';
import { OutdoorMode } from './core/theme/outdoor-mode';

export const appConfig: ApplicationConfig = {
  providers: [
    provideBrowserGlobalErrorListeners(),
    provideZonelessChangeDetection(),
    // A new screen (the next collar, too) opens at its top; Back returns to where the user was.
    provideRouter(routes, withComponentInputBinding(), withInMemoryScrolling({ scrollPositionRestoration: 'enabled' })),
    // Walk's route list stays drawn while a collar or the map is open (core/router/kept-screens.ts).
    { provide: RouteReuseStrategy, useExisting: KeptScreens },
    provideHttpClient(withInterceptors([apiInterceptor])),
    // The worker is registered at once (not "when stable"): a zoneless field app may never be
    // idle for long, and the first online visit must leave the shell cached for the offline start.
    provideServiceWorker('ngsw-worker.js', { enabled: !isDevMode(), registrationStrategy: 'registerImmediately' }),
    provideAppInitializer(() => {
      inject(MatIconRegistry).setDefaultFontSetClass('material-symbols-outlined');
      inject(OutdoorMode);
      inject(AppUpdate).start();
    }),
  ],
};
