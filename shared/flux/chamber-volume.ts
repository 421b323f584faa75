/**
 * Total system volume of a closure: V = chamber volume + loop volume + A × mean offset
 * (plain geometry, REFERENCES.md §8). The chamber profile is the version valid on the closure
 * day (latest validFrom ≤ day); the offset set is the collar's latest one taken on or before
 * that day, else the earliest after it, flagged `offset-after`. Inputs are plain arrays so the
 * server and the device compute exactly the same volume.
 *
 * Dates compare as calendar days (the first 10 characters, YYYY-MM-DD, of an ISO date or
 * timestamp): callers pass the site's local day so that a morning closure and an afternoon
 * offset set of the same visit count as the same day.
 */
export interface ChamberProfileVersion {
  validFrom: string;
  chamberVolumeCm3: number;
  loopVolumeCm3: number;
  /** Soil area A: the collar's own inside area (DESIGN.md), used for the collar headspace and the flux. */
  areaCm2: number;
  /** The chamber's footprint as the profile states it; only compared with A (footprint-area-differs). */
  footprintAreaCm2?: number | null;
}

export interface OffsetSetRecord {
  takenOn: string;
  /** Rim heights above the soil, cm, as read around the collar (null = not read). */
  offsetsCm: readonly (number | null)[];
}

export interface ChamberVolume {
  volumeCm3: number;
  areaCm2: number;
  meanOffsetCm: number;
  /** The profile's footprint (null when it states none), for the footprint-area-differs check. */
  footprintAreaCm2: number | null;
  profile: ChamberProfileVersion;
  offsetSet: OffsetSetRecord;
  flags: 'offset-after'[];
}

export type ChamberVolumeOutcome = { ok: true; value: ChamberVolume } | { ok: false; error: string };

const day = (isoDateOrTimestamp: string): string => isoDateOrTimestamp.slice(0, 10);

export function meanOffsetCm(set: OffsetSetRecord): number {
  let sum = 0;
  let n = 0;
  for (const v of set.offsetsCm) {
    if (typeof v === 'number' && Number.isFinite(v)) {
      sum += v;
      n++;
    }
  }
  return n > 0 ? sum / n : NaN;
}

/** The profile version valid on `closureDay`, or null when every version starts later. */
export function profileValidOn<P extends Pick<ChamberProfileVersion, 'validFrom'>>(profiles: readonly P[], closureDay: string): P | null {
  const d = day(closureDay);
  let best: P | null = null;
  for (const p of profiles) {
    if (day(p.validFrom) <= d && (!best || day(p.validFrom) > day(best.validFrom))) best = p;
  }
  return best;
}

/** Latest usable offset set on or before the day, else the earliest after it. */
export function offsetSetFor<S extends OffsetSetRecord>(sets: readonly S[], closureDay: string): { set: S; after: boolean } | null {
  const d = day(closureDay);
  let before: S | null = null;
  let after: S | null = null;
  for (const s of sets) {
    if (!Number.isFinite(meanOffsetCm(s))) continue;
    const sd = day(s.takenOn);
    if (sd <= d) {
      if (!before || sd > day(before.takenOn)) before = s;
    } else if (!after || sd < day(after.takenOn)) {
      after = s;
    }
  }
  if (before) return { set: before, after: false };
  return after ? { set: after, after: true } : null;
}

export function chamberVolumeFor(
  closureDay: string,
  profiles: readonly ChamberProfileVersion[],
  offsetSets: readonly OffsetSetRecord[],
): ChamberVolumeOutcome {
  const profile = profileValidOn(profiles, closureDay);
  if (!profile) return { ok: false, error: `no chamber profile valid on ${day(closureDay)}` };
  const chosen = offsetSetFor(offsetSets, closureDay);
  if (!chosen) return { ok: false, error: 'no offset set for this collar' };
  const mean = meanOffsetCm(chosen.set);
  return {
    ok: true,
    value: {
      volumeCm3: profile.chamberVolumeCm3 + profile.loopVolumeCm3 + profile.areaCm2 * mean,
      areaCm2: profile.areaCm2,
      meanOffsetCm: mean,
      footprintAreaCm2: profile.footprintAreaCm2 ?? null,
      profile,
      offsetSet: chosen.set,
      flags: chosen.after ? ['offset-after'] : [],
    },
  };
}

/** Collar area from its inner diameter, A = π d²/4. */
export function roundCollarAreaCm2(innerDiameterCm: number): number {
  return (Math.PI * innerDiameterCm * innerDiameterCm) / 4;
}
