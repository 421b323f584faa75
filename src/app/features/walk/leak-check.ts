import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, output, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatRadioModule } from '@angular/material/radio';
import { MatSelectModule } from '@angular/material/select';
import { savedMapping } from '../../../../shared/logger';
import { DeviceMemory } from '../../core/device/device-memory';
import { leakFromTyped, leakSlope, type LeakFit } from './leak-fit';
import { leakPieces, loggerPresetKey, type LeakPiece } from './leak-file';
import { parseCm } from './offset-form';
import { leakPassed } from './start-of-day-items';
import { formValue } from '../../core/forms/form-value';

export type LeakMethod = 'series' | 'file' | 'slope';

/** What the start-of-day stores as the leak check. */
export interface LeakResult {
  slopeUmolMolS: number;
  passed: boolean;
  note: string;
  /** The logger file the slope was fitted from, kept with the check as evidence; null when typed. */
  file: File | null;
}

/**
 * The leak check: a closure on a sealed plate, given as a series typed by hand or the piece of
 * a logger file, its slope after the settle time fitted by the flux engine's linear fit and
 * judged against the site's limit. Typing the slope off the analyzer stays as a fallback that
 * needs a reason.
 */
@Component({
  selector: 'fw-leak-check',
  imports: [DecimalPipe, MatButtonModule, MatFormFieldModule, MatInputModule, MatRadioModule, MatSelectModule, ReactiveFormsModule],
  templateUrl: './leak-check.html',
  styleUrl: './walk.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LeakCheck {
  private readonly memory = inject(DeviceMemory);
  readonly limit = input.required<number>();
  readonly settleDefault = input<number>(20);
  readonly analyzerId = input<string | null>(null);
  readonly timeZone = input<string>('UTC');
  readonly save = output<LeakResult>();

  protected readonly form = new FormGroup({
    method: new FormControl<LeakMethod>('series', { nonNullable: true }),
    /** Shows the chamber profile's settle time until the crew types another. */
    settle: new FormControl('', { nonNullable: true }),
    series: new FormControl('', { nonNullable: true }),
    piece: new FormControl(0, { nonNullable: true }),
    slope: new FormControl('', { nonNullable: true }),
    reason: new FormControl('', { nonNullable: true }),
  });
  private readonly value = formValue(this.form);
  protected readonly method = computed(() => this.value().method);
  protected readonly settle = computed(() => parseCm(this.value().settle));
  protected readonly fileName = signal('');
  private file: File | null = null;
  protected readonly pieces = signal<LeakPiece[]>([]);
  protected readonly fileProblem = signal('');
  protected readonly problem = signal('');

  constructor() {
    const settle = this.form.controls.settle;
    toObservable(this.settleDefault)
      .pipe(takeUntilDestroyed())
      .subscribe((s) => {
        if (!settle.dirty) settle.setValue(String(s));
      });
    this.form.controls.method.valueChanges.pipe(takeUntilDestroyed()).subscribe(() => this.problem.set(''));
  }

  /** The fitted slope of the series or file piece (null until there is something to fit). */
  protected readonly fit = computed<LeakFit | null>(() => {
    const settle = this.settle() ?? NaN;
    const v = this.value();
    if (v.method === 'series') return v.series.trim() ? leakFromTyped(v.series, settle) : null;
    if (v.method === 'file') {
      const p = this.pieces()[v.piece];
      return p ? leakSlope(p.series, settle) : null;
    }
    return null;
  });

  protected readonly slope = computed<number | null>(() => {
    if (this.method() === 'slope') return parseCm(this.value().slope);
    const f = this.fit();
    return f?.ok ? f.slopeUmolMolS : null;
  });

  protected readonly verdict = computed(() => {
    const s = this.slope();
    return s === null ? null : leakPassed(s, this.limit());
  });

  protected async chooseFile(inputEl: HTMLInputElement): Promise<void> {
    const f = inputEl.files?.[0];
    if (!f) return;
    this.fileProblem.set('');
    this.pieces.set([]);
    this.form.controls.piece.setValue(0);
    this.fileName.set(f.name);
    this.file = f;
    try {
      const preset = savedMapping(this.memory.read(loggerPresetKey(this.analyzerId())));
      const pieces = await leakPieces(await f.text(), this.timeZone(), preset);
      if (!pieces.length)
        this.fileProblem.set(`${f.name}: no CO2 samples found. Check the columns once in Import logger file at a collar, then try again.`);
      this.pieces.set(pieces);
    } catch (err) {
      this.fileProblem.set(err instanceof Error ? err.message : String(err));
    }
  }

  protected submit(): void {
    const s = this.slope();
    const f = this.fit();
    if (this.method() === 'slope') {
      if (s === null) return this.problem.set('Enter the slope on the sealed plate in µmol/mol/s.');
      const why = this.value().reason.trim();
      if (!why) return this.problem.set('Say why the slope is typed instead of the closure (the lead sees it).');
      this.problem.set('');
      this.save.emit({ slopeUmolMolS: s, passed: leakPassed(s, this.limit()), note: `Slope typed from the analyzer: ${why}`, file: null });
      return;
    }
    if (!f || !f.ok || s === null) {
      return this.problem.set(
        f && !f.ok
          ? f.message
          : this.method() === 'file'
            ? 'Choose the logger file of the sealed-plate closure.'
            : 'Type the sealed-plate series, one "seconds CO2" a line.',
      );
    }
    this.problem.set('');
    const source = this.method() === 'file' ? `${this.fileName()}, ${this.pieces()[this.value().piece]!.label}` : 'series typed by hand';
    this.save.emit({
      slopeUmolMolS: s,
      passed: leakPassed(s, this.limit()),
      note: `Linear fit of ${f.n} samples from ${f.fromS} s to ${f.toS} s after a ${this.settle()} s settle time (${source})`,
      file: this.method() === 'file' ? this.file : null,
    });
  }
}
