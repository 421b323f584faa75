import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { Seasonal } from './results-api';
import { linearScale } from './svg-scale';

const W = 560, H = 280, L = 48, R = 12, T = 12, B = 36;
const COLOURS = ['#0b5d3b', '#7a2e8c', '#b35c00', '#1f5fa8', '#8c1c1c', '#4d4d4d'];
const DAY_MS = 86_400_000;

/** Cumulative g C m⁻² per treatment cell over the season, and the totals with their bootstrap interval over plots. */
@Component({
  selector: 'fw-seasonal-chart',
  imports: [DecimalPipe],
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
    <p class="method">{{ data().method }} Response used: {{ data().model }}; {{ data().resamples }} bootstrap resamples.</p>
    <table data-testid="seasonal-table">
      <caption>Seasonal totals {{ data().fromDay }} – {{ data().toDay }}</caption>
      <thead><tr><th scope="col">Treatment</th><th scope="col">Total g C m⁻²</th><th scope="col">95 % interval</th><th scope="col">n plots</th>
        <th scope="col">Days logged / interpolated / missing</th></tr></thead>
      <tbody>
        @for (t of data().totals; track t.cellKey; let i = $index) {
          <tr><td><span class="swatch" [style.background]="colour(i)"></span>{{ t.label }}</td>
            <td>{{ t.totalGCM2 === null ? '—' : (t.totalGCM2 | number: '1.0-0') }}</td>
            <td>{{ t.ciLowGCM2 === null ? '—' : (t.ciLowGCM2 | number: '1.0-0') + '–' + (t.ciHighGCM2 | number: '1.0-0') }}</td>
            <td>{{ t.nPlots }}</td><td>{{ days(t, 'logged') }} / {{ days(t, 'interpolated') }} / {{ days(t, 'missing') }}</td></tr>
        }
      </tbody>
    </table>`,
  styles: [`svg { max-width: 100%; background: #fff; } .axis { font-size: 11px; fill: #333; } table { border-collapse: collapse; }
    th, td { padding: 2px 8px; border-bottom: 1px solid #ddd; text-align: left; font-variant-numeric: tabular-nums; }
    .swatch { display: inline-block; width: 10px; height: 10px; margin-right: 6px; }`],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SeasonalChart {
  readonly data = input.required<Seasonal>();
  protected readonly W = W; protected readonly H = H; protected readonly L = L; protected readonly B = B; protected readonly T = T; protected readonly R = R;
  protected colour(i: number): string { return COLOURS[i % COLOURS.length]; }
  protected days(t: Seasonal['totals'][number], k: 'logged' | 'interpolated' | 'missing'): number { return t.plots.reduce((a, p) => a + p.days[k], 0); }
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
      key: t.cellKey, label: t.label, colour: COLOURS[i % COLOURS.length],
      d: t.cumulative.map((c, k) => `${k ? 'L' : 'M'}${x(from + k).toFixed(1)},${y(c.gCM2).toFixed(1)}`).join(''),
    }));
    return { y, months, lines };
  });
}
