import type { DataSource } from 'typeorm';
import { UserEntity } from '../users/user.entity';
import { DEMO_USERS, seedDemoAccounts } from './demo-accounts';
import { seedDemoScenario } from './demo-scenario';

/** Seeds the invented demo scenario once: a database that already has the demo admin is left alone. */
export async function seedDemo(ds: DataSource): Promise<boolean> {
  const adminEmail = DEMO_USERS.find((u) => u.roles.includes('admin'))!.email;
  if (await ds.getRepository(UserEntity).existsBy({ email: adminEmail })) return false;
  await ds.transaction(async (em) => {
    await seedDemoAccounts(em);
    // One transaction: the scenario is either all there or not at all, so a rerun starts clean.
    await seedDemoScenario(em);
  });
  return true;
}
