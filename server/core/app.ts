import compression from 'compression';
import express, { type Express } from 'express';
import helmet from 'helmet';
import { existsSync } from 'node:fs';
import path from 'node:path';
import type { PassportStatic } from 'passport';
import type { DataSource } from 'typeorm';
import { registerAttachmentRoutes } from '../attachments/attachment-routes';
import { createObjectStorage } from '../attachments/object-storage';
import { defineAuthPurgeJob } from '../auth/auth-purge-job';
import { registerAuthRoutes } from '../auth/auth-routes';
import { createCsrf } from '../auth/csrf';
import { loginRateLimits } from '../auth/login-rate-limit';
import { createPassport } from '../auth/passport-setup';
import { sessionMiddleware } from '../auth/session-middleware';
import { registerBoardRoutes } from '../board/board-routes';
import { registerCampaignRoutes } from '../campaigns/campaign-routes';
import { registerBenchRoutes } from '../closures/bench-routes';
import { registerJobRoutes } from '../jobs/job-routes';
import { loadMailConfig } from '../mail/mail-config';
import { createMailer } from '../mail/mailer';
import { registerMailRoutes } from '../mail/mail-routes';
import { registerRecordRoutes } from '../records/record-routes';
import { registerResultsRoutes } from '../results/results-routes';
import { registerSetupRoutes } from '../setup/setup-routes';
import { registerSyncRoutes } from '../sync/sync-routes';
import { registerUserRoutes } from '../users/user-routes';
import type { ServerConfig } from './config';
import { apiNotFound, errorMiddleware } from './errors';
import { registerHealthRoute } from './health-routes';
import { RouteRegistry } from './route-registry';

/** Large bodies are allowed only where devices send batches or files. */
export const LARGE_BODY_PATHS = ['/api/sync/push', '/api/attachments'];
export const LARGE_BODY_LIMIT = '5mb';
export const BODY_LIMIT = '1mb';

export interface AppHandle {
  app: Express;
  registry: RouteRegistry;
}

/** Builds the whole app without listening: tests start it on port 0, main.ts on PORT. */
export function createApp(ds: DataSource, config: ServerConfig): AppHandle {
  const app = express();
  app.disable('x-powered-by');
  // API answers are per user and read fresh: a hash of every body (a pull page, a push answer) buys no revalidation. Static files keep their own ETags.
  app.set('etag', false);
  if (config.trustProxy !== false) app.set('trust proxy', config.trustProxy);
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          'img-src': ["'self'", 'data:', 'blob:'],
          // Fonts and styles ship with the app; Angular Material sets inline style attributes.
          'font-src': ["'self'"],
          'style-src': ["'self'", "'unsafe-inline'"],
          'worker-src': ["'self'", 'blob:'],
          'connect-src': ["'self'"],
          'upgrade-insecure-requests': null,
        },
      },
      // The app is served over plain HTTP on loopback in development; HSTS belongs to the TLS proxy.
      strictTransportSecurity: false,
    }),
  );

  // gzip for the app bundle and JSON: the first visit on a weak signal downloads ~490 kB raw, ~140 kB gzipped.
  // Level 1: a 5 000-record sync page (~2.8 MB JSON) gzips in half the time of the default level 6
  // for ~6 % more bytes (tools/bench-pull); the server's time, not the bytes, is what the crew waits for.
  app.use(compression({ level: 1 }));

  // body-parser skips a body that is already parsed, so the large limit must come first.
  for (const p of LARGE_BODY_PATHS) app.use(p, express.json({ limit: LARGE_BODY_LIMIT }));
  app.use('/api', express.json({ limit: BODY_LIMIT }));

  // @types/passport types an Authenticator instance apart from the PassportStatic its middleware helpers expect.
  const passport = createPassport(ds) as unknown as PassportStatic;
  app.use('/api', sessionMiddleware(ds, config.sessionSecret));
  app.use('/api', passport.session());
  const csrf = createCsrf(config.sessionSecret);
  app.use('/api', csrf.protect);

  const registry = new RouteRegistry(app);
  registerHealthRoute(registry, ds);
  registerAuthRoutes(registry, passport, csrf, loginRateLimits(ds, config));
  defineAuthPurgeJob(); // expired counters and sessions, on a schedule
  registerUserRoutes(registry, ds);
  // Invitations, password change/reset, the daily digest; every link in them uses config.appOrigin.
  registerMailRoutes(registry, ds, createMailer({ ...loadMailConfig(), appOrigin: config.appOrigin }));
  registerCampaignRoutes(registry, ds); // before the generic /:id routes
  registerSetupRoutes(registry, ds, config.appOrigin); // before the generic /:id routes
  registerAttachmentRoutes(registry, ds, config.objectStorage ? createObjectStorage(config.objectStorage) : null);
  registerBenchRoutes(registry, ds);
  registerJobRoutes(registry, ds);
  registerBoardRoutes(registry, ds);
  registerResultsRoutes(registry, ds);
  registerRecordRoutes(registry, ds);
  registerSyncRoutes(registry, ds, config.pullSlots);

  app.use('/api', apiNotFound);
  if (config.staticDir) serveApp(app, config.staticDir);
  app.use(errorMiddleware);
  return { app, registry };
}

function serveApp(app: Express, dir: string): void {
  const index = path.join(dir, 'index.html');
  if (!existsSync(index)) {
    console.warn(`[fluxwalk] no built app in ${dir}; serving the API only`);
    return;
  }
  // Hashed bundles may be cached for long; index.html and the service worker files must not be.
  app.use(
    express.static(dir, {
      index: false,
      setHeaders: (res, file) => {
        if (/\.(html|webmanifest)$|ngsw/.test(file)) res.setHeader('Cache-Control', 'no-cache');
      },
    }),
  );
  app.get('/{*splat}', (_req, res) => {
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(index);
  });
}
