import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, effect, inject, input, output, signal, untracked } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { FormArray, FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatRadioModule } from '@angular/material/radio';
import { debounceTime } from 'rxjs';
import { probeVwcPct, type MoistureCalibration } from '../../../../shared/model/derived';
import { AUTOSAVE_MS, parseCm } from './offset-form';

export interface ProbeKit {
  probeId: string;
  rodLengthCm: number | null;
  moistureKind: 'vwc' | 'permittivity';
}

export interface ProbeReadingInput extends ProbeKit {
  soilTemps: { depthCm: number; tempC: number }[];
  moistureRaw: number | null;
}

type DepthRow = FormGroup<{ depth: FormControl<string>; temp: FormControl<string> }>;
const text = (v: unknown) => (v === null || v === undefined ? '' : String(v));
const depthRow = (depth: string, temp = ''): DepthRow => new FormGroup({ depth: new FormControl(depth, { nonNullable: true }), temp: new FormControl(temp, { nonNullable: true }) });

/** Reads the form into a reading, or says what is wrong (pure, for the spec). */
export function readProbe(v: { temps: { depth: string; temp: string }[]; kind: 'vwc' | 'permittivity'; moisture: string; rod: string; probeId: string }): { ok: true; reading: ProbeReadingInput } | { ok: false; message: string } {
  const soilTemps: { depthCm: number; tempC: number }[] = [];
  for (const row of v.temps) {
    const depthCm = parseCm(row.depth);
    const tempC = parseCm(row.temp);
    if (tempC === null && !row.temp.trim()) continue;
    if (depthCm === null || tempC === null) return { ok: false, message: 'Give both depth and temperature for each soil temperature, or leave the temperature empty.' };
    soilTemps.push({ depthCm, tempC });
  }
  const moistureRaw = parseCm(v.moisture);
  if (v.moisture.trim() && moistureRaw === null) return { ok: false, message: 'Moisture must be a number.' };
  if (!soilTemps.length && moistureRaw === null) return { ok: false, message: 'Enter a soil temperature or a moisture reading.' };
  return { ok: true, reading: { soilTemps, moistureRaw, moistureKind: v.kind, rodLengthCm: parseCm(v.rod), probeId: v.probeId.trim() } };
}

/**
 * Soil temperature at one or more depths and soil moisture, as VWC or as permittivity converted
 * live with the site's calibration (Topp et al. 1980 unless the site has its own polynomial). The
 * probe kit (id, rod length, kind) carries over from the last collar. Readings save themselves
 * after a short pause; the saved values are what the boxes show when the visit is opened again,
 * and the section folds to one line once temperature and moisture are both in.
 */
