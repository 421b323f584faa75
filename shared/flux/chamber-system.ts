/**
 * Which chamber system a closure was measured with. A site may run several chamber + analyzer
 * systems on one day (two crews, or a tall and a short chamber). A closure carries the profile and
 * the analyzer the crew chose at the start of the day; its volume and its ambient CO2 come from
 * those, never from whichever profile or analyzer happens to be newest at the site.
 *
 * Profile versions of one chamber share a name (a new version is a new record from its validFrom
 * day on, chamber-volume.ts). The closure's profile names the chamber; the version of that chamber
 * valid on the closure's local day gives the geometry, so a version added later for an earlier day
 * (a tubing change recorded late) still applies.
 */
import { profileValidOn, type ChamberProfileVersion } from './chamber-volume';

export interface NamedProfileVersion extends ChamberProfileVersion {
  id: string;
  name: string;
}

/** How the chamber was chosen: the closure's own profile, or (a closure that names none) the site's default or only chamber. */
export type ProfileSource = 'closure' | 'site-default' | 'only-chamber';

export type ProfileChoice<P extends NamedProfileVersion> = { ok: true; profile: P; source: ProfileSource } | { ok: false; error: string };

/**
 * The profile version a closure's volume uses: the version valid on `day` of the chamber the
 * closure names (`closureProfileId`); a closure that names none uses the site's default chamber,
 * or the site's only chamber; with several chambers and no default it is refused, because
 * guessing one would give a wrong volume without a warning.
 */
export function profileForClosure<P extends NamedProfileVersion>(
  profiles: readonly P[],
  closureProfileId: string | null | undefined,
  day: string,
  siteDefaultProfileId: string | null | undefined,
): ProfileChoice<P> {
  const own = closureProfileId ? profiles.find((p) => p.id === closureProfileId) : undefined;
  if (closureProfileId && !own)
    return { ok: false, error: 'the closure’s chamber profile no longer exists: choose the profile on the Bench' };
  let name: string;
  let source: ProfileSource;
  if (own) {
    name = own.name;
    source = 'closure';
  } else {
    const fallback = siteDefaultProfileId ? profiles.find((p) => p.id === siteDefaultProfileId) : undefined;
    const names = [...new Set(profiles.map((p) => p.name))];
    if (fallback) {
      name = fallback.name;
      source = 'site-default';
    } else if (names.length === 1) {
      name = names[0];
      source = 'only-chamber';
    } else if (names.length === 0) {
      return { ok: false, error: `no chamber profile valid on ${day.slice(0, 10)}` };
    } else {
      return {
        ok: false,
        error: `the closure names no chamber profile and the site has ${names.length} chambers (${names.join(', ')}) and no default: choose the profile on the Bench`,
      };
    }
  }
  const version = profileValidOn(
    profiles.filter((p) => p.name === name),
    day,
  );
  if (!version) return { ok: false, error: `no version of chamber profile “${name}” valid on ${day.slice(0, 10)}` };
  return { ok: true, profile: version, source };
}

export interface AmbientCheck {
  id: string;
  analyzerId: string | null;
  /** ISO date-time of the reading. */
  at: string;
  co2Ppm: number;
}

/**
 * Ambient CO2 near the ground changes over a day (night-time build-up under a stable boundary
 * layer): a reading further than this from a closure does not describe the air that closure
 * started from. Our own choice (half a day), not a published constant.
 */
export const AMBIENT_MAX_GAP_H = 12;

export interface AmbientChoice {
  ppm: number;
  checkId: string;
  at: string;
  /** Minutes between the reading and the closure's start (absolute). */
  gapMin: number;
}

/**
 * The ambient reading a closure is compared with: a check of the closure's own analyzer (another
 * analyzer's calibration differs), the one nearest in time to the closure's start, within
 * AMBIENT_MAX_GAP_H hours. Null when the closure names no analyzer or there is no such reading.
 */
export function ambientForClosure(
  checks: readonly AmbientCheck[],
  analyzerId: string | null | undefined,
  startedAt: string,
): AmbientChoice | null {
  if (!analyzerId) return null;
  const t = Date.parse(startedAt);
  if (!Number.isFinite(t)) return null;
  let best: AmbientChoice | null = null;
  for (const c of checks) {
    if (c.analyzerId !== analyzerId || !Number.isFinite(c.co2Ppm)) continue;
    const gapMin = Math.abs(Date.parse(c.at) - t) / 60000;
    if (!(gapMin <= AMBIENT_MAX_GAP_H * 60)) continue;
    if (!best || gapMin < best.gapMin || (gapMin === best.gapMin && c.at > best.at))
      best = { ppm: c.co2Ppm, checkId: c.id, at: c.at, gapMin };
  }
  return best;
}
