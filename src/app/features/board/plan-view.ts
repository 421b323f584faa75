import { ChangeDetectionStrategy, Component, computed, inject, linkedSignal, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { campaignFields } from '../../../../shared/model/field-records';
import type { StoredRecord } from '../../../../shared/model/stored-record';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { fieldProblems, serverMessage } from '../../core/api/api-error';
import { siteToday } from '../../../../shared/time/site-time';
import { fromSiteWallTime, siteWallTime } from '../calibration/site-clock';
import { BoardApi, type Campaign, type CampaignRoute } from './board-api';
import { BoardStore } from './board-store';
import { RouteOrder } from './route-order';

// The campaign schema is refined (pick() refuses it): each field's own schema gives its default.
const { dueOffset, dueClosures, dueProbes } = campaignFields.shape;
const DUE_DEFAULTS = {
  dueOffset: dueOffset.parse(undefined),
  dueClosures: dueClosures.parse(undefined),
  dueProbes: dueProbes.parse(undefined),
};

interface RoutePlan {
  routeId: string;
  name: string;
  included: boolean;
  crewIds: string[];
  direction: CampaignRoute['direction'];
}
interface Window {
  round: number;
  from: string;
  to: string;
}

/**
 * Planning: a new campaign (dates, rounds — several a day for diel work —, due items), then for
 * the chosen campaign which routes it walks, who walks them, in which direction, and each
 * round's time window; and the order of each route (drag and drop).
 */
@Component({
  selector: 'fw-plan-view',
  imports: [ReactiveFormsModule, MatButtonModule, MatCheckboxModule, MatFormFieldModule, MatInputModule, MatSelectModule, RouteOrder],
  templateUrl: './plan-view.html',
  styleUrl: './plan-view.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PlanView {
  protected readonly store = inject(BoardStore);
  private readonly api = inject(BoardApi);

  private readonly fb = inject(NonNullableFormBuilder);
  /** A new campaign: today at the site, one round, and the schema's due items. */
  protected readonly draft = this.fb.group({
    name: '',
    startsOn: siteToday(this.store.zone()),
    endsOn: siteToday(this.store.zone()),
    rounds: this.fb.control<number | null>(1),
    dueOffset: DUE_DEFAULTS.dueOffset,
    dueClosures: this.fb.control<number | null>(DUE_DEFAULTS.dueClosures),
    dueProbes: DUE_DEFAULTS.dueProbes,
  });
  protected readonly createProblem = signal('');
  protected readonly createStatus = signal('');
  // The assignment form follows the chosen campaign and the site's routes: edits hold until either changes.
  protected readonly plans = linkedSignal(() => plansOf(this.store.campaign(), this.store.routes()));
  protected readonly windows = linkedSignal(() => windowsOf(this.store.campaign(), this.store.zone()));
  protected readonly assignStatus = linkedSignal({ source: this.plans, computation: () => '' });
  protected readonly assignProblem = linkedSignal({ source: this.plans, computation: () => '' });
  protected readonly locked = computed(() => this.store.campaign()?.locked ?? false);
  protected readonly directions: { value: CampaignRoute['direction']; label: string }[] = [
    { value: 'alternate', label: 'Alternate each round' },
    { value: 'forward', label: 'Always forward' },
    { value: 'reverse', label: 'Always reverse' },
  ];

  constructor() {
    void this.store.ensureCollars();
  }

  protected async create(): Promise<void> {
    this.createProblem.set('');
    this.createStatus.set('');
    const site = this.store.site();
    if (!site) return;
    try {
      const d = this.draft.getRawValue();
      // An emptied number field sends 0, as it did before (the server says what is wrong with it).
      const c = await this.api.create('campaign', {
        siteId: site.id,
        ...d,
        rounds: d.rounds ?? 0,
        dueClosures: d.dueClosures ?? 0,
        routes: [],
      });
      this.store.replaceCampaign(c);
      this.store.choose(c.id);
      this.createStatus.set(`Campaign "${c.name}" created: choose its routes and crews below.`);
      this.draft.controls.name.reset();
    } catch (err) {
      const fields = fieldProblems(err)
        .map((p) => `${p.path}: ${p.message}`)
        .join('; ');
      this.createProblem.set(`${serverMessage(err, 'The campaign could not be created')}${fields ? ` (${fields})` : ''}`);
    }
  }

  protected update(routeId: string, change: Partial<RoutePlan>): void {
    this.plans.update((ps) => ps.map((p) => (p.routeId === routeId ? { ...p, ...change } : p)));
  }

  protected setWindow(round: number, key: 'from' | 'to', value: string): void {
    this.windows.update((ws) => ws.map((w) => (w.round === round ? { ...w, [key]: value } : w)));
  }

  protected async saveAssignment(): Promise<void> {
    const c = this.store.campaign();
    if (!c) return;
    this.assignStatus.set('');
    this.assignProblem.set('');
    const routes = this.plans()
      .filter((p) => p.included)
      .map((p) => ({ routeId: p.routeId, crewIds: p.crewIds, direction: p.direction }));
    // datetime-local values are the site's wall time; the wire carries UTC instants.
    const zone = this.store.zone();
    const roundWindows: { round: number; from: string; to: string }[] = [];
    for (const w of this.windows().filter((x) => x.from && x.to)) {
      const from = fromSiteWallTime(w.from, zone);
      const to = fromSiteWallTime(w.to, zone);
      if (!from.ok) return this.assignProblem.set(`Round ${w.round} from: ${from.message}`);
      if (!to.ok) return this.assignProblem.set(`Round ${w.round} to: ${to.message}`);
      roundWindows.push({ round: w.round, from: from.iso, to: to.iso });
    }
    try {
      const saved = await this.api.update('campaign', c.id, c.rev, { routes, roundWindows });
      this.store.replaceCampaign(saved);
      await this.store.loadProgress();
      this.assignStatus.set(`Saved: ${routes.length} route(s) in "${saved.name}".`);
    } catch (err) {
      this.assignProblem.set(serverMessage(err, 'The plan could not be saved'));
    }
  }
}

function plansOf(c: Campaign | null, routes: readonly StoredRecord<'route'>[]): RoutePlan[] {
  const assigned = new Map((c?.routes ?? []).map((r) => [r.routeId, r]));
  return routes.map((r) => ({
    routeId: r.id,
    name: r.name,
    included: assigned.has(r.id),
    crewIds: assigned.get(r.id)?.crewIds ?? [],
    direction: assigned.get(r.id)?.direction ?? 'alternate',
  }));
}

/** Each round's window as datetime-local values: the site's wall time (not UTC, not the lead's device zone). */
function windowsOf(c: Campaign | null, zone: string): Window[] {
  if (!c) return [];
  return Array.from({ length: c.rounds }, (_, i) => {
    const w = c.roundWindows.find((x) => x.round === i + 1);
    return { round: i + 1, from: w ? siteWallTime(w.from, zone) : '', to: w ? siteWallTime(w.to, zone) : '' };
  });
}
