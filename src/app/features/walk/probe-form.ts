import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, ElementRef, computed, inject, input, output, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable, toSignal } from '@angular/core/rxjs-interop';
import { FormArray, FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatRadioModule } from '@angular/material/radio';
import { debounceTime } from 'rxjs';
import { v4 as uuidv4 } from 'uuid';
import { probeVwcPct, type MoistureCalibration } from '../../../../shared/model/derived';
import { AuthStore } from '../../core/auth/auth-store';
import type { LocalRecord } from '../../core/db/db-schema';
import type { ProbeValues } from '../field-day/visit-writes';
import { AUTOSAVE_MS, parseCm } from './offset-form';
import { readProbe, type ProbeKit, type ProbeReadingInput } from './probe-input';
import { ProbeReplicateList, type ReplicateRow } from './probe-replicate-list';

export { readProbe, type ProbeKit, type ProbeReadingInput } from './probe-input';

/** One replicate to store under its id (a new id is a new replicate; the same id corrects it). */
export interface ProbeSave {
  id: string;
  reading: ProbeReadingInput;
}

/** A stored probe replicate as the device keeps it. */
export type ProbeRecord = LocalRecord<'probeReading'>;
/** The replicate in the boxes: stored, or just sent and not back from the device's store yet. */
type Draft = ProbeValues & { id: string };

type DepthRow = FormGroup<{ depth: FormControl<string>; temp: FormControl<string> }>;
const text = (v: unknown) => (v === null || v === undefined ? '' : String(v));
const depthRow = (depth: string, temp = ''): DepthRow =>
  new FormGroup({ depth: new FormControl(depth, { nonNullable: true }), temp: new FormControl(temp, { nonNullable: true }) });
/** What a reading says, compared by value: a stored record may list a depth's fields in any order. */
const valuesOf = (r: ProbeValues) =>
  JSON.stringify([r.soilTemps.map((t) => [t.depthCm, t.tempC]), r.moistureRaw, r.moistureKind, r.rodLengthCm, r.probeId]);
const complete = (r: ProbeValues | null) => !!r && r.soilTemps.length > 0 && typeof r.moistureRaw === 'number';

/**
 * Soil temperature at one or more depths and soil moisture, as VWC or as permittivity converted
 * live with the site's calibration (Topp et al. 1980 unless the site has its own polynomial). A
 * visit keeps every probe insertion as its own replicate: the boxes hold one replicate (its id
 * decided here), "Add a replicate" empties them for the next (kit and depths carry over), and the
 * list above shows each replicate with mean, SD and n. Values save themselves after a short pause;
 * the section folds to one line once the replicate in the boxes has temperature and moisture.
 */
