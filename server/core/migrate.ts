import { runMigrations } from './data-source';

/** `npm run migrate`: applies pending migrations to DATABASE_URL. */
async function main() {
  const url = process.env['DATABASE_URL'];
  if (!url) throw new Error('DATABASE_URL is not set');
  const applied = await runMigrations(url);
  console.log(applied.length ? `[fluxwalk] migrations applied: ${applied.join(', ')}` : '[fluxwalk] database schema is up to date');
}

main().catch((err) => {
  console.error('[fluxwalk] migration failed:', err.message);
  process.exit(1);
});
