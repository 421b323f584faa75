import type { LocalRecord } from '../../core/db/db-schema';
import { localDay } from '../../../../shared/time/site-time';

/** What a closure needs from the day before it may start: the analyzer and the chamber profile. */
export interface DayKit {
  analyzer: LocalRecord<'analyzer'> | null;
  profile: LocalRecord<'chamberProfile'> | null;
  /** Analyzers to choose from in one tap, the last used first. */
  analyzerChoices: LocalRecord<'analyzer'>[];
  /** Profile names valid today, when the crew must pick one (several and no site default). */
  profileChoices: string[];
  /** What is missing and what to do, or '' when closures may start. */
  missing: string;
}

const live = (r: { deleted?: boolean }) => !r.deleted;

/** The versions of each profile valid on the day: the newest version per name with validFrom ≤ day. */
function validToday(profiles: readonly LocalRecord<'chamberProfile'>[], day: string): Map<string, LocalRecord<'chamberProfile'>> {
  const out = new Map<string, LocalRecord<'chamberProfile'>>();
  for (const p of profiles.filter(live)) {
    if (p.validFrom > day) continue;
    const have = out.get(p.name);
    if (!have || p.validFrom > have.validFrom) out.set(p.name, p);
  }
  return out;
}

/**
 * Today's analyzer and chamber profile. The analyzer counts only when it was chosen on the site's
 * day (a closure is never stored with no analyzer, nor with yesterday's by accident); the profile
 * is the crew's choice, else the site default, else the only one valid on the day.
 */
export function dayKit(p: {
  analyzerId: string | null;
  kitAt: string | null;
  profileId: string | null;
  site: LocalRecord<'site'> | null;
  analyzers: readonly LocalRecord<'analyzer'>[];
  profiles: readonly LocalRecord<'chamberProfile'>[];
  now?: Date;
}): DayKit {
  const tz = p.site?.timezone ?? 'UTC';
  const day = localDay((p.now ?? new Date()).toISOString(), tz);
  const analyzers = p.analyzers.filter(live);
  const chosenToday = !!p.kitAt && localDay(p.kitAt, tz) === day;
  const analyzer = chosenToday ? (analyzers.find((a) => a.id === p.analyzerId) ?? null) : null;
  const last = analyzers.find((a) => a.id === p.analyzerId);
  const analyzerChoices = last ? [last, ...analyzers.filter((a) => a !== last)] : [...analyzers];

  const valid = validToday(p.profiles, day);
  const defaultName = p.profiles.find((x) => x.id === p.site?.defaultProfileId)?.name;
  const chosenName = p.profiles.find((x) => x.id === p.profileId)?.name;
  const name = [chosenName, defaultName].find((n) => n && valid.has(n)) ?? (valid.size === 1 ? [...valid.keys()][0] : null);
  const profile = name ? valid.get(name)! : null;
  const profileChoices = profile ? [] : [...valid.keys()].sort();

  let missing = '';
  if (!analyzers.length)
    missing = 'No analyzer for this site on this device: sync when you have signal, or ask the lead to add one in Setup.';
  else if (!analyzer) missing = 'Which analyzer today? Tap it to start closures (or do the start of day).';
  else if (!valid.size)
    missing = 'No chamber profile valid today on this device: sync when you have signal, or ask the lead to add one in Setup.';
  else if (!profile) missing = 'Which chamber today? Tap its profile to start closures.';
  return { analyzer, profile, analyzerChoices, profileChoices, missing };
}
