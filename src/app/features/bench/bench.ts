import { DecimalPipe } from '@angular/common';
import { MatButtonModule } from '@angular/material/button';
import { MatListModule } from '@angular/material/list';
import { ChangeDetectionStrategy, Component, computed, inject, signal, viewChild } from '@angular/core';
import { RouterLink } from '@angular/router';
import { reviewStateWords } from '../../../../shared/model/progress-state';
import { serverMessage } from '../../core/api/api-error';
import { SiteChoice } from '../../core/auth/site-choice';
import type { ClosureDetail, QueueFilter, QueueItem } from '../../../../shared/bench/review-wire';
import { BenchApi } from './bench-api';
import { FlagWordsPipe } from '../closures/flag-words-pipe';
import { ClosureView, type Decision } from './closure-view';
import { BenchResults } from './results/bench-results';
import { QueueFilters } from './queue-filters';
import { RecomputePanel } from './recompute-panel';

const SETTLE_STEP_S = 5;

/**
 * The lab's review of synced closures: a filtered queue on the left, the selected closure on the
 * right. Keyboard: A accept (and go on), R reject (type the reason, Enter), J/↓ next, K/↑ previous,
 * ] widen the settle time by 5 s, [ narrow it. Keys are ignored while typing in a field.
 */
@Component({
  selector: 'fw-bench',
  imports: [
    BenchResults,
    ClosureView,
    DecimalPipe,
    FlagWordsPipe,
    MatButtonModule,
    MatListModule,
    QueueFilters,
    RecomputePanel,
    RouterLink,
  ],
  templateUrl: './bench.html',
  styleUrl: './bench.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '(document:keydown)': 'handleKey($event)' },
})
export class Bench {
  private readonly api = inject(BenchApi);
  protected readonly site = inject(SiteChoice).current;
  protected readonly filter = signal<QueueFilter | null>(null);
  protected readonly items = signal<QueueItem[]>([]);
  protected readonly total = signal(0);
  protected readonly index = signal(-1);
  protected readonly detail = signal<ClosureDetail | null>(null);
  protected readonly busy = signal(false);
  protected readonly message = signal('');
  protected readonly problem = signal('');
  /** Results (aggregates, responses, totals, export) share the screen; review keys are off while they show. */
  protected readonly showResults = signal(false);
  protected readonly reviewWords = reviewStateWords;
  protected readonly unflagged = computed(() => this.items().filter((i) => !i.flags.length && i.reviewState === 'unreviewed').length);
  private readonly view = viewChild(ClosureView);
  private loadSeq = 0;

  protected async applyFilter(f: QueueFilter): Promise<void> {
    this.filter.set(f);
    const seq = ++this.loadSeq;
    try {
      const page = await this.api.queue(f, 0, 500);
      if (seq !== this.loadSeq) return;
      this.items.set(page.items);
      this.total.set(page.total);
      this.problem.set('');
      await this.select(page.items.length ? 0 : -1);
    } catch (err) {
      this.problem.set(serverMessage(err, 'The queue could not be loaded'));
    }
  }

  /** Re-reads the queue with the current filter (after a recompute changed closures). */
  protected async reload(): Promise<void> {
    const f = this.filter();
    if (f) await this.applyFilter(f);
  }

  protected async select(i: number): Promise<void> {
    this.index.set(i);
    const item = this.items()[i];
    this.detail.set(item ? await this.api.detail(item.id) : null);
  }

  protected async decide(d: Decision): Promise<void> {
    const det = this.detail();
    if (!det || this.busy()) return;
    this.busy.set(true);
    try {
      const { record } = d.move
        ? await this.api.move(det.closure.id, d.move)
        : d.points
          ? await this.api.changePoints(det.closure.id, d.points)
          : await this.api.decide(det.closure.id, det.closure.rev, d.fields);
      const i = this.index();
      this.items.update((list) =>
        list.map((x) =>
          x.id === record.id
            ? {
                ...x,
                rev: record.rev,
                reviewState: record.reviewState,
                fluxUmolM2S: record.fluxUmolM2S,
                flags: record.flags,
                recomputedSinceReview: null,
                changedSinceReview: d.fields.reviewState ? null : x.changedSinceReview,
              }
            : x,
        ),
      );
      this.message.set(
        d.fields.reviewState
          ? `Closure ${d.fields.reviewState}`
          : d.move
            ? 'Moved to the other visit and recomputed'
            : d.points
              ? 'exclude' in d.points
                ? 'Recomputed without those points'
                : 'Recomputed with those points back'
              : 'Recomputed with the new settings',
      );
      this.problem.set('');
      if (d.fields.reviewState === 'accepted' && i < this.items().length - 1) await this.select(i + 1);
      else {
        const fresh = await this.api.detail(det.closure.id);
        this.detail.set(fresh);
        // A moved closure names another collar (and maybe round) in the queue too.
        if (d.move) this.items.update((list) => list.map((x) => (x.id === fresh.closure.id ? { ...x, ...fresh.context } : x)));
      }
    } catch (err) {
      this.problem.set(serverMessage(err, 'The decision was not saved'));
    } finally {
      this.busy.set(false);
    }
  }

  protected async bulkAccept(): Promise<void> {
    const f = this.filter();
    if (!f || this.busy()) return;
    this.busy.set(true);
    try {
      const r = await this.api.bulkAccept(f);
      this.message.set(`${r.accepted} closures without flags accepted${r.skipped.length ? `; ${r.skipped.length} skipped` : ''}`);
    } catch (err) {
      this.problem.set(serverMessage(err, 'Bulk accept failed'));
    } finally {
      this.busy.set(false);
    }
    await this.applyFilter(f);
  }

  protected handleKey(e: KeyboardEvent): void {
    if (this.showResults()) return;
    const t = e.target as HTMLElement | null;
    const typing = t && (/^(INPUT|SELECT|TEXTAREA|BUTTON)$/.test(t.tagName) || t.closest('[role=combobox], [role=listbox], [role=option]'));
    if (e.ctrlKey || e.metaKey || e.altKey || (typing && e.key !== 'Escape')) return;
    const v = this.view();
    const go = (by: number) => {
      const i = this.index() + by;
      if (i >= 0 && i < this.items().length) void this.select(i);
    };
    switch (e.key) {
      case 'a':
      case 'A':
        v?.accept();
        break;
      case 'r':
      case 'R':
        v?.focusReason();
        break;
      case 'j':
      case 'ArrowDown':
        go(1);
        break;
      case 'k':
      case 'ArrowUp':
        go(-1);
        break;
      case ']':
        v?.nudgeSettle(SETTLE_STEP_S);
        break;
      case '[':
        v?.nudgeSettle(-SETTLE_STEP_S);
        break;
      default:
        return;
    }
    e.preventDefault();
  }
}
