import { randomUUID } from 'node:crypto';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

/**
 * Pulls take turns for a few slots per process (PULL_SLOTS): a pull beyond them waits for a free
 * slot instead of building its page alongside the others, so a fleet's pulls at day's end cannot
 * crowd out the pushes. A pull is held inside its slot here by locking its device's row, which the
 * pull writes (its cursor) before it answers.
 */
describe('sync pulls take turns for the process’s pull slots', () => {
  const apps: TestApp[] = [];
  afterAll(async () => {
    for (const t of apps) await t.close();
  });

  async function pullWhileAnotherIsHeld(pullSlots: number) {
    const t = await startTestApp({ pullSlots });
    apps.push(t);
    const lead = await signIn(t.app, demoEmail('lead'));
    const held = randomUUID();
    const other = randomUUID();
    const pull = (s: Session, deviceId: string) => s.get(`/api/sync/pull?deviceId=${deviceId}&cursor=0&limit=5`).then((r) => r);
    expect((await pull(lead, held)).status).toBe(200); // the device row exists now
    const holder = t.ds.createQueryRunner();
    await holder.connect();
    await holder.startTransaction();
    await holder.query(`SELECT 1 FROM device WHERE id = $1 FOR UPDATE`, [held]);
    const order: string[] = [];
    const first = pull(lead, held).then((r) => (order.push('held pull'), r));
    await waitFor(async () => {
      // Not on the holder's connection: inside a transaction pg_stat_activity is read once.
      const [{ n }] = await t.ds.query(
        `SELECT count(*)::int AS n FROM pg_stat_activity WHERE wait_event_type = 'Lock' AND query LIKE 'INSERT INTO device%'`,
      );
      return n > 0;
    });
    const second = pull(lead, other).then((r) => (order.push('other pull'), r));
    // Room for the second pull to answer if it may: until it does when a slot is free (a loaded machine
    // may take a while), a short spell when none is (it cannot answer, however long the wait).
    let timer: NodeJS.Timeout | undefined;
    await Promise.race([second, new Promise((r) => (timer = setTimeout(r, pullSlots > 1 ? 10_000 : 400)))]);
    clearTimeout(timer);
    order.push('released');
    await holder.commitTransaction();
    await holder.release();
    const answers = await Promise.all([first, second]);
    expect(answers.map((r) => r.status)).toEqual([200, 200]);
    return order;
  }

  it('when one slot is busy with a pull, then another device’s pull waits for it', async () => {
    expect(await pullWhileAnotherIsHeld(1)).toEqual(['released', 'held pull', 'other pull']);
  }, 20_000);

  it('when a second slot is free, then another device’s pull is served meanwhile', async () => {
    expect(await pullWhileAnotherIsHeld(2)).toEqual(['other pull', 'released', 'held pull']);
  }, 20_000);
});

async function waitFor(check: () => Promise<boolean>, ms = 5000): Promise<void> {
  const until = Date.now() + ms;
  while (!(await check())) {
    if (Date.now() > until) throw new Error('timed out waiting for the condition');
    await new Promise((r) => setTimeout(r, 20));
  }
}
