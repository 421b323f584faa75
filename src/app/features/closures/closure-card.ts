import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { formatSiteTime } from '../../../../shared/time/site-time';
import { MatButtonModule } from '@angular/material/button';
import type { LocalRecord } from '../../core/db/db-schema';
import { fluxOnTheSpot, type SpotInputs } from './closure-flux';
import type { PreviousFlux } from './closure-scene';
import { FlagAdviceList } from './flag-advice-list';
import { SpotChart } from './spot-chart';

/**
 * One closure at the visit: its chart, the flux with flags computed here, and a Redo (its own and
 * the flag advice's) offered only once no closure runs (a tap meant for "chamber off" never lands on it).
 */
@Component({
  selector: 'fw-closure-card',
  imports: [DecimalPipe, MatButtonModule, SpotChart, FlagAdviceList],
  template: `
    <article class="card" [attr.data-closure]="closure().id" [class.redo]="closure().redoOfId">
      <header>
        <strong>Closure {{ index() + 1 }}</strong>
        @if (closure().redoOfId) { <span class="tag">redo</span> }
        <span class="when">on {{ time(closure().chamberOnAt) }} · off {{ time(closure().chamberOffAt) }}</span>
        @if (!running()) {
          <button mat-stroked-button class="redo-button" type="button" (click)="redo.emit(closure())">Redo</button>
        }
      </header>
      @if (!closure().analyzerId) {
        <p class="no-analyzer" role="note" data-testid="no-analyzer">No analyzer named for this closure: its precision and flags cannot be checked. Name the day's analyzer before the next closure.</p>
      }
      @if (spot(); as s) {
        @if (s.fit.selected; as sel) {
          <p class="flux" data-testid="spot-flux">{{ sel.fluxUmolM2S | number: '1.2-2' }} µmol m⁻² s⁻¹
            <small>({{ sel.model }}; linear {{ s.fit.linear?.fluxUmolM2S | number: '1.2-2' }}, exponential {{ s.fit.exponential ? (s.fit.exponential.fluxUmolM2S | number: '1.2-2') : '—' }})</small></p>
        } @else {
          <p class="flux none" data-testid="spot-flux">No flux: {{ s.fit.error }}</p>
        }
        <fw-flag-advice-list data-testid="spot-flags" [flags]="s.fit.flags" [canRedo]="!running()" (redo)="redo.emit(closure())" />
        @if (s.startAboveAmbientPpm !== null) {
          <p class="ambient">Start vs this analyzer's ambient reading: {{ s.startAboveAmbientPpm >= 0 ? '+' : '' }}{{ s.startAboveAmbientPpm | number: '1.0-0' }} ppm</p>
        }
        <fw-spot-chart [data]="{ series: closure().series, settleS: closure().settleS, fit: s.fit }" />
      } @else {
        <p class="waiting">No series yet: import the logger file or enter the series by hand.</p>
      }
      @if (previous().length) {
        <p class="previous">This collar before: @for (p of previous(); track p.id) { <span>{{ p.fluxUmolM2S | number: '1.2-2' }} ({{ day(p.startedAt) }})</span> }</p>
      }
    </article>
  `,
  styles: [
    `
    .card { border: 1px solid var(--mat-sys-outline-variant, #ccc); border-radius: 8px; padding: 12px; margin: 8px 0; }
    header { display: flex; gap: 8px; align-items: baseline; flex-wrap: wrap; }
    .tag { background: #fff3e0; padding: 0 6px; border-radius: 4px; }
    .when { color: var(--mat-sys-on-surface-variant, #555); font-size: 0.9em; }
    .flux { font-size: 1.3em; margin: 8px 0 4px; }
    .redo-button { margin-left: auto; min-height: 48px; }
    .no-analyzer { border: 2px solid var(--mat-sys-error, #b3261e); border-radius: 6px; padding: 4px 8px; font-weight: 600; }
    .previous span { margin-right: 8px; }
  `,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ClosureCard {
  readonly closure = input.required<LocalRecord<'closure'>>();
  readonly index = input(0);
  readonly inputs = input.required<SpotInputs>();
  readonly previous = input<PreviousFlux[]>([]);
  /** A closure runs at this visit: no Redo is offered until it ends. */
  readonly running = input(false);
  readonly redo = output<LocalRecord<'closure'>>();

  protected readonly spot = computed(() => fluxOnTheSpot(this.closure(), this.inputs()));

  private readonly zone = computed(() => this.inputs().site?.timezone ?? 'UTC');

  protected time(at: string | null): string {
    return at ? formatSiteTime(at, this.zone(), { timeOnly: true, seconds: true }) || '—' : '—';
  }

  /** The site's day of an instant (not the UTC day of its ISO text). */
  protected day(at: string): string {
    return formatSiteTime(at, this.zone(), { dayOnly: true });
  }
}
