import { ChangeDetectionStrategy, Component, computed, effect, inject, input, output, resource, untracked } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatExpansionModule } from '@angular/material/expansion';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { narrowScreen } from '../../core/layout/narrow-screen';
import { QC_FLAGS } from '../../../../shared/flux';
import { REVIEW_STATE_WORDS, REVIEW_STATES } from '../../../../shared/model/progress-state';
import { FlagWordsPipe } from '../closures/flag-words-pipe';
import type { QueueFilter, ReviewState } from '../../../../shared/bench/review-wire';
import { BenchApi } from './bench-api';

type YesNo = '' | 'yes' | 'no';
const yesNo = (v: YesNo) => (v === 'yes' ? true : v === 'no' ? false : undefined);

/**
 * The queue's filters: design, fit and the context of the day. Emits a whole filter on every change
 * (a typed number once the field is left, as its change event did). The panel folds on a phone (the
 * queue comes first there) and says which filters are set.
 */
@Component({
  selector: 'fw-queue-filters',
  imports: [FlagWordsPipe, MatExpansionModule, MatInputModule, MatSelectModule, ReactiveFormsModule],
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
  protected readonly yesNo = [
    { key: 'rain24h', label: 'Rain in the last 24 h' },
    { key: 'leakFailed', label: 'Failed leak check that day' },
    { key: 'recomputedSinceReview', label: 'Recomputed since review' },
  ] as const;
  protected readonly phone = narrowScreen();

  private readonly fb = inject(NonNullableFormBuilder);
  private readonly days = () => this.fb.control<number | null>(null, { updateOn: 'blur' });
  protected readonly form = this.fb.group({
    campaignId: '',
    round: this.days(),
    treatmentId: '',
    plotId: '',
    collarId: '',
    flag: '',
    reviewState: this.fb.control<'' | ReviewState>(''),
    installedWithinDays: this.days(),
    clippedWithinDays: this.days(),
    rain24h: this.fb.control<YesNo>(''),
    leakFailed: this.fb.control<YesNo>(''),
    recomputedSinceReview: this.fb.control<YesNo>(''),
    calibrationOlderThanDays: this.days(),
    driftAtLeastPpm: this.days(),
  });
  private readonly value = toSignal(this.form.valueChanges, { initialValue: this.form.getRawValue() });
  protected readonly summary = computed(() => {
    const set = Object.values(this.value()).filter((v) => v !== '' && v !== null && v !== undefined).length;
    return set ? `${set} set` : 'All closures';
  });

  /** The site's campaigns, plots, treatments and collars to choose from (every page of each). */
  private readonly choices = resource({
    params: () => this.siteId(),
    loader: async ({ params: site }) => {
      const [campaigns, plots, treatments, collars] = await Promise.all([
        this.api.list('campaigns', site),
        this.api.list('plots', site),
        this.api.list('treatments', site),
        this.api.list('collars', site),
      ]);
      return { campaigns, plots, treatments, collars };
    },
  });
  private readonly listed = computed(() => (this.choices.hasValue() ? this.choices.value() : null));
  protected readonly campaigns = computed(() => this.listed()?.campaigns ?? []);
  protected readonly plots = computed(() => this.listed()?.plots ?? []);
  protected readonly treatments = computed(() => this.listed()?.treatments ?? []);
  protected readonly collars = computed(() => this.listed()?.collars ?? []);

  constructor() {
    this.form.valueChanges.subscribe(() => this.emit());
    // Another site starts with no filter set (the reset emits that filter); nothing is loaded here.
    effect(() => {
      this.siteId();
      untracked(() => this.form.reset());
    });
  }

  private emit(): void {
    const v = this.form.getRawValue();
    const text = (s: string) => s || undefined;
    const num = (n: number | null) => n ?? undefined;
    this.changed.emit({
      siteId: this.siteId(),
      campaignId: text(v.campaignId),
      round: num(v.round),
      treatmentId: text(v.treatmentId),
      plotId: text(v.plotId),
      collarId: text(v.collarId),
      flag: text(v.flag),
      reviewState: v.reviewState || undefined,
      installedWithinDays: num(v.installedWithinDays),
      clippedWithinDays: num(v.clippedWithinDays),
      rain24h: yesNo(v.rain24h),
      calibrationOlderThanDays: num(v.calibrationOlderThanDays),
      driftAtLeastPpm: num(v.driftAtLeastPpm),
      leakFailed: yesNo(v.leakFailed),
      recomputedSinceReview: yesNo(v.recomputedSinceReview),
    });
  }
}
