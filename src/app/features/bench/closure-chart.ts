import {
  ChangeDetectionStrategy,
  Component,
  ElementRef,
  OnDestroy,
  afterNextRender,
  effect,
  input,
  output,
  viewChild,
} from '@angular/core';
import uPlot from 'uplot';
import { dryMoleFractionPpm } from '../../../../shared/flux';
import type { FitResult } from '../../../../shared/bench/review-wire';

export interface ChartInput {
  tS: (number | null)[];
  co2Ppm: (number | null)[];
  h2oMmolMol: (number | null)[] | null;
  settleS: number;
  windowEndS: number | null;
  fit: FitResult;
  /** Sample indices the lab left out of the fit: drawn apart (open red rings), no residual. */
  excluded?: readonly number[];
}

/** Charts of one closure share their cursor (the traces under the CO2 chart follow it). */
export const CURSOR_SYNC_KEY = 'fw-closure';

/** Fitted curves as the engine defines them: τ = t − settle; line a + b·τ; Kutzbach et al. (2007) p1 + p2·exp(p3·τ). */
function curves(c: ChartInput) {
  const lin = c.fit.linear,
    exp = c.fit.exponential,
    w = c.fit.window;
  const inWindow = (t: number) => w !== null && t >= w.firstTS && t <= w.lastTS;
  const line = c.tS.map((t) => (t !== null && lin && inWindow(t) ? lin.interceptPpm! + lin.slopePpmS * (t - c.settleS) : null));
  const expo = c.tS.map((t) => (t !== null && exp && inWindow(t) ? exp.p1! + exp.p2! * Math.exp(exp.p3! * (t - c.settleS)) : null));
  return { line, expo };
}

/**
 * Dry CO2 against time with the settle time shaded, the linear and exponential fits, points the
 * lab left out as open red rings, and the residuals of the selected model below. uPlot draws to a canvas and handles tens of thousands of
 * points per series without slowing the review down (closures at 10 Hz and the collar's season);
 * an SVG or DOM-per-point chart would not keep up with next/previous at keyboard speed.
 */
@Component({
  selector: 'fw-closure-chart',
  template: `<div #plot class="plot" role="img" [attr.aria-label]="label()"></div><div #resid class="plot resid" aria-hidden="true"></div>`,
  styles: [`:host { display: block; min-width: 0; } .plot { width: 100%; overflow: hidden; } .resid { margin-top: 4px; }`],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ClosureChart implements OnDestroy {
  readonly data = input.required<ChartInput>();
  readonly label = input('Dry CO2 against time');
  /** A sample tapped or clicked on the main chart (its index in the series). */
  readonly pick = output<number>();
  private readonly plotEl = viewChild.required<ElementRef<HTMLElement>>('plot');
  private readonly residEl = viewChild.required<ElementRef<HTMLElement>>('resid');
  private charts: uPlot[] = [];
  /** The charts follow their box's width (window resize, rotation, the queue column folding away). */
  private readonly resize = typeof ResizeObserver === 'undefined' ? null : new ResizeObserver(() => this.fit());

  constructor() {
    // Draws into uPlot's canvas (not Angular's view) whenever the data change; nothing is loaded here.
    effect(() => this.draw(this.data()));
    afterNextRender(() => this.resize?.observe(this.plotEl().nativeElement));
  }

  ngOnDestroy(): void {
    this.resize?.disconnect();
    this.charts.forEach((c) => c.destroy());
  }

  private width(): number {
    return Math.max(200, Math.floor(this.plotEl().nativeElement.clientWidth) || 640);
  }

  private fit(): void {
    const w = this.width();
    for (const c of this.charts) if (c.width !== w) c.setSize({ width: w, height: c.height });
  }

  private draw(c: ChartInput): void {
    this.charts.forEach((x) => x.destroy());
    const x = c.tS.map((t) => t ?? NaN);
    const dry = c.co2Ppm.map((v, i) => {
      const h = c.h2oMmolMol?.[i];
      return v === null ? null : typeof h === 'number' ? dryMoleFractionPpm(v, h) : v;
    });
    const out = new Set(c.excluded ?? []);
    const kept = dry.map((v, i) => (out.has(i) ? null : v));
    const left = dry.map((v, i) => (out.has(i) ? v : null));
    const { line, expo } = curves(c);
    const selected = c.fit.selected?.model === 'exponential' ? expo : line;
    const resid = kept.map((v, i) => (v !== null && selected[i] !== null ? v - (selected[i] as number) : null));
    const width = this.width();
    const settle = c.settleS,
      end = c.windowEndS;
    const shade = (u: uPlot) => {
      const ctx = u.ctx,
        top = u.bbox.top,
        h = u.bbox.height;
      const x0 = u.valToPos(u.scales.x.min ?? 0, 'x', true),
        xs = u.valToPos(settle, 'x', true);
      ctx.save();
      ctx.fillStyle = 'rgba(120,120,120,0.18)';
      ctx.fillRect(x0, top, Math.max(0, xs - x0), h);
      if (end !== null) {
        const xe = u.valToPos(end, 'x', true),
          x1 = u.valToPos(u.scales.x.max ?? end, 'x', true);
        ctx.fillRect(xe, top, Math.max(0, x1 - xe), h);
      }
      ctx.restore();
    };
    const main = new uPlot(
      {
        width,
        height: 260,
        legend: { show: false },
        cursor: { drag: { x: false, y: false }, sync: { key: CURSOR_SYNC_KEY } },
        scales: { x: { time: false } },
        axes: [{ label: 's since the chamber seated' }, { label: 'dry CO2, µmol/mol', size: 60 }],
        series: [
          {},
          { label: 'dry CO2', stroke: '#37474f', width: 0, points: { show: true, size: 3, fill: '#37474f' } },
          { label: 'linear', stroke: '#1565c0', width: 2, points: { show: false } },
          { label: 'exponential', stroke: '#c62828', width: 2, dash: [6, 4], points: { show: false } },
          { label: 'left out', stroke: '#d32f2f', width: 0, points: { show: true, size: 8, width: 2, stroke: '#d32f2f', fill: '#ffffff' } },
        ],
        hooks: { drawClear: [shade] },
      },
      [x, kept, line, expo, left] as uPlot.AlignedData,
      this.plotEl().nativeElement,
    );
    // The sample nearest the tap or click (from the event's own position: a tap moves no cursor first).
    main.over.addEventListener('click', (e: MouseEvent) => {
      const i = main.posToIdx(e.clientX - main.over.getBoundingClientRect().left);
      if (i >= 0 && i < dry.length && dry[i] !== null) this.pick.emit(i);
    });
    const res = new uPlot(
      {
        width,
        height: 110,
        legend: { show: false },
        scales: { x: { time: false } },
        axes: [{}, { label: 'residual', size: 60 }],
        series: [{}, { label: 'residual', stroke: '#6a1b9a', width: 0, points: { show: true, size: 3, fill: '#6a1b9a' } }],
        hooks: { drawClear: [shade] },
      },
      [x, resid] as uPlot.AlignedData,
      this.residEl().nativeElement,
    );
    this.charts = [main, res];
  }
}
