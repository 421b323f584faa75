import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  computed,
  inject,
  input,
  output,
  resource,
  signal,
  untracked,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { serverMessage } from '../../core/api/api-error';
import { AuthStore } from '../../core/auth/auth-store';
import { SiteTimePipe } from '../../core/time/site-time-pipe';
import { BenchApi, type RecomputeJob } from './bench-api';

/** How often a queued or running recompute is asked for its progress. */
export const RECOMPUTE_POLL_MS = 1500;
/** Recompute jobs of the site listed at once (newest first). */
const SHOWN = 3;

const STATE_WORDS: Record<RecomputeJob['state'], string> = {
  queued: 'waiting',
  active: 'running',
  completed: 'finished',
  failed: 'failed',
};

/**
 * Recomputes of the chosen site: the server starts one by itself when an offset set is
 * superseded, a profile version added or a site default changed; the lab may ask for one here.
 * Shows each job's progress while it runs and, when it ends, how many closures it looked at and
 * changed. Emits `changed` when a job that changed closures finishes, so the queue is re-read.
 */
@Component({
  selector: 'fw-recompute-panel',
  imports: [MatButtonModule, MatProgressBarModule, SiteTimePipe],
  template: `
    <section class="recompute" aria-labelledby="recompute-heading">
      <h2 id="recompute-heading">Recompute</h2>
      @if (canAsk()) {
 <button type="button" matButton="outlined" (click)="ask()" [disabled]="asking() || running()">Recompute this site</button>
      }
      <ul data-testid="recompute-jobs">
        @for (j of shown(); track j.id) {
          <li [attr.data-state]="j.state">
            <span class="state">{{ word(j) }}</span> · asked {{ j.createdAt | siteTime: zone() }}
            @if (j.state === 'queued' || j.state === 'active') {
              · {{ j.done }} / {{ j.total ?? '?' }} closures
              <mat-progress-bar [attr.aria-label]="'Recompute progress, ' + j.done + ' of ' + (j.total ?? 'unknown') + ' closures'"
                [mode]="j.total ? 'determinate' : 'indeterminate'" [value]="j.total ? (100 * j.done) / j.total : 0" />
            }
            @if (j.state === 'completed' && j.result; as r) {
              <span data-testid="recompute-result">· {{ r.examined }} closures looked at, {{ r.changed }} changed{{ r.lockedKept ? ', ' + r.lockedKept + ' kept as published (closed campaigns)' : '' }}</span>
            }
            @if (j.error) { <span class="problem">· {{ j.error }}</span> }
          </li>
        } @empty { <li>No recompute for this site yet.</li> }
      </ul>
      @if (anyChanged()) {
        <p class="hint">Reviewed closures whose flux moved keep their decision and show “recomputed since review” with the old and new flux in the queue.</p>
      }
      <div role="status" aria-live="polite">{{ message() }}</div>
      @if (problem()) { <p class="problem" role="alert">{{ problem() }}</p> }
    </section>
  `,
  styles: `
    .recompute { margin: 8px 0; padding: 4px 8px; border: 1px solid rgba(128, 128, 128, 0.4); border-radius: 4px; }
    h2 { font-size: 1rem; margin: 4px 0; display: inline-block; margin-right: 12px; }
    ul { margin: 4px 0; padding-left: 18px; }
    mat-progress-bar { margin: 4px 0; max-width: 20rem; }
    [data-state='failed'] .state { text-decoration: underline wavy; }
    .hint { font-size: 0.85rem; margin: 2px 0; }
    .problem { color: #b00020; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RecomputePanel {
  private readonly api = inject(BenchApi);
  private readonly auth = inject(AuthStore);
  private readonly roles = this.auth.roles;
  readonly siteId = input.required<string>();
  /** The site's zone: times are shown in it. */
  protected readonly zone = computed(() => this.auth.sites().find((s) => s.id === this.siteId())?.timezone ?? 'UTC');
  readonly changed = output<RecomputeJob>();
  /**
   * The recent recompute jobs, read again while one of this site's is waiting or running. A
   * resource, so an answer for a site no longer chosen is dropped rather than shown.
   */
  private readonly jobsResource = resource({
    params: () => ({ siteId: this.siteId() }),
    loader: ({ params }) => this.readJobs(params.siteId),
  });
  protected readonly jobs = computed(() => this.jobsResource.value() ?? []);
  protected readonly asking = signal(false);
  protected readonly message = signal('');
  protected readonly problem = signal('');
  /** The server takes recompute requests from the lab and admins; leads only follow them. */
  protected readonly canAsk = computed(() => this.roles().some((r) => r === 'lab' || r === 'admin'));
  protected readonly shown = computed(() =>
    this.jobs()
      .filter((j) => j.siteId === this.siteId())
      .slice(0, SHOWN),
  );
  protected readonly running = computed(() => this.shown().some((j) => j.state === 'queued' || j.state === 'active'));
  protected readonly anyChanged = computed(() => this.shown().some((j) => (j.result?.changed ?? 0) > 0));
  private timer: ReturnType<typeof setTimeout> | null = null;
  private alive = true;

  constructor() {
    inject(DestroyRef).onDestroy(() => {
      this.alive = false;
      this.stop();
    });
  }

  protected word(j: RecomputeJob): string {
    return STATE_WORDS[j.state];
  }

  protected async ask(): Promise<void> {
    this.asking.set(true);
    this.problem.set('');
    try {
      const { jobId } = await this.api.recomputeSite(this.siteId());
      this.message.set('Recompute asked for: the server works through every closure of this site.');
      const job = await this.api.job(jobId);
      this.jobsResource.update((js) => [job, ...(js ?? []).filter((j) => j.id !== job.id)]);
      this.schedule();
    } catch (err) {
      this.problem.set(serverMessage(err, 'The recompute could not be asked for'));
    } finally {
      this.asking.set(false);
    }
  }

  /** Reads the recent jobs now (the poll does this by itself while a job of the site runs). */
  refresh(): void {
    this.stop();
    this.jobsResource.reload();
  }

  /**
   * One read of the jobs: says when a job of the site finished since the last read (and tells
   * the queue when it changed closures), and asks for the next read while one still runs.
   */
  private async readJobs(site: string): Promise<RecomputeJob[]> {
    this.stop();
    const before = new Map(untracked(() => this.jobsResource.value() ?? []).map((j) => [j.id, j.state]));
    let items: RecomputeJob[];
    try {
      items = (await this.api.jobs()).items;
      this.problem.set('');
    } catch (err) {
      this.problem.set(serverMessage(err, 'Recompute progress could not be read'));
      return untracked(() => this.jobsResource.value() ?? []);
    }
    for (const j of items) {
      const was = before.get(j.id);
      if (j.siteId === site && j.state === 'completed' && was && was !== 'completed') {
        this.message.set(`Recompute finished: ${j.result?.changed ?? 0} closure(s) changed.`);
        if ((j.result?.changed ?? 0) > 0) this.changed.emit(j);
      }
    }
    if (items.some((j) => j.siteId === site && (j.state === 'queued' || j.state === 'active'))) this.schedule();
    return items;
  }

  private schedule(): void {
    this.stop();
    if (this.alive) this.timer = setTimeout(() => this.refresh(), RECOMPUTE_POLL_MS);
  }

  private stop(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
  }
}
