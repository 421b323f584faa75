import type { DataSource } from 'typeorm';
import { UserEntity } from '../users/user.entity';
import { DEMO_USERS, seedDemoAccounts } from './demo-accounts';

/** Seeds the invented demo scenario once: a database that already has the demo admin is left alone. */
export async function seedDemo(ds: DataSource): Promise<boolean> {
  const adminEmail = DEMO_USERS.find((u) => u.roles.includes('admin'))!.email;
  if (await ds.getRepository(UserEntity).existsBy({ email: adminEmail })) return false;
  await ds.transaction(async (em) => {
    await seedDemoAccounts(em);
  });
  return true;
}
