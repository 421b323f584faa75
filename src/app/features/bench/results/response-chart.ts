import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input, signal } from '@angular/core';
import { MatSelectModule } from '@angular/material/select';
import type { CellResponse, Responses } from './results-api';
import { linearScale, moistureColour } from './svg-scale';

const W = 560,
  H = 300,
  L = 48,
  R = 12,
  T = 12,
  B = 36;

/**
 * Visit means against soil temperature for one treatment cell, coloured by moisture, with the
 * engine's Q10 (dashed) and Lloyd & Taylor (solid) curves; parameters ± 95 % CI and the engine's
 * warnings for every cell below.
 */
@Component({
  selector: 'fw-response-chart',
  imports: [DecimalPipe, MatSelectModule],
  templateUrl: './response-chart.html',
  styles: [
    `
      svg {
        max-width: 100%;
        height: auto;
        background: #fff;
      }
      .cell {
        width: 100%;
        max-width: 36rem;
      }
      .axis {
        font-size: 11px;
        fill: #333;
      }
      table {
        border-collapse: collapse;
      }
      th,
      td {
        padding: 2px 8px;
        border-bottom: 1px solid #ddd;
        text-align: left;
        font-variant-numeric: tabular-nums;
      }
      .warn {
        color: #8a4b00;
      }
    `,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ResponseChart {
  readonly data = input.required<Responses>();
  protected readonly chosen = signal<string | null>(null);
  protected readonly W = W;
  protected readonly H = H;
  protected readonly L = L;
  protected readonly B = B;
  protected readonly T = T;
  protected readonly R = R;
  protected readonly cell = computed(() => {
    const rs = this.data().responses;
    return rs.find((r) => r.cellKey === this.chosen()) ?? rs.find((r) => r.points.length) ?? rs.at(0) ?? null;
  });
  protected readonly plot = computed(() => {
    const c = this.cell();
    if (!c || !c.points.length) return null;
    const t = c.points.map((p) => p.tempC);
    const y = [...c.points.map((p) => p.fluxUmolM2S), ...c.curve.flatMap((k) => [k.q10 ?? 0, k.lloydTaylor ?? 0])];
    const v = c.points.map((p) => p.vwcPct).filter((x): x is number => x !== null);
    const [vLo, vHi] = [Math.min(...v), Math.max(...v)];
    const x = linearScale(Math.min(...t) - 1, Math.max(...t) + 1, L, W - R);
    const ys = linearScale(Math.min(0, ...y), Math.max(...y) * 1.05, H - B, T);
    const path = (key: 'q10' | 'lloydTaylor') =>
      c.curve
        .filter((k) => k[key] !== null)
        .map((k, i) => `${i ? 'L' : 'M'}${x(k.tempC).toFixed(1)},${ys(k[key]!).toFixed(1)}`)
        .join('');
    return {
      x,
      y: ys,
      vLo,
      vHi,
      q10: path('q10'),
      lt: path('lloydTaylor'),
      points: c.points.map((p) => ({ cx: x(p.tempC), cy: ys(p.fluxUmolM2S), fill: moistureColour(p.vwcPct, vLo, vHi), p })),
    };
  });
  protected choose(key: string): void {
    this.chosen.set(key);
  }
  /** Lloyd & Taylor warnings the Q10 column does not already show (e.g. E0 outside its plausible range). */
  protected lloydTaylorOnly(r: CellResponse): string[] {
    const q = r.q10.ok ? r.q10.warnings : [];
    return r.lloydTaylor.ok ? r.lloydTaylor.warnings.filter((w) => !q.includes(w)) : [];
  }
}
