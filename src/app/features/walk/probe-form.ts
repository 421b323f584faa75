import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, input, output, signal, untracked } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatRadioModule } from '@angular/material/radio';
import { probeVwcPct, type MoistureCalibration } from '../../../../shared/model/derived';
import { parseCm } from './offset-form';

export interface ProbeKit {
  probeId: string;
  rodLengthCm: number | null;
  moistureKind: 'vwc' | 'permittivity';
}

export interface ProbeReadingInput extends ProbeKit {
  soilTemps: { depthCm: number; tempC: number }[];
  moistureRaw: number | null;
}

/**
 * Soil temperature at one or more depths and soil moisture, as VWC or as permittivity converted
 * live with the site's calibration (Topp et al. 1980 unless the site has its own polynomial). The
 * probe kit (id, rod length, kind) carries over from the last collar.
 */
@Component({
  selector: 'fw-probe-form',
  imports: [DecimalPipe, MatButtonModule, MatFormFieldModule, MatInputModule, MatRadioModule],
  templateUrl: './probe-form.html',
  styles: `
    .depth { display: grid; grid-template-columns: 1fr 1fr; gap: 0 12px; }
    mat-form-field { width: 100%; }
    .vwc { font-size: 1.25rem; font-weight: 700; margin: 0 0 12px; }
    .warning { border: 2px solid var(--mat-sys-error); padding: 8px 12px; border-radius: 8px; font-weight: 600; }
    mat-radio-button { min-height: 48px; display: inline-flex; align-items: center; }
    .row { display: flex; flex-wrap: wrap; gap: 8px; margin-bottom: 8px; }
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

  protected readonly temps = signal<{ depth: string; temp: string }[]>([{ depth: '5', temp: '' }]);
  protected readonly kind = signal<'vwc' | 'permittivity'>('vwc');
  protected readonly moisture = signal('');
  protected readonly rod = signal('');
  protected readonly probeId = signal('');
  protected readonly problem = signal('');

  constructor() {
    effect(() => {
      const k = this.kit();
      const depth = this.defaultDepthCm();
      untracked(() => {
        this.kind.set(k.moistureKind);
        this.probeId.set(k.probeId);
        this.rod.set(k.rodLengthCm === null ? '' : String(k.rodLengthCm));
        this.temps.update((t) => (t.length === 1 && !t[0].temp ? [{ depth: String(depth), temp: '' }] : t));
      });
    });
  }

  /** The VWC this reading stands for, % — the same function the server uses for the stored value. */
  protected readonly vwcPct = computed(() => {
    const raw = parseCm(this.moisture());
    if (raw === null) return null;
    return probeVwcPct({ moistureRaw: raw, moistureKind: this.kind() }, this.calibration());
  });
  protected readonly calibrationName = computed(() => (this.calibration().kind === 'topp' ? 'Topp et al. 1980' : 'the site calibration'));

  protected setTemp(i: number, field: 'depth' | 'temp', text: string): void {
    this.temps.update((t) => t.map((row, j) => (j === i ? { ...row, [field]: text } : row)));
  }

  protected addDepth(): void {
    this.temps.update((t) => [...t, { depth: '', temp: '' }]);
  }

  protected removeDepth(i: number): void {
    this.temps.update((t) => t.filter((_, j) => j !== i));
  }

  submit(): void {
    const soilTemps: { depthCm: number; tempC: number }[] = [];
    for (const row of this.temps()) {
      const depthCm = parseCm(row.depth);
      const tempC = parseCm(row.temp);
      if (depthCm === null && tempC === null) continue;
      if (depthCm === null || tempC === null) {
        this.problem.set('Give both depth and temperature for each soil temperature, or leave both empty.');
        return;
      }
      soilTemps.push({ depthCm, tempC });
    }
    const moistureRaw = parseCm(this.moisture());
    if (this.moisture().trim() && moistureRaw === null) {
      this.problem.set('Moisture must be a number.');
      return;
    }
    if (!soilTemps.length && moistureRaw === null) {
      this.problem.set('Enter a soil temperature or a moisture reading.');
      return;
    }
    this.problem.set('');
    this.save.emit({ soilTemps, moistureRaw, moistureKind: this.kind(), rodLengthCm: parseCm(this.rod()), probeId: this.probeId().trim() });
  }
}
