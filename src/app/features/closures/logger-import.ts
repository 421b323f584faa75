import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { map } from 'rxjs';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import {
  CO2_UNITS,
  ELAPSED_UNITS,
  H2O_UNITS,
  PRESSURE_UNITS,
  TEMP_UNITS,
  TIMESTAMP_FORMATS,
  guessLayout,
  mappingFits,
  matchPiecesToVisits,
  savedMapping,
  suggestMapping,
  temperatureColumns,
  type TempColumn,
  type LoggerMapping,
  type LoggerRead,
  type PieceMatch,
  type SplitMethod,
  type SplitResult,
  type TextLayout,
} from '../../../../shared/logger';
import { counted } from '../../../../shared/text/counted';
import { DeviceDb } from '../../core/db/device-db';
import { DeviceMemory } from '../../core/device/device-memory';
import {
  assignmentProblems,
  assignmentValue,
  cutBy,
  dayClockCheck,
  defaultAssignments,
  firstCut,
  mappingPresetKey,
  loadRoundVisits,
  parseAssignment,
  visitSlots,
  type Assignment,
  type RoundVisit,
} from './import-plan';
import { ImportWriter } from './import-writer';
import { PieceCard } from './piece-card';
import { readLoggerFile } from './logger-reader';
import { FIRST_TIMESTAMP_FORMAT, mappingForm, mappingOf, mappingValue } from './mapping-form';

export interface LoggerImportData {
  siteId: string;
  campaignId: string;
  round: number;
  analyzerId: string | null;
  /** The crew's chamber profile for today: closures made from pieces carry it and its settle time. */
  profileId?: string | null;
}

type Step = 'pick' | 'map' | 'parsing' | 'review' | 'done';

/**
 * Logger file → closures: choose the file, confirm the column mapping (a preset per analyzer is
 * remembered on this device), parse in a worker with a progress bar, check the clock offset
 * (the day's clock check, or estimated from the taps; editable), then review how each piece of
 * the file matched the round's visits and assign what did not. The file itself is kept and
 * uploaded, whatever was assigned.
 */
