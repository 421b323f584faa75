import { ChangeDetectionStrategy, Component, computed, effect, inject, signal, untracked } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { flagAdvice } from '../../../../shared/flux/flag-advice';
import { serverMessage } from '../../core/api/api-error';
import { SiteTimePipe } from '../../core/time/site-time-pipe';
import { BoardApi, type Anomaly } from './board-api';
import { BoardCache } from './board-cache';
import { BoardStore } from './board-store';

const KIND_LABELS: Record<string, string> = {
  'offset-moved': 'Offset moved since the last campaign',
  'offset-spread': 'Offset set with a wide spread',
  'closure-flag': 'Closures with QC flags',
  settling: 'Collars still settling',
  'not-visited': 'Collars not visited lately',
  'check-problem': 'Start-of-day checks skipped or failed',
  'calibration-overdue': 'Analyzer calibration overdue',
  'calibration-drift': 'Analyzer drift over the site limit',
};

/** What looks wrong on the site for the chosen campaign, grouped by kind, problems first. */
@Component({
  selector: 'fw-anomaly-list',
  imports: [SiteTimePipe, FormsModule, MatButtonModule, MatFormFieldModule, MatInputModule],
  template: `
    <section aria-labelledby="anomaly-heading">
      <h2 id="anomaly-heading">Anomalies</h2>
      <div class="bar">
        <mat-form-field subscriptSizing="dynamic">
          <mat-label>Not visited for more than (days)</mat-label>
          <input matInput type="number" min="1" [ngModel]="days()" (ngModelChange)="days.set(+$event)" />
        </mat-form-field>
        <button mat-stroked-button type="button" (click)="load()">Check again</button>
        @if (savedAt(); as at) { <span>As of {{ at | siteTime: zone() }}</span> }
      </div>
      <p role="alert" class="problem">{{ problem() }}</p>
      @for (g of groups(); track g.kind) {
        <h3>{{ g.label }} ({{ g.items.length }})</h3>
        <ul class="items" tabindex="0" [attr.aria-label]="g.label">
          @for (a of g.items; track a.recordId + a.kind) {
            <li [class.severe]="a.severity === 'problem'" data-testid="anomaly">
              <span class="sev">{{ a.severity === 'problem' ? '▲ problem' : '△ check' }}</span>
              @if (a.collarCode) { <strong>{{ a.collarCode }}</strong> }
              @if (a.flags?.length) {
                <span>Closure flagged:</span>
                @if (a.at) { <span class="at">{{ a.at | siteTime: zone() : { dayOnly: true } }}</span> }
                <!-- Words and advice from the one flag table (as on the Walk's closure card); the code is for lab staff. -->
                <ul class="flags">
                  @for (f of advice(a.flags!); track f.code) {
                    <li data-testid="anomaly-flag"><strong class="words">{{ f.words }}</strong> <span class="advice">{{ f.advice }}</span> <small class="flag-code">{{ f.code }}</small></li>
                  }
                </ul>
              } @else {
                <span>{{ a.message }}</span>
                @if (a.at) { <span class="at">{{ a.at | siteTime: zone() : { dayOnly: true } }}</span> }
              }
            </li>
          }
        </ul>
      } @empty {
        @if (loaded()) { <p>Nothing stands out.</p> }
      }
    </section>
  `,
  styles: `
    .bar { display: flex; gap: .75rem; align-items: center; flex-wrap: wrap; }
    .items { list-style: none; padding: 0; display: grid; gap: 4px; max-height: 18rem; overflow: auto; }
    li { display: flex; gap: .5rem; flex-wrap: wrap; align-items: baseline; padding: 4px 8px; border-left: 4px solid #8a8a8a; }
    li.severe { border-left: 4px double #8a2a00; }
    .sev { font-weight: 700; min-width: 6rem; }
    .at, .flag-code { color: var(--mat-sys-on-surface-variant); }
    .flags { flex-basis: 100%; margin: 0; padding-left: 1rem; display: grid; gap: 2px; }
    .flags li { border: 0; padding: 0; display: block; }
    .advice { display: block; }
    .problem { color: var(--mat-sys-error); font-weight: 600; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AnomalyList {
  private readonly store = inject(BoardStore);
  private readonly api = inject(BoardApi);
  private readonly cache = inject(BoardCache);
  protected readonly zone = this.store.zone;
  protected readonly days = signal(30);
  protected readonly items = signal<Anomaly[]>([]);
  protected readonly savedAt = signal<string | null>(null);
  protected readonly loaded = signal(false);
  protected readonly problem = signal('');
  protected readonly groups = computed(() => {
    const by = new Map<string, Anomaly[]>();
    for (const a of this.items()) by.set(a.kind, [...(by.get(a.kind) ?? []), a]);
    return [...by.entries()].map(([kind, items]) => ({ kind, label: KIND_LABELS[kind] ?? kind, items }));
  });

  protected advice(flags: readonly string[]) {
    return flags.map((code) => ({ code, ...flagAdvice(code) }));
  }

  constructor() {
    effect(() => {
      this.store.campaignId();
      untracked(() => void this.load());
    });
  }

  protected async load(): Promise<void> {
    const site = this.store.site();
    if (!site) return;
    this.problem.set('');
    const campaignId = this.store.campaignId();
    try {
      const r = await this.cache.load(`anomalies.${site.id}.${campaignId}.${this.days()}`, () =>
        this.api.anomalies(site.id, campaignId, this.days()),
      );
      this.items.set(r.value.items);
      this.savedAt.set(r.savedAt);
    } catch (err) {
      this.problem.set(serverMessage(err, 'Anomalies could not be loaded'));
    } finally {
      this.loaded.set(true);
    }
  }
}