@Component({
  selector: 'fw-probe-form',
  imports: [DecimalPipe, MatButtonModule, MatFormFieldModule, MatInputModule, MatRadioModule, ReactiveFormsModule, ProbeReplicateList],
  templateUrl: './probe-form.html',
  styles: `
    // Rows 12 px apart: an outlined field's floating label rises above its box, over the field above.
    .depth {
      display: grid;
      grid-template-columns: 1fr 1fr;
      gap: 12px;
      margin-top: 12px;
    }
    // On a phone the moisture value takes the row and its reading kind goes below (the label stays whole).
    @media (max-width: 599.98px) {
      .depth.moisture {
        grid-template-columns: 1fr;
      }
    }
    mat-form-field {
      width: 100%;
    }
    .vwc {
      font-size: 1.25rem;
      font-weight: 700;
      margin: 0 0 12px;
    }
    .warning {
      border: 2px solid var(--mat-sys-error);
      padding: 8px 12px;
      border-radius: 8px;
      font-weight: 600;
    }
    mat-radio-button {
      min-height: 48px;
      display: inline-flex;
      align-items: center;
    }
    .row {
      display: flex;
      flex-wrap: wrap;
      gap: 8px;
      margin-bottom: 8px;
    }
    .summary {
      display: flex;
      flex-wrap: wrap;
      align-items: center;
      justify-content: space-between;
      gap: 8px;
      margin: 0;
    }
    button {
      min-height: 48px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProbeForm {
  readonly calibration = input.required<MoistureCalibration>();
  readonly defaultDepthCm = input(5);
  /** The site's depth tolerance, cm: temperatures further from defaultDepthCm are flagged and left out of the mean. */
  readonly depthToleranceCm = input.required<number>();
  readonly kit = input<ProbeKit>({ probeId: '', rodLengthCm: null, moistureKind: 'vwc' });
  /** The visit's newest replicate: what the boxes show when the visit is opened again. */
  readonly saved = input<ProbeRecord | null>(null);
  /** Every live replicate of the visit, oldest first. */
  readonly replicates = input<readonly ProbeRecord[]>([]);
  /** The site's time zone: replicate times are shown in it. */
  readonly zone = input('UTC');
  readonly busy = input(false);
  readonly save = output<ProbeSave>();
  readonly removeReplicate = output<string>();

  private readonly auth = inject(AuthStore, { optional: true });
  private readonly host = inject(ElementRef<HTMLElement>);
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
  /** The replicate in the boxes: a stored one, or a new id not stored yet. */
  private readonly draftId = signal(uuidv4());
  /** What was last sent for the draft (shown until the stored record comes back). */
  private readonly sent = signal<(ProbeReadingInput & { id: string }) | null>(null);
  /** The boxes took a stored replicate (or the kit) once; later arrivals never replace what is typed. */
  private started = false;

  protected readonly draft = computed((): Draft | null => {
    const id = this.draftId();
    const stored = this.replicates().find((r) => r.id === id);
    if (stored) return stored;
    const sent = this.sent();
    return sent?.id === id ? sent : null;
  });

  constructor() {
    // Until the boxes hold a replicate, they follow what arrives: the visit's stored replicate
    // (opened again), else the crew's kit and the site's probe depth.
    toObservable(computed(() => ({ kit: this.kit(), depth: this.defaultDepthCm(), saved: this.saved() })))
      .pipe(takeUntilDestroyed())
      .subscribe(({ kit, depth, saved }) => {
        if (this.started) return;
        if (saved) {
          this.started = true;
          this.draftId.set(saved.id);
          this.fill(saved);
          return;
        }
        this.form.patchValue({ kind: kit.moistureKind, probeId: kit.probeId, rod: text(kit.rodLengthCm) });
        const temps = this.form.controls.temps;
        if (temps.length === 1 && !temps.at(0).controls.temp.value)
          temps.at(0).controls.depth.setValue(String(depth), { emitEvent: false });
      });
    this.form.valueChanges.pipe(debounceTime(AUTOSAVE_MS), takeUntilDestroyed(inject(DestroyRef))).subscribe(() => this.autosave());
  }

  private fill(r: ProbeValues): void {
    const temps = r.soilTemps;
    const arr = this.form.controls.temps;
    arr.clear({ emitEvent: false });
    for (const t of temps.length ? temps : [{ depthCm: this.defaultDepthCm(), tempC: null }])
      arr.push(depthRow(text(t.depthCm), text(t.tempC)), { emitEvent: false });
    this.form.patchValue({
      // A replicate with temperatures only has no moisture kind: the boxes offer VWC.
      kind: r.moistureKind ?? 'vwc',
      moisture: text(r.moistureRaw),
      rod: text(r.rodLengthCm),
      probeId: text(r.probeId),
    });
  }

  protected readonly kind = computed(() => this.value().kind ?? 'vwc');
  /** The VWC this reading stands for, % — the same function the server uses for the stored value. */
  protected readonly vwcPct = computed(() => {
    const raw = parseCm((this.value().moisture ?? '').replace(/\s*%$/, ''));
    if (raw === null) return null;
    return probeVwcPct({ moistureRaw: raw, moistureKind: this.kind() }, this.calibration());
  });
  protected readonly calibrationName = computed(() => (this.calibration().kind === 'topp' ? 'Topp et al. 1980' : 'the site calibration'));
  /** The replicate in the boxes has both parts: the section folds. */
  protected readonly collapsed = computed(() => !this.editing() && complete(this.draft()));
  protected readonly summary = computed(() => {
    const s = this.draft();
    return s ? `${s.soilTemps.map((t) => `${t.tempC} °C at ${t.depthCm} cm`).join(', ')} · ${this.moistureText(s)}` : '';
  });
  protected readonly rows = computed((): ReplicateRow[] => {
    const me = this.auth?.user()?.id ?? null;
    const cal = this.calibration();
    return this.replicates().map((r) => ({
      id: r.id,
      takenAt: r.takenAt,
      takenBy: !r.takenById ? 'taker not recorded' : r.takenById === me ? 'you' : 'another member',
      soilTemps: r.soilTemps,
      moistureText: this.moistureText(r),
      vwcPct: probeVwcPct(r, cal),
    }));
  });

  private moistureText(r: Pick<ProbeValues, 'moistureRaw' | 'moistureKind'>): string {
    if (typeof r.moistureRaw !== 'number') return '';
    return r.moistureKind === 'permittivity' ? `Ka ${r.moistureRaw}` : `${r.moistureRaw} % VWC`;
  }

  protected addDepth(): void {
    this.form.controls.temps.push(depthRow(''));
  }

  protected removeDepth(i: number): void {
    this.form.controls.temps.removeAt(i);
  }

  protected change(): void {
    this.editing.set(true);
  }

  /** Empties the boxes for the next insertion (kit and depths stay) under a new id, and puts the cursor in Moisture. */
  protected addReplicate(): void {
    this.started = true;
    this.draftId.set(uuidv4());
    this.sent.set(null);
    this.problem.set('');
    const temps = this.form.controls.temps;
    for (const row of temps.controls) row.controls.temp.setValue('', { emitEvent: false });
    this.form.controls.moisture.setValue('');
    this.editing.set(true);
    setTimeout(() => (this.host.nativeElement as HTMLElement).querySelector<HTMLInputElement>('[data-testid="moisture-raw"]')?.focus());
  }

  protected deleteReplicate(id: string): void {
    if (id === this.draftId()) {
      this.draftId.set(uuidv4());
      this.sent.set(null);
      this.editing.set(false);
    }
    this.removeReplicate.emit(id);
  }

  private autosave(): void {
    const r = readProbe(this.form.getRawValue());
    if (!r.ok) {
      // Only what is typed is wrong: say so; nothing stored is touched.
      if (this.form.controls.moisture.value.trim() || this.form.controls.temps.controls.some((t) => t.controls.temp.value.trim()))
        this.problem.set(r.message);
      return;
    }
    this.problem.set('');
    this.emit(r.reading);
  }

  private emit(reading: ProbeReadingInput): void {
    const d = this.draft();
    if (d && valuesOf(d) === valuesOf(reading)) return;
    this.started = true;
    const id = this.draftId();
    this.sent.set({ ...reading, id });
    this.editing.set(false);
    this.save.emit({ id, reading });
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
