import { ChangeDetectionStrategy, Component, ElementRef, OnDestroy, effect, input, viewChild } from '@angular/core';
import uPlot from 'uplot';
import { dryMoleFractionPpm, type ClosureFitResult } from '../../../../shared/flux';
import type { ClosureSeries } from './closure-writes';

export interface SpotChartInput {
  series: ClosureSeries;
  settleS: number;
  fit: ClosureFitResult;
}

/**
 * Dry CO2 against time on the phone: the settle time shaded, the line and the exponential model
 * (Kutzbach et al. 2007, p1 + p2·exp(p3·τ), τ = t − settle) drawn over the fit window. Canvas
 * (uPlot), so a 1 Hz closure of several minutes draws at once on a field phone.
 */
@Component({
  selector: 'fw-spot-chart',
  template: `<div #plot role="img" [attr.aria-label]="label()"></div>`,
  styles: [`:host { display: block; overflow: hidden; }`],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SpotChart implements OnDestroy {
  readonly data = input.required<SpotChartInput>();
  readonly label = input('Dry CO2 against time, settle time shaded, linear and exponential fits');
  private readonly el = viewChild.required<ElementRef<HTMLElement>>('plot');
  private chart: uPlot | null = null;

  constructor() {
    // Draws the canvas chart (uPlot, not a template) whenever its input changes.
    effect(() => this.draw(this.data()));
  }

  ngOnDestroy(): void {
    this.chart?.destroy();
  }

  private draw(d: SpotChartInput): void {
    this.chart?.destroy();
    const { tS, co2Ppm, h2oMmolMol } = d.series;
    const w = d.fit.window;
    const inWindow = (t: number | null) => t !== null && w !== null && t >= w.firstTS && t <= w.lastTS;
    const lin = d.fit.linear;
    const exp = d.fit.exponential;
    const dry = co2Ppm.map((v, i) =>
      v === null ? null : typeof h2oMmolMol?.[i] === 'number' ? dryMoleFractionPpm(v, h2oMmolMol[i] as number) : v,
    );
    const line = tS.map((t) => (lin && inWindow(t) ? lin.interceptPpm + lin.slopePpmS * (t! - d.settleS) : null));
    const expo = tS.map((t) => (exp && inWindow(t) ? exp.p1 + exp.p2 * Math.exp(exp.p3 * (t! - d.settleS)) : null));
    const host = this.el().nativeElement;
    const settle = d.settleS;
    const opts: uPlot.Options = {
      width: Math.max(260, host.clientWidth || 320),
      height: 200,
      scales: { x: { time: false } },
      axes: [{ label: 's' }, { label: 'CO2 dry, ppm', size: 56 }],
      series: [
        {},
        { label: 'CO2', stroke: '#37474f', width: 0, points: { show: true, size: 3, fill: '#37474f' } },
        { label: 'linear', stroke: '#1565c0', width: 2, points: { show: false } },
        { label: 'exponential', stroke: '#c62828', width: 2, dash: [6, 4], points: { show: false } },
      ],
      hooks: {
        drawClear: [
          (u) => {
            // Settle time: the seconds after seating that every fit skips.
            const x0 = u.valToPos(tS[0] ?? 0, 'x', true);
            const x1 = u.valToPos(settle, 'x', true);
            u.ctx.save();
            u.ctx.fillStyle = 'rgba(255, 193, 7, 0.25)';
            u.ctx.fillRect(x0, u.bbox.top, Math.max(0, x1 - x0), u.bbox.height);
            u.ctx.restore();
          },
        ],
      },
    };
    this.chart = new uPlot(opts, [tS.map((t) => t ?? NaN), dry, line, expo] as uPlot.AlignedData, host);
  }
}
