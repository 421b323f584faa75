import type { EntityManager } from 'typeorm';
import { engineVersion, planClosureFit } from '../../shared/flux';
import type { StoredRecord } from '../../shared/model/stored-record';
import { loadClosureContext, type ClosureContext, type ClosureRefs } from './closure-inputs';

/** The closure fields a fit reads: its series and settle time, the lab's review settings, and what its inputs are looked up by. */
export type ClosureFitFields = ClosureRefs &
  Pick<
    StoredRecord<'closure'>,
    'profileId' | 'settleS' | 'series' | 'reviewSettleS' | 'reviewWindowEndS' | 'reviewModel' | 'reviewExclusions'
  >;

export interface ClosureResults {
  results: Record<string, unknown>;
  flags: string[];
  fluxUmolM2S: number | null;
}

/**
 * Runs the flux engine on a closure as stored: once with the raw settle time (`raw`, never
 * changed by review) and, when the lab moved the settle time, window or model, once more with
 * those or left points out (`review`). The flux shown is the review's when there is one.
 */
export function resultsFor(c: ClosureFitFields, ctx: ClosureContext): ClosureResults {
  const plan = planClosureFit({ startedAt: c.startedAt, profileId: c.profileId, series: c.series }, ctx);
  const raw = plan.fit({ settleS: c.settleS });
  const excluded = c.reviewExclusions.map((e) => e.index);
  const reviewed = c.reviewSettleS !== null || c.reviewWindowEndS !== null || c.reviewModel !== null || excluded.length > 0;
  const review = reviewed
    ? plan.fit({
        settleS: c.reviewSettleS ?? c.settleS,
        windowEndS: c.reviewWindowEndS,
        model: c.reviewModel ?? 'auto',
        excludedIndices: excluded,
      })
    : null;
  const shown = review ?? raw;
  const { profile: chosen, temp } = plan;
  const v = plan.volume.ok ? plan.volume.value : null;
  return {
    results: {
      engineVersion,
      volumeCm3: v?.volumeCm3 ?? null,
      areaCm2: v?.areaCm2 ?? null,
      meanOffsetCm: v?.meanOffsetCm ?? null,
      offsetSetId: v ? ((v.offsetSet as { id?: string }).id ?? null) : null,
      profileId: v ? ((v.profile as { id?: string }).id ?? null) : null,
      profileName: chosen.ok ? chosen.profile.name : null,
      profileSource: chosen.ok ? chosen.source : null,
      ambientPpm: ctx.ambientPpm,
      ambientCheckId: ctx.ambient?.checkId ?? null,
      ambientAt: ctx.ambient?.at ?? null,
      airTempSource: temp.ok ? temp.source : null,
      airTempC: temp.ok && typeof temp.tempC === 'number' ? temp.tempC : null,
      pressureIsDefault: plan.pressureIsDefault,
      slopeBasis: ctx.slopeBasis,
      raw: finite(raw),
      review: review ? finite(review) : null,
    },
    flags: shown.flags,
    fluxUmolM2S: shown.selected && Number.isFinite(shown.selected.fluxUmolM2S) ? shown.selected.fluxUmolM2S : null,
  };
}

/**
 * The derived fields of a closure about to be stored. The writer hands over any entity's record
 * untyped; a closure's has passed the closure schema (or been read from its row) by then.
 */
export async function computeClosureResults(em: EntityManager, record: Record<string, unknown>): Promise<Record<string, unknown>> {
  const c = record as ClosureFitFields;
  return { ...resultsFor(c, await loadClosureContext(em, c)) };
}

/** jsonb cannot hold NaN or Infinity: they are stored as null. */
function finite<T>(v: T): T {
  return JSON.parse(JSON.stringify(v, (_k, x) => (typeof x === 'number' && !Number.isFinite(x) ? null : x)));
}
