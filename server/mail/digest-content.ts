import type { DataSource } from 'typeorm';
import type { SessionUser } from '../../shared/auth/roles';
import type { Digest, DigestRoute } from '../../shared/board/board-wire';
import { findAnomalies } from '../board/anomalies';
import { listDevices } from '../board/devices';
import { campaignProgress } from '../campaigns/campaign-progress';
import { localClock } from './local-clock';

/** At most this many anomalies are written out; the rest are counted and wait on the Board. */
export const DIGEST_ANOMALY_LIMIT = 25;

// The digest reads for a site's leads; it reads as a role that sees the site, never as a person.
const READER: SessionUser = {
  id: '00000000-0000-0000-0000-000000000000',
  email: '',
  displayName: 'Daily digest',
  roles: ['admin'],
  siteIds: [],
};

/**
 * What a lead should know at the end of the day about one site: per open (unlocked) campaign
 * and route, what is still due or partial — straight from the progress query — then the
 * Board's anomalies and the devices that have gone silent.
 */
export async function buildDigest(ds: DataSource, siteId: string, now = new Date()): Promise<Digest | null> {
  const [site] = await ds.query(`SELECT id, name, timezone FROM site WHERE id = $1 AND NOT deleted`, [siteId]);
  if (!site) return null;
  const campaigns: { id: string; name: string; starts_on: string; ends_on: string }[] = await ds.query(
    `SELECT id, name, starts_on::text, ends_on::text FROM campaign WHERE site_id = $1 AND NOT deleted AND NOT locked ORDER BY starts_on, name`,
    [siteId],
  );
  const routeNames = new Map<string, string>(
    (await ds.query(`SELECT id, name FROM route WHERE site_id = $1`, [siteId])).map((r: { id: string; name: string }) => [r.id, r.name]),
  );
  const out: Digest['campaigns'] = [];
  for (const c of campaigns) {
    const progress = await campaignProgress(ds, READER, c.id, null);
    const routes = new Map<string, DigestRoute>();
    for (const k of progress.collars) {
      const key = k.routeId ?? '';
      const route = routes.get(key) ?? {
        routeId: k.routeId,
        routeName: k.routeId ? (routeNames.get(k.routeId) ?? 'Route') : 'Not on a route',
        due: [],
        partial: [],
        complete: 0,
        skipped: 0,
      };
      routes.set(key, route);
      if (k.state === 'due') route.due.push(k.code);
      else if (k.state === 'partial') {
        route.partial.push({
          code: k.code,
          missing: Object.entries(k.items)
            .filter(([, i]) => i.state !== 'complete' && i.state !== 'skipped')
            .map(([name, i]) => `${name} ${i.done}/${i.needed}`),
        });
      } else if (k.state === 'complete') route.complete++;
      else route.skipped++;
    }
    out.push({ id: c.id, name: c.name, startsOn: c.starts_on, endsOn: c.ends_on, routes: [...routes.values()] });
  }
  const anomalies = await findAnomalies(ds, siteId, { now });
  const devices = await listDevices(ds, [siteId], now);
  return {
    site: { id: site.id, name: site.name, timezone: site.timezone },
    localDate: localClock(now, site.timezone).date,
    campaigns: out,
    anomalies: {
      total: anomalies.items.length,
      problems: anomalies.items.filter((a) => a.severity === 'problem').length,
      items: anomalies.items.slice(0, DIGEST_ANOMALY_LIMIT),
    },
    silentDevices: devices
      .filter((d) => d.silent)
      .map((d) => ({ displayName: d.displayName, email: d.email, lastSeenAt: d.lastSeenAt, outboxSize: d.outboxSize })),
  };
}