@Component({
  selector: 'fw-logger-import',
  imports: [
    ReactiveFormsModule,
    PieceCard,
    MatButtonModule,
    MatCheckboxModule,
    MatDialogModule,
    MatFormFieldModule,
    MatInputModule,
    MatProgressBarModule,
    MatSelectModule,
  ],
  templateUrl: './logger-import.html',
  styleUrl: './logger-import.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LoggerImport {
  protected readonly data = inject<LoggerImportData>(MAT_DIALOG_DATA);
  private readonly ref = inject(MatDialogRef<LoggerImport>);
  private readonly deviceDb = inject(DeviceDb);
  private readonly memory = inject(DeviceMemory);
  private readonly writer = inject(ImportWriter);

  protected readonly units = {
    co2: Object.keys(CO2_UNITS),
    h2o: Object.keys(H2O_UNITS),
    pressure: Object.keys(PRESSURE_UNITS),
    temp: TEMP_UNITS,
    elapsed: Object.keys(ELAPSED_UNITS),
  };
  protected readonly formats = TIMESTAMP_FORMATS;
  /** The columns a file may lack, each with its column and unit controls (`<key>Column`, `<key>Unit`). */
  protected readonly optionalColumns = [
    { key: 'h2o', column: 'h2oColumn', label: 'H2O', units: this.units.h2o },
    { key: 'pressure', column: 'pressureColumn', label: 'Pressure', units: this.units.pressure },
    { key: 'temp', column: 'tempColumn', label: 'Chamber air temperature', units: this.units.temp },
  ] as const;
  protected readonly step = signal<Step>('pick');
  protected readonly error = signal('');
  protected readonly progress = signal(0);
  /** Temperature-like columns with their value ranges: the crew tells chamber air from the analyzer's own. */
  protected readonly tempColumns = signal<TempColumn[]>([]);
  protected readonly tempKindWords: Record<TempColumn['kind'], string> = {
    chamber: 'named as chamber or air temperature',
    internal: 'looks like the analyzer’s own (cell or electronics) temperature, not the chamber air',
    unknown: 'not clear which temperature this is',
  };
  protected readonly layout = signal<TextLayout | null>(null);
  /** The column mapping the crew confirms (typed form); the mapping itself is made from it when the file is read. */
  protected readonly mapForm = mappingForm();
  /** The form's value as a signal, for what the template shows or hides by it. */
  protected readonly mapValue = toSignal(this.mapForm.valueChanges.pipe(map(() => this.mapForm.getRawValue())), {
    initialValue: this.mapForm.getRawValue(),
  });
  /** Delimiter, decimal mark and header row of the mapping offered (the preset's or the file's). */
  private mapLayout: Pick<LoggerMapping, 'delimiter' | 'decimalComma' | 'headerRow'> | null = null;
  private mapping: LoggerMapping | null = null;
  protected readonly read = signal<LoggerRead | null>(null);
  protected readonly split = signal<SplitResult | null>(null);
  /** How the file is cut into closures; the crew may switch between taps and gaps. */
  protected readonly method = signal<SplitMethod>('gaps');
  /** The split method and the clock offset as the crew edits them (typed controls feeding the signals). */
  protected readonly methodControl = new FormControl<SplitMethod>('gaps', { nonNullable: true });
  protected readonly offsetControl = new FormControl<number | null>(0);
  protected readonly methods = signal<SplitMethod[]>([]);
  /** The split by the closure id column or by gaps, computed once per read. */
  private ownSplit: SplitResult | null = null;
  protected readonly visits = signal<RoundVisit[]>([]);
  protected readonly offsetS = signal(0);
  protected readonly offsetSources = signal<{ check: number | null; estimate: number | null; pairs: number }>({
    check: null,
    estimate: null,
    pairs: 0,
  });
  protected readonly assignments = signal<Record<string, Assignment>>({});
  protected readonly matches = computed<PieceMatch[]>(() => {
    const s = this.split();
    return s ? matchPiecesToVisits(s.pieces, visitSlots(this.visits()), { offsetS: this.offsetS() }) : [];
  });
  protected readonly problems = computed(() => assignmentProblems(this.split()?.pieces ?? [], this.assignments()));
  protected readonly summary = signal('');
  private file: File | null = null;
  private text = '';
  protected timeZone = 'UTC';

  constructor() {
    // A new time kind starts from its usual settings: seconds, or the first format in the site's zone.
    this.mapForm.controls.timeKind.valueChanges.pipe(takeUntilDestroyed()).subscribe((kind) =>
      this.mapForm.patchValue(kind === 'elapsed' ? { elapsedUnit: 's' } : { format: FIRST_TIMESTAMP_FORMAT, timeZone: this.timeZone }, {
        emitEvent: false,
      }),
    );
    this.methodControl.valueChanges.pipe(takeUntilDestroyed()).subscribe((m) => this.changeMethod(m));
    this.offsetControl.valueChanges.pipe(takeUntilDestroyed()).subscribe((v) => this.changeOffset(v));
  }

  private presetKey(): string {
    return mappingPresetKey(this.data.analyzerId);
  }

  protected async chooseFile(input: HTMLInputElement): Promise<void> {
    const f = input.files?.[0];
    if (!f) return;
    this.error.set('');
    if (f.size > 5 * 1024 * 1024) {
      this.error.set(`${f.name} has ${(f.size / 1048576).toFixed(1)} MiB; files are limited to 5 MiB (split the day into several files)`);
      return;
    }
    this.file = f;
    this.text = await f.text();
    const site = await this.deviceDb.run((db) => db.records('site').get(this.data.siteId));
    this.timeZone = site?.timezone ?? 'UTC';
    const layout = guessLayout(this.text);
    this.layout.set(layout);
    this.tempColumns.set(temperatureColumns(this.text, layout));
    const preset = savedMapping(this.memory.read(this.presetKey()));
    const offered = mappingFits(preset, layout)
      ? preset
      : (suggestMapping(layout.headers, layout, this.timeZone) ?? {
          ...layout,
          time: { kind: 'elapsed', column: 0, unit: 's' },
          co2: { column: Math.min(1, layout.headers.length - 1), unit: 'µmol/mol (ppm)' },
          h2o: null,
          pressure: null,
          temp: null,
          closureId: null,
        });
    this.mapLayout = { delimiter: offered.delimiter, decimalComma: offered.decimalComma, headerRow: offered.headerRow };
    this.mapForm.setValue(mappingValue(offered, this.timeZone), { emitEvent: false });
    this.mapForm.updateValueAndValidity();
    this.step.set('map');
  }

  protected async parse(): Promise<void> {
    const m = mappingOf(this.mapForm.getRawValue(), this.mapLayout!, this.layout()?.headers ?? []);
    this.mapping = m;
    this.memory.write(this.presetKey(), m);
    this.step.set('parsing');
    this.progress.set(0);
    try {
      const read = await readLoggerFile(this.text, m, (f) => this.progress.set(f));
      this.read.set(read);
      const visits = await this.deviceDb.run((db) => loadRoundVisits(db, this.data.campaignId, this.data.round));
      this.visits.set(visits);
      const timed = read.samples.length > 0 && read.samples.every((s) => s.atMs !== null);
      const check = timed ? await this.clockCheck(read.samples[0].atMs!) : null;
      const cut = firstCut(read.samples, visitSlots(visits), check);
      this.ownSplit = cut.own;
      this.offsetSources.set({ check: cut.check, estimate: cut.estimate, pairs: cut.pairs });
      this.offsetS.set(cut.offsetS);
      this.methods.set(cut.methods);
      this.method.set(cut.methods[0]);
      this.methodControl.setValue(cut.methods[0], { emitEvent: false });
      this.offsetControl.setValue(cut.offsetS, { emitEvent: false });
      this.resplit();
      this.step.set('review');
    } catch (err) {
      this.error.set(err instanceof Error ? err.message : String(err));
      this.step.set('map');
    }
  }

  private clockCheck(firstMs: number): Promise<number | null> {
    return this.deviceDb.run((db) => dayClockCheck(db, this.data.siteId, this.data.analyzerId, firstMs, this.timeZone));
  }

  private changeOffset(v: number | null): void {
    this.offsetS.set(v !== null && Number.isFinite(v) ? v : 0);
    this.resplit();
  }

  private changeMethod(m: SplitMethod): void {
    this.method.set(m);
    this.resplit();
  }

  /** The pieces for the chosen method and offset (the taps move with the offset), then a fresh matching. */
  private resplit(): void {
    const read = this.read();
    if (!read || !this.ownSplit) return;
    this.split.set(cutBy(this.method(), read.samples, this.ownSplit, visitSlots(this.visits()), this.offsetS()));
    this.assignments.set(defaultAssignments(this.matches()));
  }

  protected assign(pieceKey: string, value: string): void {
    this.assignments.update((a) => ({ ...a, [pieceKey]: parseAssignment(value) }));
  }

  protected value(pieceKey: string): string {
    return assignmentValue(this.assignments()[pieceKey]);
  }

  protected async apply(): Promise<void> {
    const { filled, left } = await this.writer.write(
      {
        siteId: this.data.siteId,
        campaignId: this.data.campaignId,
        analyzerId: this.data.analyzerId,
        profileId: this.data.profileId ?? null,
      },
      {
        file: this.file!,
        fileName: this.file!.name,
        mapping: this.mapping,
        pieces: this.split()!.pieces,
        matches: this.matches(),
        assignments: this.assignments(),
        visits: this.visits(),
        offsetS: this.offsetS(),
      },
    );
    this.summary.set(
      `${counted(filled, 'closure')} filled from ${this.file!.name}${left ? `; ${counted(left, 'piece')} left unassigned (kept in the file)` : ''}.`,
    );
    this.step.set('done');
  }

  /** "1 closure", "2 closures": for the template. */
  protected readonly counted = counted;

  protected close(): void {
    this.ref.close();
  }
}
