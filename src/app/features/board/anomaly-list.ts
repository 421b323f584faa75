import { ChangeDetectionStrategy, Component, computed, inject, resource } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { flagAdvice } from '../../../../shared/flux/flag-advice';
import { serverMessage } from '../../core/api/api-error';
import { SiteTimePipe } from '../../core/time/site-time-pipe';
import type { AnomalyKind } from '../../../../shared/board/board-wire';
import { BoardApi, type Anomaly } from './board-api';
import { BoardCache } from './board-cache';
import { BoardStore } from './board-store';

/** A heading per kind: a new kind of anomaly does not compile without its words. */
const KIND_LABELS: Record<AnomalyKind, string> = {
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
  imports: [SiteTimePipe, ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatInputModule],
  template: `
    <section aria-labelledby="anomaly-heading">
      <h2 id="anomaly-heading">Anomalies</h2>
      <form class="bar" [formGroup]="form" aria-label="Anomaly limits" (submit)="$event.preventDefault(); load()">
        <mat-form-field subscriptSizing="dynamic">
          <mat-label>Not visited for more than (days)</mat-label>
          <input matInput type="number" min="1" formControlName="days" />
        </mat-form-field>
        <button mat-stroked-button type="button" (click)="load()">Check again</button>
        @if (savedAt(); as at) { <span>As of {{ at | siteTime: zone() }}</span> }
      </form>
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
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly form = this.fb.group({ days: this.fb.control<number | null>(30) });
  /** The site's anomalies for the chosen campaign; the day limit is read when asked ("Check again"). */
  private readonly read = resource({
    params: () => {
      const site = this.store.site();
      return site ? { siteId: site.id, campaignId: this.store.campaignId() } : undefined;
    },
    loader: ({ params: { siteId, campaignId } }) => {
      // An emptied field reads 0 days, as the number field's value did.
      const days = this.form.controls.days.value ?? 0;
      return this.cache.load(`anomalies.${siteId}.${campaignId}.${days}`, () => this.api.anomalies(siteId, campaignId, days));
    },
  });
  private readonly answer = computed(() => (this.read.hasValue() ? this.read.value() : null));
  protected readonly items = computed<Anomaly[]>(() => this.answer()?.value.items ?? []);
  protected readonly savedAt = computed(() => this.answer()?.savedAt ?? null);
  protected readonly loaded = computed(() => this.read.hasValue() || this.read.status() === 'error');
  protected readonly problem = computed(() => {
    const err = this.read.error();
    return err ? serverMessage(err, 'Anomalies could not be loaded') : '';
  });
  protected readonly groups = computed(() => {
    const by = new Map<AnomalyKind, Anomaly[]>();
    for (const a of this.items()) by.set(a.kind, [...(by.get(a.kind) ?? []), a]);
    return [...by.entries()].map(([kind, items]) => ({ kind, label: KIND_LABELS[kind], items }));
  });

  protected advice(flags: readonly string[]) {
    return flags.map((code) => ({ code, ...flagAdvice(code) }));
  }

  protected load(): void {
    this.read.reload();
  }
}
