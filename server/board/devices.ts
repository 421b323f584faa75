import type { DataSource, EntityManager } from 'typeorm';
import type { DeviceRow } from '../../shared/board/board-wire';

/** A device is "silent" when it has neither pushed nor pulled for longer than this. */
export const SILENT_AFTER_MS = 24 * 3_600_000;

export type { DeviceRow };

const iso = (v: Date | null) => (v === null ? null : v.toISOString());

/** One device with its user, as the driver hands it over. */
interface DeviceQueryRow {
  id: string;
  user_id: string;
  email: string;
  display_name: string;
  last_push_at: Date | null;
  last_pull_at: Date | null;
  outbox_size: number | null;
  last_seen: Date | null;
}

/**
 * Every device of the users who are members of the given sites (all devices when `siteIds` is
 * null), least recently heard from first. A plain function so the daily digest can reuse it.
 */
export async function listDevices(db: DataSource | EntityManager, siteIds: string[] | null, now = new Date()): Promise<DeviceRow[]> {
  const rows: DeviceQueryRow[] = await db.query(
    `
    SELECT d.id, d.user_id, u.email, u.display_name, d.last_push_at, d.last_pull_at, d.outbox_size,
           greatest(d.last_push_at, d.last_pull_at) AS last_seen
      FROM device d JOIN app_user u ON u.id = d.user_id
     WHERE $1::uuid[] IS NULL OR EXISTS (SELECT 1 FROM site_member m WHERE m.user_id = d.user_id AND m.site_id = ANY($1::uuid[]))
     ORDER BY last_seen ASC NULLS FIRST, u.email, d.id`,
    [siteIds],
  );
  return rows.map((r) => {
    const lastSeen = iso(r.last_seen);
    return {
      id: r.id,
      userId: r.user_id,
      email: r.email,
      displayName: r.display_name,
      lastPushAt: iso(r.last_push_at),
      lastPullAt: iso(r.last_pull_at),
      outboxSize: r.outbox_size,
      lastSeenAt: lastSeen,
      silent: lastSeen === null || now.getTime() - Date.parse(lastSeen) > SILENT_AFTER_MS,
    };
  });
}