@Component({
  selector: 'fw-probe-form',
  imports: [DecimalPipe, MatButtonModule, MatFormFieldModule, MatInputModule, MatRadioModule, ReactiveFormsModule],
  templateUrl: './probe-form.html',
  styles: `
    .depth { display: grid; grid-template-columns: 1fr 1fr; gap: 0 12px; }
    mat-form-field { width: 100%; }
    .vwc { font-size: 1.25rem; font-weight: 700; margin: 0 0 12px; }
    .warning { border: 2px solid var(--mat-sys-error); padding: 8px 12px; border-radius: 8px; font-weight: 600; }
    mat-radio-button { min-height: 48px; display: inline-flex; align-items: center; }
    .row { display: flex; flex-wrap: wrap; gap: 8px; margin-bottom: 8px; }
    .summary { display: flex; align-items: center; justify-content: space-between; gap: 8px; margin: 0; }
    button { min-height: 48px; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProbeForm {
  readonly calibration = input.required<MoistureCalibration>();
  readonly defaultDepthCm = input(5);
  readonly kit = input<ProbeKit>({ probeId: '', rodLengthCm: null, moistureKind: 'vwc' });
  readonly saved = input<Record<string, unknown> | null>(null);
  readonly busy = input(false);
  readonly save = output<ProbeReadingInput>();

  protected readonly form = new FormGroup({
    temps: new FormArray<DepthRow>([depthRow('5')]),
    kind: new FormControl<'vwc' | 'permittivity'>('vwc', { nonNullable: true }),
    moisture: new FormControl('', { nonNullable: true }),
    rod: new FormControl('', { nonNullable: true }),
    probeId: new FormControl('', { nonNullable: true }),
  });
  private readonly value = toSignal(this.form.valueChanges, { initialValue: this.form.getRawValue() });
  protected readonly problem = signal('');
  protected readonly editing = signal(false);
  /** The record id whose values are in the boxes (so a save does not overwrite what is being typed). */
  private shownRecord: string | null = null;
  /** A first save is on its way: its record takes over the boxes as they are. */
  private adoptNext = false;

  constructor() {
    effect(() => {
      const k = this.kit();
      const depth = this.defaultDepthCm();
      const saved = this.saved();
      untracked(() => {
        if (saved) {
          if (this.shownRecord === saved['id']) return;
          this.shownRecord = String(saved['id']);
          if (this.adoptNext) {
            this.adoptNext = false;
            return;
          }
          this.fill(saved);
          return;
        }
        this.form.patchValue({ kind: k.moistureKind, probeId: k.probeId, rod: text(k.rodLengthCm) });
        const temps = this.form.controls.temps;
        if (temps.length === 1 && !temps.at(0).controls.temp.value) temps.at(0).controls.depth.setValue(String(depth));
      });
    });
    this.form.valueChanges.pipe(debounceTime(AUTOSAVE_MS), takeUntilDestroyed(inject(DestroyRef))).subscribe(() => this.autosave());
  }

  private fill(r: Record<string, unknown>): void {
    const temps = (r['soilTemps'] as { depthCm: number; tempC: number }[] | undefined) ?? [];
    const arr = this.form.controls.temps;
    arr.clear({ emitEvent: false });
    for (const t of temps.length ? temps : [{ depthCm: this.defaultDepthCm(), tempC: null }]) arr.push(depthRow(text(t.depthCm), text(t.tempC)), { emitEvent: false });
    this.form.patchValue({
      kind: (r['moistureKind'] as 'vwc' | 'permittivity') ?? 'vwc', moisture: text(r['moistureRaw']),
      rod: text(r['rodLengthCm']), probeId: text(r['probeId']),
    });
  }

  protected readonly kind = computed(() => this.value().kind ?? 'vwc');
  /** The VWC this reading stands for, % — the same function the server uses for the stored value. */
  protected readonly vwcPct = computed(() => {
    const raw = parseCm(this.value().moisture ?? '');
    if (raw === null) return null;
    return probeVwcPct({ moistureRaw: raw, moistureKind: this.kind() }, this.calibration());
  });
  protected readonly calibrationName = computed(() => (this.calibration().kind === 'topp' ? 'Topp et al. 1980' : 'the site calibration'));
  /** Both parts are in: the section folds. */
  protected readonly complete = computed(() => {
    const s = this.saved();
    return !!s && ((s['soilTemps'] as unknown[] | undefined)?.length ?? 0) > 0 && typeof s['moistureRaw'] === 'number';
  });
  protected readonly collapsed = computed(() => this.complete() && !this.editing());
  protected readonly summary = computed(() => {
    const s = this.saved();
    if (!s) return '';
    const temps = ((s['soilTemps'] as { depthCm: number; tempC: number }[]) ?? []).map((t) => `${t.tempC} °C at ${t.depthCm} cm`).join(', ');
    const m = s['moistureKind'] === 'permittivity' ? `Ka ${s['moistureRaw']}` : `${s['moistureRaw']} % VWC`;
    return `${temps} · ${m}`;
  });

  protected addDepth(): void {
    this.form.controls.temps.push(depthRow(''));
  }

  protected removeDepth(i: number): void {
    this.form.controls.temps.removeAt(i);
  }

  protected change(): void {
    this.editing.set(true);
  }

  private autosave(): void {
    const r = readProbe(this.form.getRawValue());
    if (!r.ok) return;
    this.emit(r.reading);
  }

  private emit(reading: ProbeReadingInput): void {
    const s = this.saved();
    const same = s && JSON.stringify([s['soilTemps'], s['moistureRaw'] ?? null, s['moistureKind'], s['rodLengthCm'] ?? null, s['probeId'] ?? ''])
      === JSON.stringify([reading.soilTemps, reading.moistureRaw, reading.moistureKind, reading.rodLengthCm, reading.probeId]);
    if (same) return;
    if (s) this.shownRecord = String(s['id']);
    else this.adoptNext = true;
    this.editing.set(false);
    this.save.emit(reading);
  }

  /** Saves now (Enter in a box); the pause-save does the same without a tap. */
  submit(): void {
    const r = readProbe(this.form.getRawValue());
    if (!r.ok) {
      this.problem.set(r.message);
      return;
    }
    this.problem.set('');
    this.emit(r.reading);
  }
}
