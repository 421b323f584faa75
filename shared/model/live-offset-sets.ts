/** What the supersession rule needs of an offset set. */
export interface OffsetSetLink {
  id: string;
  supersedesId: string | null;
  deleted?: boolean;
}

/**
 * A collar's offset sets that still count: not deleted, and not replaced by a later set that is
 * itself not deleted (a correction supersedes the set it names; both are kept as the record).
 */
export function liveOffsetSets<S extends OffsetSetLink>(sets: readonly S[]): S[] {
  const kept = sets.filter((s) => !s.deleted);
  const superseded = new Set(kept.map((s) => s.supersedesId).filter((id): id is string => !!id));
  return kept.filter((s) => !superseded.has(s.id));
}
