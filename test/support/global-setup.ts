import { resetDatabase } from './reset-database';

/** Jest global setup for the API tests: one fresh, migrated, seeded test database per run. */
export default async function globalSetup(): Promise<void> {
  const url = process.env['TEST_DATABASE_URL'];
  if (!url) throw new Error('TEST_DATABASE_URL is not set: run the tests with `npm test`');
  await resetDatabase(url);
}
