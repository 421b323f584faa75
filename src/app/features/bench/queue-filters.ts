import { ChangeDetectionStrategy, Component, computed, effect, inject, input, output, signal, untracked } from '@angular/core';
import { MatExpansionModule } from '@angular/material/expansion';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { narrowScreen } from '../../core/layout/narrow-screen';
import { QC_FLAGS } from '../../../../shared/flux';
import { REVIEW_STATE_WORDS, REVIEW_STATES } from '../../../../shared/model/progress-state';
import { FlagWordsPipe } from '../closures/flag-words-pipe';
import type { QueueFilter } from '../../../../shared/bench/review-wire';
import { BenchApi, type Named } from './bench-api';

/**
 * The queue's filters: design, fit and the context of the day. Emits a whole filter on every change.
 * The panel folds on a phone (the queue comes first there) and says which filters are set.
 */
@Component({
  selector: 'fw-queue-filters',
  imports: [FlagWordsPipe, MatExpansionModule, MatInputModule, MatSelectModule],
  templateUrl: './queue-filters.html',
  styleUrl: './bench.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class QueueFilters {
  readonly siteId = input.required<string>();
  readonly changed = output<QueueFilter>();
  private readonly api = inject(BenchApi);
  protected readonly flags = Object.keys(QC_FLAGS);
  protected readonly reviewStates = REVIEW_STATES;
  protected readonly reviewWords = REVIEW_STATE_WORDS;
  protected readonly campaigns = signal<Named[]>([]);
  protected readonly plots = signal<Named[]>([]);
  protected readonly treatments = signal<Named[]>([]);
  protected readonly collars = signal<Named[]>([]);
  protected readonly yesNo = [
    { key: 'rain24h', label: 'Rain in the last 24 h' },
    { key: 'leakFailed', label: 'Failed leak check that day' },
    { key: 'recomputedSinceReview', label: 'Recomputed since review' },
  ];
  protected readonly phone = narrowScreen();
  private readonly current = signal<Record<string, string>>({});
  protected get f(): Partial<Record<string, string>> {
    return this.current();
  }
  protected readonly summary = computed(() => {
    const set = Object.values(this.current()).filter((v) => v !== '' && v !== undefined).length;
    return set ? `${set} set` : 'All closures';
  });

  constructor() {
    effect(() => {
      const site = this.siteId();
      void Promise.all([
        this.api.list('campaigns', site),
        this.api.list('plots', site),
        this.api.list('treatments', site),
        this.api.list('collars', site),
      ]).then(([c, p, t, k]) => {
        this.campaigns.set(c);
        this.plots.set(p);
        this.treatments.set(t);
        this.collars.set(k);
      });
      untracked(() => {
        this.current.set({});
        this.emit();
      });
    });
  }

  protected set(key: string, value: string): void {
    this.current.set({ ...this.current(), [key]: value });
    this.emit();
  }

  private emit(): void {
    const n = (k: string) => (this.f[k] ? Number(this.f[k]) : undefined);
    const b = (k: string) => (this.f[k] === 'yes' ? true : this.f[k] === 'no' ? false : undefined);
    const s = (k: string) => this.f[k] || undefined;
    this.changed.emit({
      siteId: this.siteId(),
      campaignId: s('campaignId'),
      round: n('round'),
      treatmentId: s('treatmentId'),
      plotId: s('plotId'),
      collarId: s('collarId'),
      flag: s('flag'),
      reviewState: s('reviewState') as QueueFilter['reviewState'],
      installedWithinDays: n('installedWithinDays'),
      clippedWithinDays: n('clippedWithinDays'),
      rain24h: b('rain24h'),
      calibrationOlderThanDays: n('calibrationOlderThanDays'),
      driftAtLeastPpm: n('driftAtLeastPpm'),
      leakFailed: b('leakFailed'),
      recomputedSinceReview: b('recomputedSinceReview'),
    });
  }
}
