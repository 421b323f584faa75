import type { EntityManager } from 'typeorm';

/** Each device's last push, last pull and reported outbox size, for the Board's list of silent devices. */
export async function recordPush(em: EntityManager, deviceId: string, userId: string, outboxSize: number): Promise<void> {
  await em.query(
    `INSERT INTO device (id, user_id, last_push_at, outbox_size) VALUES ($1, $2, now(), $3)
     ON CONFLICT (id) DO UPDATE SET user_id = EXCLUDED.user_id, last_push_at = now(), outbox_size = EXCLUDED.outbox_size`,
    [deviceId, userId, outboxSize],
  );
}

export async function knownSites(em: EntityManager, deviceId: string, userId: string): Promise<string[] | null> {
  const [row] = await em.query(`SELECT site_ids, user_id FROM device WHERE id = $1`, [deviceId]);
  if (!row || row.user_id !== userId) return null;
  return row.site_ids;
}

export async function recordPull(em: EntityManager, deviceId: string, userId: string, cursor: number, siteIds: string[]): Promise<void> {
  await em.query(
    `INSERT INTO device (id, user_id, last_pull_at, pull_cursor, site_ids) VALUES ($1, $2, now(), $3, $4)
     ON CONFLICT (id) DO UPDATE SET user_id = EXCLUDED.user_id, last_pull_at = now(), pull_cursor = EXCLUDED.pull_cursor,
       site_ids = EXCLUDED.site_ids`,
    [deviceId, userId, cursor, siteIds],
  );
}
