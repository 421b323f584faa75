import type { EntityName } from '../../shared/model/entities';
import { guardCampaignLock } from '../board/campaign-lock';
import { recordReviewDecision } from '../closures/closure-history';
import { requestRecompute } from '../closures/recompute-triggers';
import { guardCollarTreatment } from '../setup/collar-treatment-guard';
import { guardProfileWrite } from '../setup/profile-versions';
import type { AfterWrite } from './after-write';
import type { WriteGuard } from './write-guards';

/**
 * The feature rules every write obeys, whichever path it takes (REST, sync, the seed, a script):
 * they belong to the writer, not to route wiring. Guards may refuse a write; listeners follow an
 * applied one inside its transaction. Read when a write runs (not at load), so the features may
 * import the writer themselves.
 */
export function writeGuardsFor<E extends EntityName>(entity: E): readonly WriteGuard<E>[] {
  return GUARDS[entity] ?? [];
}

const GUARDS: { [E in EntityName]?: readonly WriteGuard<E>[] } = {
  campaign: [guardCampaignLock],
  chamberProfile: [guardProfileWrite],
  collar: [guardCollarTreatment],
};

export function afterWriteListeners(): readonly AfterWrite[] {
  // The review history of lab decisions, and a recompute request when a closure's inputs change.
  return [recordReviewDecision, requestRecompute];
}
