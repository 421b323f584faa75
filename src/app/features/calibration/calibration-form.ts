import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input, output, type OnInit } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule, Validators, type AbstractControl, type ValidationErrors } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import {
  DEFAULT_CALIBRATION_DRIFT_LIMIT_PCT,
  calibrationDrifts,
  calibrationPassed,
  worstDriftPct,
} from '../../../../shared/model/calibration';
import { fromSiteWallTime, siteWallTime } from './site-clock';

/** The fields of an analyzer check of kind 'calibration' that the form fills. */
export interface CalibrationEntry {
  at: string;
  zeroGasPpm: number;
  zeroCylinder: string | null;
  zeroBeforePpm: number;
  zeroAfterPpm: number;
  spanGasPpm: number;
  spanCylinder: string;
  spanBeforePpm: number;
  spanAfterPpm: number;
  passed: boolean | null;
  note: string;
}

const positive = (c: AbstractControl<number | null>): ValidationErrors | null =>
  c.value !== null && c.value <= 0 ? { positive: true } : null;
const reading = () => new FormControl<number | null>(null, [Validators.required, Validators.min(-5000), Validators.max(20000)]);

/**
 * A zero/span calibration as done at the car or in the lab: when (the site's wall clock), the
 * zero gas and the span gas with their cylinders, and the analyzer's reading of each before and
 * after adjustment. The drift (reading before − gas) and whether the analyzer was left within
 * the site's limit show while typing; the host stores the entry (device store or server).
 */
@Component({
  selector: 'fw-calibration-form',
  imports: [DecimalPipe, MatButtonModule, MatFormFieldModule, MatInputModule, ReactiveFormsModule],
  templateUrl: './calibration-form.html',
  styleUrl: './calibration-form.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CalibrationForm implements OnInit {
  /** Largest drift the site accepts, in % of the span gas. */
  readonly driftLimitPct = input(DEFAULT_CALIBRATION_DRIFT_LIMIT_PCT);
  readonly timeZone = input('UTC');
  /** Who is recording (the signed-in person), shown so the record's author is plain. */
  readonly recordedBy = input('');
  readonly busy = input(false);
  readonly save = output<CalibrationEntry>();

  protected readonly form = new FormGroup({
    at: new FormControl('', { nonNullable: true, validators: Validators.required }),
    zeroGasPpm: new FormControl<number | null>(0, [Validators.required, Validators.min(0), Validators.max(20000)]),
    zeroCylinder: new FormControl('', { nonNullable: true, validators: Validators.maxLength(100) }),
    zeroBeforePpm: reading(),
    zeroAfterPpm: reading(),
    spanGasPpm: new FormControl<number | null>(null, [Validators.required, positive, Validators.max(20000)]),
    spanCylinder: new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.maxLength(100)] }),
    spanBeforePpm: reading(),
    spanAfterPpm: reading(),
    note: new FormControl('', { nonNullable: true, validators: Validators.maxLength(2000) }),
  });
  private readonly value = toSignal(this.form.valueChanges, { initialValue: this.form.getRawValue() });
  protected readonly drifts = computed(() => calibrationDrifts(this.value()));
  protected readonly driftPct = computed(() => worstDriftPct({ ...this.drifts(), spanGasPpm: this.value().spanGasPpm }));
  protected readonly overLimit = computed(() => (this.driftPct() ?? 0) > this.driftLimitPct());
  protected readonly leftWithin = computed(() => calibrationPassed(this.value(), this.driftLimitPct()));
  protected readonly timeProblem = computed(() => {
    const at = this.value().at;
    if (!at) return '';
    const r = fromSiteWallTime(at, this.timeZone());
    return r.ok ? '' : r.message;
  });

  /** The time field starts at now on the site's clock. */
  ngOnInit(): void {
    this.form.controls.at.setValue(siteWallTime(new Date().toISOString(), this.timeZone()));
  }

  protected signed(x: number | null): string {
    return x === null ? '–' : `${x > 0 ? '+' : ''}${x}`;
  }

  protected submit(): void {
    if (this.busy()) return;
    const at = fromSiteWallTime(this.form.controls.at.value, this.timeZone());
    if (this.form.invalid || !at.ok) {
      this.form.markAllAsTouched();
      return;
    }
    const v = this.form.getRawValue();
    this.save.emit({
      at: at.iso,
      zeroGasPpm: v.zeroGasPpm!,
      zeroCylinder: v.zeroCylinder.trim() || null,
      zeroBeforePpm: v.zeroBeforePpm!,
      zeroAfterPpm: v.zeroAfterPpm!,
      spanGasPpm: v.spanGasPpm!,
      spanCylinder: v.spanCylinder.trim(),
      spanBeforePpm: v.spanBeforePpm!,
      spanAfterPpm: v.spanAfterPpm!,
      passed: this.leftWithin(),
      note: v.note.trim(),
    });
  }
}
