import 'reflect-metadata';
import { Client } from 'pg';
import { createDataSource, runMigrations } from '../../server/core/data-source';
import { seedDemo } from '../../server/seed/seed-demo';

/** Name of the database in a postgres:// URL. */
export function databaseName(url: string): string {
  return decodeURIComponent(new URL(url).pathname.replace(/^\//, ''));
}

/**
 * Empties a test database, migrates it and loads the demo scenario. Refuses any database whose
 * name does not end in `_test`, so a wrong URL can never wipe real data.
 */
export async function resetDatabase(url: string): Promise<void> {
  const name = databaseName(url);
  if (!name.endsWith('_test')) throw new Error(`refusing to reset "${name}": test databases end in _test`);
  const client = new Client({ connectionString: url });
  await client.connect();
  try {
    await client.query('DROP SCHEMA public CASCADE; CREATE SCHEMA public;');
  } finally {
    await client.end();
  }
  await runMigrations(url);
  const ds = createDataSource(url, { poolSize: 2 });
  await ds.initialize();
  try {
    await seedDemo(ds);
  } finally {
    await ds.destroy();
  }
}
