import { DecimalPipe, PercentPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { Seasonal } from './results-api';
import { linearScale } from './svg-scale';

const W = 560,
  H = 280,
  L = 48,
  R = 12,
  T = 12,
  B = 36;
const COLOURS = ['#0b5d3b', '#7a2e8c', '#b35c00', '#1f5fa8', '#8c1c1c', '#4d4d4d'];
const DAY_MS = 86_400_000;
const MODEL_LABELS: Record<string, string> = {
  'lloyd-taylor': 'Lloyd & Taylor',
  q10: 'Q10',
  'lloyd-taylor-log': 'Lloyd & Taylor, fitted on the log scale',
  'q10-log': 'Q10, fitted on the log scale',
};

/**
 * Cumulative g C m⁻² per treatment cell over the stated period, the totals with their t interval over plots, what the
 * interval leaves out, and per plot the days behind each total (logged, gap-filled, missing), depths and notes.
 * A total with missing days is shown as incomplete, never as a smaller number.
 */
@Component({
  selector: 'fw-seasonal-chart',
  imports: [DecimalPipe, PercentPipe],
  template: `
    @if (plot(); as p) {
      <svg [attr.viewBox]="'0 0 ' + W + ' ' + H" [attr.width]="W" [attr.height]="H" role="img" data-testid="seasonal-chart"
           [attr.aria-label]="'Cumulative carbon efflux per treatment from ' + data().fromDay + ' to ' + data().toDay">
        @for (t of p.y.ticks; track t) { <text class="axis" [attr.x]="L - 6" [attr.y]="p.y(t) + 4" text-anchor="end">{{ t }}</text> }
        @for (m of p.months; track m.label) { <text class="axis" [attr.x]="m.x" [attr.y]="H - B + 14" text-anchor="middle">{{ m.label }}</text> }
        <line [attr.x1]="L" [attr.x2]="W - R" [attr.y1]="H - B" [attr.y2]="H - B" stroke="#444" />
        <line [attr.x1]="L" [attr.x2]="L" [attr.y1]="T" [attr.y2]="H - B" stroke="#444" />
        <text class="axis" [attr.x]="12" [attr.y]="(T + H - B) / 2" text-anchor="middle" [attr.transform]="'rotate(-90 12 ' + (T + H - B) / 2 + ')'">g C m⁻²</text>
        @for (l of p.lines; track l.key) { <path [attr.d]="l.d" fill="none" [attr.stroke]="l.colour" stroke-width="2"><title>{{ l.label }}</title></path> }
      </svg>
    }
    <p class="method">{{ data().method }} Response used: {{ modelLabel() }}.</p>
    <p class="interval" data-testid="interval-note">{{ data().interval }}</p>
    <div class="fw-table-box" tabindex="0" role="region" aria-label="Seasonal totals, scrolls sideways"><table data-testid="seasonal-table">
      <caption>Seasonal totals {{ data().fromDay }} – {{ data().toDay }}</caption>
      <thead><tr><th scope="col">Treatment</th><th scope="col">Total g C m⁻²</th><th scope="col">95 % interval (t, over plots)</th>
        <th scope="col">Plots totalled</th><th scope="col">Plot-days logged / gap-filled / missing</th><th scope="col">Outside fitted range</th></tr></thead>
      <tbody>
        @for (t of data().totals; track t.cellKey; let i = $index) {
          <tr [class.incomplete]="t.totalGCM2 === null"><td><span class="swatch" [style.background]="colour(i)"></span>{{ t.label }}</td>
            <td>{{ t.totalGCM2 === null ? statusText(t.status) : (t.totalGCM2 | number: '1.0-0') }}</td>
            <td>{{ t.ciLowGCM2 === null ? '—' : (t.ciLowGCM2 | number: '1.0-0') + '–' + (t.ciHighGCM2 | number: '1.0-0') }}</td>
            <td>{{ t.nPlotsTotalled }} of {{ t.nPlots }}</td>
            <td>{{ t.days.logged }} / {{ t.days.interpolated }} / {{ t.days.missing }}</td>
            <td>{{ t.shareOutsideRange | percent: '1.0-0' }}{{ t.fittedRangeC ? ' (fitted ' + (t.fittedRangeC.minTempC | number: '1.1-1') + '–' + (t.fittedRangeC.maxTempC | number: '1.1-1') + ' °C)' : '' }}</td></tr>
          @if (t.flags.length) { <tr class="flags"><td colspan="6"><ul>@for (f of t.flags; track f) { <li>{{ f }}</li> }</ul></td></tr> }
        }
      </tbody>
    </table></div>
    <div class="fw-table-box" tabindex="0" role="region" aria-label="Totals per plot, scrolls sideways"><table data-testid="seasonal-plots">
      <caption>Per plot</caption>
      <thead><tr><th scope="col">Treatment</th><th scope="col">Plot</th><th scope="col">Total g C m⁻²</th><th scope="col">Days logged / gap-filled / missing</th>
        <th scope="col">Logger depth / response depth</th><th scope="col">Notes</th></tr></thead>
      <tbody>
        @for (t of data().totals; track t.cellKey) {
          @for (p of t.plots; track p.plotCode) {
            <tr><td>{{ t.label }}</td><td>{{ p.plotCode }}</td>
              <td>{{ p.totalGCM2 === null ? statusText(p.status) : (p.totalGCM2 | number: '1.0-0') }}</td>
              <td>{{ p.days.logged }} / {{ p.days.interpolated }} / {{ p.days.missing }}</td>
              <td [class.differs]="p.depthDiffers">{{ p.logDepthCm === null ? 'no log' : p.logDepthCm + ' cm' }} / {{ p.responseDepthCm }} cm{{ p.depthDiffers ? ' (differ)' : '' }}</td>
              <td>{{ p.flags.join('; ') }}</td></tr>
          }
        }
      </tbody>
    </table></div>`,
  styles: [
    `svg { max-width: 100%; background: #fff; } .axis { font-size: 11px; fill: #333; } table { border-collapse: collapse; }
    th, td { padding: 2px 8px; border-bottom: 1px solid #ddd; text-align: left; font-variant-numeric: tabular-nums; }
    .swatch { display: inline-block; width: 10px; height: 10px; margin-right: 6px; } table { margin: 8px 0; } svg { height: auto; }
    .flags td { font-size: 0.9em; color: #5c3b00; } .flags ul { margin: 0; padding-left: 18px; } .differs { color: #8c1c1c; font-weight: 600; }`,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SeasonalChart {
  readonly data = input.required<Seasonal>();
  protected readonly W = W;
  protected readonly H = H;
  protected readonly L = L;
  protected readonly B = B;
  protected readonly T = T;
  protected readonly R = R;
  protected colour(i: number): string {
    return COLOURS[i % COLOURS.length];
  }
  protected statusText(s: string): string {
    return s === 'too little signal' ? 'too little signal' : 'incomplete: missing days';
  }
  protected readonly modelLabel = computed(() => MODEL_LABELS[this.data().model] ?? this.data().model);
  protected readonly plot = computed(() => {
    const d = this.data();
    const from = Date.parse(`${d.fromDay}T00:00:00Z`) / DAY_MS;
    const to = Date.parse(`${d.toDay}T00:00:00Z`) / DAY_MS;
    const max = Math.max(1, ...d.totals.flatMap((t) => t.cumulative.map((c) => c.gCM2)));
    const x = linearScale(from, to, L, W - R);
    const y = linearScale(0, max * 1.05, H - B, T);
    const months = [];
    for (let n = from; n <= to; n++) {
      const day = new Date(n * DAY_MS);
      if (day.getUTCDate() === 1) months.push({ x: x(n), label: day.toLocaleString('en', { month: 'short', timeZone: 'UTC' }) });
    }
    const lines = d.totals.map((t, i) => ({
      key: t.cellKey,
      label: t.label,
      colour: COLOURS[i % COLOURS.length],
      d: t.cumulative.map((c, k) => `${k ? 'L' : 'M'}${x(from + k).toFixed(1)},${y(c.gCM2).toFixed(1)}`).join(''),
    }));
    return { y, months, lines };
  });
}
