import type { DataSource } from 'typeorm';
import { recordReviewDecision } from '../closures/closure-history';
import { onRecordWritten } from '../records/after-write';
import { UserEntity } from '../users/user.entity';
import { DEMO_USERS, seedDemoAccounts } from './demo-accounts';
import { seedDemoScenario } from './demo-scenario';

/** Seeds the invented demo scenario once: a database that already has the demo admin is left alone. */
export async function seedDemo(ds: DataSource): Promise<boolean> {
  const adminEmail = DEMO_USERS.find((u) => u.roles.includes('admin'))!.email;
  if (await ds.getRepository(UserEntity).existsBy({ email: adminEmail })) return false;
  // The seed runs without the app (npm run seed, test resets): the lab's seeded decisions leave their
  // review history as the app's do (the same listener the Bench routes register; twice is a no-op).
  // Recompute requests are left out on purpose: the seed writes every number through the engine already.
  onRecordWritten(recordReviewDecision);
  await ds.transaction(async (em) => {
    await seedDemoAccounts(em);
    // One transaction: the scenario is either all there or not at all, so a rerun starts clean.
    await seedDemoScenario(em);
  });
  return true;
}
