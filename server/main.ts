import 'reflect-metadata';
import path from 'node:path';
import { createApp } from './core/app';
import { loadConfig } from './core/config';
import { serverEnv } from './core/server-env';
import { createDataSource } from './core/data-source';
import { startJobQueue } from './jobs/job-queue';
import { startDigestScheduler } from './mail/digest-scheduler';

/** Starts one server process: PostgreSQL pool, the app, and a clean shutdown on SIGINT/SIGTERM. */
async function main() {
  const defaultStatic = path.resolve(__dirname, '../../app/browser');
  const config = loadConfig();
  const ds = createDataSource(config.databaseUrl, { poolSize: config.dbPoolSize });
  await ds.initialize();
  const { app } = createApp(ds, { ...config, staticDir: config.staticDir ?? defaultStatic });
  // After createApp: features define their jobs while the app is built. JOB_WORKERS=off serves the API only.
  const jobs = serverEnv().JOB_WORKERS === 'off' ? null : await startJobQueue(ds, config.databaseUrl);
  const digests = jobs ? startDigestScheduler(ds) : null; // every worker process; the digest run table keeps it to one
  const server = app.listen(config.port, config.host, () => {
    const addr = server.address();
    const port = typeof addr === 'object' && addr ? addr.port : config.port;
    console.log(`[fluxwalk] listening on http://${config.host}:${port}`);
  });
  const stop = (signal: string) => {
    console.log(`[fluxwalk] ${signal}: stopping`);
    digests?.stop();
    server.close(
      () =>
        void (jobs?.stop() ?? Promise.resolve())
          .catch(() => undefined)
          .then(() => ds.destroy())
          .finally(() => process.exit(0)),
    );
    setTimeout(() => process.exit(0), 12000).unref();
  };
  process.on('SIGINT', () => stop('SIGINT'));
  process.on('SIGTERM', () => stop('SIGTERM'));
}

main().catch((err) => {
  console.error('[fluxwalk] could not start:', err.message);
  process.exit(1);
});
