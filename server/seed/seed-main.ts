import 'reflect-metadata';
import { createDataSource } from '../core/data-source';
import { seedDemo } from './seed-demo';

/** `npm run seed`: loads the invented demo scenario into DATABASE_URL unless it is already there. */
async function main() {
  const url = process.env['DATABASE_URL'];
  if (!url) throw new Error('DATABASE_URL is not set');
  const ds = createDataSource(url, { poolSize: 2 });
  await ds.initialize();
  try {
    const seeded = await seedDemo(ds);
    console.log(seeded ? '[fluxwalk] demo data seeded' : '[fluxwalk] demo data already present');
  } finally {
    await ds.destroy();
  }
}

main().catch((err) => {
  console.error('[fluxwalk] seeding failed:', err.message);
  process.exit(1);
});
