import { FormArray, FormControl, FormGroup } from '@angular/forms';
import type { StoredRecord } from '../../../../shared/model/stored-record';
import { fromSiteWallTime, siteWallTime } from '../calibration/site-clock';
import type { Campaign, CampaignRoute } from './board-api';

/** One route of the site in the plan: walked in this campaign or not, by whom, which way. */
export type RoutePlanForm = FormGroup<{
  routeId: FormControl<string>;
  name: FormControl<string>;
  included: FormControl<boolean>;
  crewIds: FormControl<string[]>;
  direction: FormControl<CampaignRoute['direction']>;
}>;

/** One round's time window as datetime-local values: the site's wall time (not UTC, not the lead's device zone). */
export type RoundWindowForm = FormGroup<{
  round: FormControl<number>;
  from: FormControl<string>;
  to: FormControl<string>;
}>;

export type PlanForm = FormGroup<{ routes: FormArray<RoutePlanForm>; windows: FormArray<RoundWindowForm> }>;

const text = (value: string) => new FormControl(value, { nonNullable: true });

/**
 * The plan of a campaign as a form: every route of the site (with its assignment if the campaign
 * walks it) and each round's window. A route left out keeps its crew and direction fields shut;
 * a closed campaign's plan is shown but cannot be changed.
 */
export function planForm(c: Campaign, routes: readonly StoredRecord<'route'>[], zone: string): PlanForm {
  const assigned = new Map(c.routes.map((r) => [r.routeId, r]));
  const routeForms = routes.map((r) => {
    const a = assigned.get(r.id);
    const group: RoutePlanForm = new FormGroup({
      routeId: text(r.id),
      name: text(r.name),
      included: new FormControl(!!a, { nonNullable: true }),
      crewIds: new FormControl<string[]>(a?.crewIds ?? [], { nonNullable: true }),
      direction: new FormControl<CampaignRoute['direction']>(a?.direction ?? 'alternate', { nonNullable: true }),
    });
    const follow = (included: boolean) => {
      for (const control of [group.controls.crewIds, group.controls.direction]) {
        if (included) control.enable({ emitEvent: false });
        else control.disable({ emitEvent: false });
      }
    };
    follow(!!a);
    group.controls.included.valueChanges.subscribe(follow);
    return group;
  });
  const windowForms = Array.from({ length: c.rounds }, (_, i) => {
    const w = c.roundWindows.find((x) => x.round === i + 1);
    return new FormGroup({
      round: new FormControl(i + 1, { nonNullable: true }),
      from: text(w ? siteWallTime(w.from, zone) : ''),
      to: text(w ? siteWallTime(w.to, zone) : ''),
    });
  });
  const form: PlanForm = new FormGroup({ routes: new FormArray(routeForms), windows: new FormArray(windowForms) });
  // Without events: a route's 'included' follower would otherwise open its crew and direction again.
  if (c.locked) form.disable({ emitEvent: false });
  return form;
}

export type PlanChanges = Pick<Campaign, 'routes' | 'roundWindows'>;

/** The campaign fields a plan form sets; the windows typed as the site's wall time go out as UTC instants. */
export function planChanges(form: PlanForm, zone: string): { ok: true; changes: PlanChanges } | { ok: false; message: string } {
  const { routes, windows } = form.getRawValue();
  const roundWindows: PlanChanges['roundWindows'] = [];
  for (const w of windows.filter((x) => x.from && x.to)) {
    const from = fromSiteWallTime(w.from, zone);
    if (!from.ok) return { ok: false, message: `Round ${w.round} from: ${from.message}` };
    const to = fromSiteWallTime(w.to, zone);
    if (!to.ok) return { ok: false, message: `Round ${w.round} to: ${to.message}` };
    roundWindows.push({ round: w.round, from: from.iso, to: to.iso });
  }
  return {
    ok: true,
    changes: {
      routes: routes.filter((p) => p.included).map((p) => ({ routeId: p.routeId, crewIds: p.crewIds, direction: p.direction })),
      roundWindows,
    },
  };
}
