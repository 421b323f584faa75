import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, ElementRef, computed, inject, input, output, viewChild } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatInputModule } from '@angular/material/input';
import { MatListModule } from '@angular/material/list';
import { MatSelectModule } from '@angular/material/select';
import type { ClosureDetail, DetailClosure, FitResult } from '../../../../shared/bench/review-wire';
import type { ClosureModel } from '../../../../shared/flux/closure-input';
import { ClosureChart, type ChartInput } from './closure-chart';
import { ClosureMove } from './closure-move';
import { ClosureSystem } from './closure-system';
import { ClosureTraces } from './closure-traces';
import { detectionLimitNote, fluxBases } from './flux-bases';
import { PointExclusions, exclusionText, type PointsChange } from './point-exclusions';
import type { PointExclusion } from '../../../../shared/model/point-exclusion';
import { SiteTimePipe } from '../../core/time/site-time-pipe';
import { FlagWordsPipe } from '../closures/flag-words-pipe';

/** A review-field edit (PATCH), points left out of the fit / put back, or a move to another visit (the Bench's routes). */
export interface Decision {
  /** The review fields (and the chamber profile or analyzer correction) to PATCH. */
  fields: Partial<
    Pick<DetailClosure, 'reviewState' | 'reviewReason' | 'reviewSettleS' | 'reviewWindowEndS' | 'reviewModel' | 'profileId' | 'analyzerId'>
  >;
  points?: PointsChange;
  move?: string;
}

/**
 * One closure under review: the chart, the numbers of both fits, where the volume came from, the
 * start against its analyzer's ambient, the collar's flux history, the visit's replicates and the
 * decision controls. Every decision is a review field; raw data is shown, never edited here.
 */
@Component({
  selector: 'fw-closure-view',
  imports: [
    ClosureChart,
    ClosureMove,
    ClosureSystem,
    ClosureTraces,
    DecimalPipe,
    FlagWordsPipe,
    PointExclusions,
    ReactiveFormsModule,
    SiteTimePipe,
    MatButtonModule,
    MatInputModule,
    MatListModule,
    MatSelectModule,
  ],
  templateUrl: './closure-view.html',
  styleUrl: './bench.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ClosureView {
  readonly detail = input.required<ClosureDetail>();
  readonly busy = input(false);
  readonly decide = output<Decision>();
  private readonly fb = inject(NonNullableFormBuilder);
  private readonly reasonInput = viewChild<ElementRef<HTMLInputElement>>('reasonInput');
  private readonly pointPicker = viewChild(PointExclusions);

  protected readonly c = computed(() => this.detail().closure);
  /** The lab's fit settings, as stored on the closure shown (a new closure or a saved decision starts them afresh). */
  protected readonly fitForm = computed(() => {
    const c = this.c();
    return this.fb.group({
      settle: this.fb.control<number | null>(c.reviewSettleS ?? c.settleS),
      windowEnd: this.fb.control<number | null>(c.reviewWindowEndS),
      model: this.fb.control<'' | ClosureModel>(c.reviewModel ?? ''),
    });
  });
  protected readonly rejectForm = computed(() => this.fb.group({ reason: this.c().reviewReason ?? '' }));
  protected readonly fit = computed<FitResult>(() => this.c().results.review ?? this.c().results.raw);
  protected readonly effectiveSettle = computed(() => this.c().reviewSettleS ?? this.c().settleS);
  protected readonly chart = computed<ChartInput>(() => ({
    tS: this.c().series.tS,
    co2Ppm: this.c().series.co2Ppm,
    h2oMmolMol: this.c().series.h2oMmolMol,
    settleS: this.effectiveSettle(),
    windowEndS: this.c().reviewWindowEndS,
    fit: this.fit(),
    excluded: this.exclusions().map((e) => e.index),
  }));
  // Closures stored before exclusions existed may come without the field (the column was added with a default since).
  protected readonly exclusions = computed<PointExclusion[]>(() => this.c().reviewExclusions ?? []);
  /** The review history with points left out in words ("45–48 (Spike)") rather than as lists. */
  protected readonly history = computed(() =>
    this.detail().history.map((h) =>
      h.field === 'reviewExclusions'
        ? { ...h, field: 'points left out', oldValue: exclusionText(h.oldValue), newValue: exclusionText(h.newValue) }
        : h,
    ),
  );
  protected readonly bases = computed(() => fluxBases(this.fit()));
  protected readonly detectionLimit = computed(() => detectionLimitNote(this.fit()));
  protected readonly startCo2 = computed(() => this.c().series.co2Ppm.find((v) => v !== null) ?? null);
  protected readonly models = computed(() => {
    const f = this.fit();
    return (
      [
        ['linear', f.linear],
        ['exponential', f.exponential],
        ['quadratic', f.quadratic],
      ] as const
    ).filter(([, m]) => m !== null);
  });
  protected readonly historyMax = computed(() => Math.max(1e-9, ...this.detail().collarHistory.map((h) => Math.abs(h.fluxUmolM2S ?? 0))));

  /** Moves the settle time by `by` seconds (keyboard widen/narrow) and recomputes at once. */
  nudgeSettle(by: number): void {
    this.fitForm().controls.settle.setValue(Math.max(0, Math.min(600, this.effectiveSettle() + by)));
    this.applyFit();
  }

  protected pickPoint(index: number): void {
    this.pointPicker()?.pick(index);
  }

  protected moveTo(visitId: string): void {
    this.decide.emit({ fields: {}, move: visitId });
  }

  protected changePoints(points: PointsChange): void {
    this.decide.emit({ fields: {}, points });
  }

  focusReason(): void {
    this.reasonInput()?.nativeElement.focus();
  }

  protected applyFit(): void {
    const c = this.c();
    const v = this.fitForm().getRawValue();
    const fields: Decision['fields'] = {};
    // An emptied settle field reads 0 s, as the number field's value did.
    const settle = (v.settle ?? 0) === c.settleS ? null : (v.settle ?? 0);
    if (settle !== c.reviewSettleS) fields.reviewSettleS = settle;
    const end = v.windowEnd || null;
    if (end !== c.reviewWindowEndS) fields.reviewWindowEndS = end;
    const model = v.model || null;
    if (model !== c.reviewModel) fields.reviewModel = model;
    if (Object.keys(fields).length) this.decide.emit({ fields });
  }

  accept(): void {
    this.decide.emit({ fields: { reviewState: 'accepted', reviewReason: null } });
  }

  protected reject(): void {
    const reason = this.rejectForm().controls.reason.value.trim();
    if (!reason) {
      this.focusReason();
      return;
    }
    this.decide.emit({ fields: { reviewState: 'rejected', reviewReason: reason } });
  }

  protected numbersOf(name: 'linear' | 'exponential' | 'quadratic') {
    return this.fit()[name];
  }
}
