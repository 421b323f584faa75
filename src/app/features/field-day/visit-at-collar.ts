import { liveOffsetSets, type OffsetSetLink } from '../../../../shared/model/live-offset-sets';

/** The record with the latest ISO time (or date) in `at`; null for an empty list. */
export const newest = <R>(list: readonly R[], at: (r: R) => string): R | null =>
  [...list].sort((a, b) => at(b).localeCompare(at(a)))[0] ?? null;

/** The visit a collar has in one round of a campaign: its newest live one (a device may hold an older copy too). */
export function visitInRound<V extends { campaignId: string; round: number; arrivedAt: string; deleted?: boolean }>(
  visitsOfCollar: readonly V[],
  campaignId: string | null,
  round: number,
): V | null {
  return newest(
    visitsOfCollar.filter((v) => !v.deleted && v.campaignId === campaignId && v.round === round),
    (v) => v.arrivedAt,
  );
}

/** The offset set that counts at a visit: the newest live set taken there (a correction replaces the set it names). */
export function offsetSetAtVisit<S extends OffsetSetLink & { visitId: string; takenAt: string }>(
  setsOfCollar: readonly S[],
  visitId: string,
): S | null {
  return newest(
    liveOffsetSets(setsOfCollar).filter((s) => s.visitId === visitId),
    (s) => s.takenAt,
  );
}
