import type { DataSource } from 'typeorm';
import type { MemberRow } from '../../shared/board/board-wire';

export type { MemberRow };

/** The people a lead can assign to a route: enabled members of the site who walk (crew or lead). */
export async function fieldMembers(ds: DataSource, siteId: string): Promise<MemberRow[]> {
  const rows: { id: string; display_name: string; email: string; roles: string[] }[] = await ds.query(
    `
    SELECT u.id, u.display_name, u.email, u.roles FROM site_member m JOIN app_user u ON u.id = m.user_id
     WHERE m.site_id = $1 AND NOT u.disabled AND u.roles && ARRAY['crew','lead']::text[] ORDER BY u.display_name`,
    [siteId],
  );
  return rows.map((r) => ({ id: r.id, displayName: r.display_name, email: r.email, roles: r.roles }));
}
