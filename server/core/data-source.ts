import 'reflect-metadata';
import { DataSource } from 'typeorm';
import { MIGRATIONS } from '../migrations';
import { ENTITIES } from './entities';

/** The one way to reach PostgreSQL. Schema changes come from migrations only, never `synchronize`. */
export function createDataSource(url: string, options: { poolSize?: number } = {}): DataSource {
  return new DataSource({
    type: 'postgres',
    url,
    entities: ENTITIES,
    migrations: MIGRATIONS,
    migrationsTransactionMode: 'each',
    synchronize: false,
    logging: ['error'],
    poolSize: options.poolSize ?? 10,
    // A push holds a connection for its whole batch: under load, wait for one rather than fail the request.
    extra: { connectionTimeoutMillis: 30000 },
  });
}

export async function runMigrations(url: string): Promise<string[]> {
  const ds = createDataSource(url, { poolSize: 2 });
  await ds.initialize();
  try {
    const done = await ds.runMigrations();
    return done.map((m) => m.name);
  } finally {
    await ds.destroy();
  }
}
