import { ChangeDetectionStrategy, Component, computed, inject, linkedSignal, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { campaignFields } from '../../../../shared/model/field-records';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { fieldProblems, serverMessage } from '../../core/api/api-error';
import { siteToday } from '../../../../shared/time/site-time';
import { BoardApi, type CampaignRoute } from './board-api';
import { BoardStore } from './board-store';
import { planChanges, planForm } from './plan-form';
import { RouteOrder } from './route-order';

// The campaign schema is refined (pick() refuses it): each field's own schema gives its default.
const { dueOffset, dueClosures, dueProbes } = campaignFields.shape;
const DUE_DEFAULTS = {
  dueOffset: dueOffset.parse(undefined),
  dueClosures: dueClosures.parse(undefined),
  dueProbes: dueProbes.parse(undefined),
};

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
  // The plan form follows the chosen campaign and the site's routes: edits hold until either changes.
  protected readonly plan = computed(() => {
    const c = this.store.campaign();
    return c ? planForm(c, this.store.routes(), this.store.zone()) : null;
  });
  protected readonly assignStatus = linkedSignal({ source: this.plan, computation: () => '' });
  protected readonly assignProblem = linkedSignal({ source: this.plan, computation: () => '' });
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

  protected async saveAssignment(): Promise<void> {
    const c = this.store.campaign();
    if (!c) return;
    this.assignStatus.set('');
    this.assignProblem.set('');
    const form = this.plan();
    if (!form) return;
    const plan = planChanges(form, this.store.zone());
    if (!plan.ok) return this.assignProblem.set(plan.message);
    try {
      const saved = await this.api.update('campaign', c.id, c.rev, plan.changes);
      this.store.replaceCampaign(saved);
      this.store.reloadProgress();
      this.assignStatus.set(`Saved: ${plan.changes.routes.length} route(s) in "${saved.name}".`);
    } catch (err) {
      this.assignProblem.set(serverMessage(err, 'The plan could not be saved'));
    }
  }
}
