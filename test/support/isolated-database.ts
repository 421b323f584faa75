import { Client } from 'pg';
import { databaseName, resetDatabase } from './reset-database';

/**
 * A freshly migrated and seeded database of its own, beside TEST_DATABASE_URL on the same cluster,
 * for tests that assert on the demo scenario itself (hand counts, exact lists): other test files
 * write into the shared test database at the same time. The name keeps the `_test` ending.
 */
export async function isolatedDatabase(purpose: string): Promise<string> {
  const base = process.env['TEST_DATABASE_URL'];
  if (!base) throw new Error('TEST_DATABASE_URL is not set');
  const name = `${databaseName(base).replace(/_test$/, '')}_${purpose}_test`;
  const admin = new URL(base);
  admin.pathname = '/postgres';
  const client = new Client({ connectionString: admin.toString() });
  await client.connect();
  try {
    await client.query(`CREATE DATABASE "${name}"`);
  } catch (err) {
    if ((err as { code?: string }).code !== '42P04') throw err; // already there from an earlier run: reset below
  } finally {
    await client.end();
  }
  const url = new URL(base);
  url.pathname = `/${name}`;
  await resetDatabase(url.toString());
  return url.toString();
}
