import { ChangeDetectionStrategy, Component, effect, inject, input, output, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { QC_FLAGS } from '../../../../shared/flux';
import { BenchApi, type Named, type QueueFilter } from './bench-api';

/** The queue's filters: design, fit and the context of the day. Emits a whole filter on every change. */
@Component({
  selector: 'fw-queue-filters',
  imports: [FormsModule],
  templateUrl: './queue-filters.html',
  styleUrl: './bench.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class QueueFilters {
  readonly siteId = input.required<string>();
  readonly changed = output<QueueFilter>();
  private readonly api = inject(BenchApi);
  protected readonly flags = Object.keys(QC_FLAGS);
  protected readonly campaigns = signal<Named[]>([]);
  protected readonly plots = signal<Named[]>([]);
  protected readonly treatments = signal<Named[]>([]);
  protected readonly collars = signal<Named[]>([]);
  protected f: Record<string, string> = {};

  constructor() {
    effect(() => {
      const site = this.siteId();
      void Promise.all([this.api.list('campaigns', site), this.api.list('plots', site), this.api.list('treatments', site), this.api.list('collars', site)])
        .then(([c, p, t, k]) => { this.campaigns.set(c); this.plots.set(p); this.treatments.set(t); this.collars.set(k); });
      this.f = {};
      this.emit();
    });
  }

  protected set(key: string, value: string): void {
    this.f = { ...this.f, [key]: value };
    this.emit();
  }

  private emit(): void {
    const n = (k: string) => (this.f[k] ? Number(this.f[k]) : undefined);
    const b = (k: string) => (this.f[k] === 'yes' ? true : this.f[k] === 'no' ? false : undefined);
    const s = (k: string) => this.f[k] || undefined;
    this.changed.emit({
      siteId: this.siteId(), campaignId: s('campaignId'), round: n('round'), treatmentId: s('treatmentId'), plotId: s('plotId'),
      collarId: s('collarId'), flag: s('flag'), reviewState: s('reviewState') as QueueFilter['reviewState'],
      installedWithinDays: n('installedWithinDays'), clippedWithinDays: n('clippedWithinDays'), rain24h: b('rain24h'),
      calibrationOlderThanDays: n('calibrationOlderThanDays'), driftAtLeastPpm: n('driftAtLeastPpm'), leakFailed: b('leakFailed'),
      recomputedSinceReview: b('recomputedSinceReview'),
    });
  }
}
