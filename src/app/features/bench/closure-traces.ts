import {
  ChangeDetectionStrategy,
  Component,
  ElementRef,
  OnDestroy,
  afterNextRender,
  computed,
  effect,
  input,
  viewChild,
} from '@angular/core';
import uPlot from 'uplot';
import type { DetailClosure } from '../../../../shared/bench/review-wire';
import { CURSOR_SYNC_KEY } from './closure-chart';

type Column = (number | null)[] | null | undefined;
/** The series columns the traces read (the closure's stored series). */
type TraceSeries = Pick<DetailClosure['series'], 'tS' | 'h2oMmolMol' | 'tempC' | 'pressureKpa'>;

export interface Trace {
  key: 'h2o' | 'temp' | 'pressure';
  label: string;
  short: string;
  unit: string;
  color: string;
  values: (number | null)[];
}

/**
 * The closure's other logged columns, as stored in its series (the logger import converts them to
 * these units: shared/logger/logger-mapping.ts): only those with at least one value.
 */
export function tracesOf(series: TraceSeries): Trace[] {
  const has = (c: Column): c is (number | null)[] => Array.isArray(c) && c.some((v) => typeof v === 'number');
  const all: (Omit<Trace, 'values'> & { c: Column })[] = [
    { key: 'h2o', label: 'H2O', short: 'H2O', unit: 'mmol/mol', color: '#0277bd', c: series.h2oMmolMol },
    { key: 'temp', label: 'Chamber air temperature', short: 'air temp.', unit: '°C', color: '#ef6c00', c: series.tempC },
    { key: 'pressure', label: 'Chamber pressure', short: 'pressure', unit: 'kPa', color: '#2e7d32', c: series.pressureKpa },
  ];
  return all.filter((t) => has(t.c)).map(({ c, ...t }) => ({ ...t, values: c as (number | null)[] }));
}

/**
 * H2O, chamber air temperature and pressure under the CO2 chart, on the same time axis (same
 * range, same plot width, cursor shared with the CO2 chart), one small chart each, with units.
 */
@Component({
  selector: 'fw-closure-traces',
  template: `
    @if (traces().length) {
      <div #box class="traces" role="img" [attr.aria-label]="label()"></div>
    } @else {
      <p class="none" data-testid="no-traces">This closure's file has no H2O, temperature or pressure column.</p>
    }`,
  styles: [
    `:host { display: block; min-width: 0; } .traces { width: 100%; overflow: hidden; } .none { font-size: 0.85rem; opacity: 0.8; }`,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ClosureTraces implements OnDestroy {
  readonly series = input.required<TraceSeries>();
  protected readonly traces = computed(() => tracesOf(this.series()));
  protected readonly label = computed(
    () =>
      this.traces()
        .map((t) => `${t.label} (${t.unit})`)
        .join(', ') + ' against time',
  );
  private readonly box = viewChild<ElementRef<HTMLElement>>('box');
  private charts: uPlot[] = [];
  private readonly resize = typeof ResizeObserver === 'undefined' ? null : new ResizeObserver(() => this.fit());

  constructor() {
    // Draws the traces into uPlot's canvases (not Angular's view); nothing is loaded here.
    effect(() => this.draw(this.series(), this.traces(), this.box()?.nativeElement ?? null));
    afterNextRender(() => {
      const el = this.box()?.nativeElement;
      if (el) this.resize?.observe(el);
    });
  }

  ngOnDestroy(): void {
    this.resize?.disconnect();
    this.charts.forEach((c) => c.destroy());
  }

  private width(el: HTMLElement): number {
    return Math.max(200, Math.floor(el.clientWidth) || 640);
  }

  private fit(): void {
    const el = this.box()?.nativeElement;
    if (!el) return;
    const w = this.width(el);
    for (const c of this.charts) if (c.width !== w) c.setSize({ width: w, height: c.height });
  }

  private draw(series: TraceSeries, traces: Trace[], el: HTMLElement | null): void {
    this.charts.forEach((c) => c.destroy());
    this.charts = [];
    if (!el || !traces.length) return;
    const x = series.tS.map((t) => t ?? NaN);
    const finite = x.filter(Number.isFinite);
    // The CO2 chart's x range is the data's: the same here, so a time lines up across the charts.
    const range: [number, number] = finite.length ? [Math.min(...finite), Math.max(...finite)] : [0, 1];
    const width = this.width(el);
    this.charts = traces.map(
      (t, k) =>
        new uPlot(
          {
            width,
            height: 90,
            legend: { show: false },
            cursor: { sync: { key: CURSOR_SYNC_KEY }, drag: { x: false, y: false } },
            scales: { x: { time: false, range: () => range } },
            axes: [
              { show: k === traces.length - 1, label: k === traces.length - 1 ? 's since the chamber seated' : undefined },
              { label: `${t.short}, ${t.unit}`, size: 60 },
            ],
            series: [{}, { label: `${t.label}, ${t.unit}`, stroke: t.color, width: 1.5, points: { show: false } }],
          },
          [x, t.values] as uPlot.AlignedData,
          el,
        ),
    );
  }
}
