import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import {
  CO2_UNITS, ELAPSED_UNITS, H2O_UNITS, PRESSURE_UNITS, TEMP_UNITS, TIMESTAMP_FORMATS, estimateClockOffset, guessLayout,
  matchPiecesToVisits, medianStepS, pieceSeries, savedMapping, splitByTaps, splitClosures, suggestMapping, temperatureColumns, type TempColumn,
  type LoggerMapping, type LoggerRead, type PieceMatch, type SplitMethod, type SplitResult, type TextLayout,
} from '../../../../shared/logger';
import { DeviceDb } from '../../core/db/device-db';
import { DeviceMemory } from '../../core/device/device-memory';
import { ClosureWrites } from './closure-writes';
import { localDay } from './closure-flux';
import {
  assignmentProblems, assignmentValue, defaultAssignments, loadRoundVisits, parseAssignment, tapWindows, visitSlots, type Assignment, type RoundVisit,
} from './import-plan';
import { readLoggerFile } from './logger-reader';

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
  imports: [FormsModule, MatButtonModule, MatCheckboxModule, MatDialogModule, MatProgressBarModule],
  templateUrl: './logger-import.html',
  styleUrl: './logger-import.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LoggerImport {
  protected readonly data = inject<LoggerImportData>(MAT_DIALOG_DATA);
  private readonly ref = inject(MatDialogRef<LoggerImport>);
  private readonly deviceDb = inject(DeviceDb);
  private readonly memory = inject(DeviceMemory);
  private readonly writes = inject(ClosureWrites);

  protected readonly units = { co2: Object.keys(CO2_UNITS), h2o: Object.keys(H2O_UNITS), pressure: Object.keys(PRESSURE_UNITS), temp: TEMP_UNITS, elapsed: Object.keys(ELAPSED_UNITS) };
  protected readonly formats = TIMESTAMP_FORMATS;
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
  protected mapping: LoggerMapping | null = null;
  protected readonly read = signal<LoggerRead | null>(null);
  protected readonly split = signal<SplitResult | null>(null);
  /** How the file is cut into closures; the crew may switch between taps and gaps. */
  protected readonly method = signal<SplitMethod>('gaps');
  protected readonly methods = signal<SplitMethod[]>([]);
  /** The split by the closure id column or by gaps, computed once per read. */
  private ownSplit: SplitResult | null = null;
  protected readonly visits = signal<RoundVisit[]>([]);
  protected readonly offsetS = signal(0);
  protected readonly offsetSources = signal<{ check: number | null; estimate: number | null; pairs: number }>({ check: null, estimate: null, pairs: 0 });
  protected readonly assignments = signal<Record<string, Assignment>>({});
  protected readonly matches = computed<PieceMatch[]>(() => {
    const s = this.split();
    return s ? matchPiecesToVisits(s.pieces, visitSlots(this.visits()), { offsetS: this.offsetS() }) : [];
  });
  protected readonly problems = computed(() => assignmentProblems(this.split()?.pieces ?? [], this.assignments()));
  protected readonly summary = signal('');
  private file: File | null = null;
  private text = '';
  private timeZone = 'UTC';

  private presetKey(): string {
    return `fw.logger-preset.${this.data.analyzerId ?? 'none'}`;
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
    this.timeZone = String(site?.['timezone'] ?? 'UTC');
    const layout = guessLayout(this.text);
    this.layout.set(layout);
    this.tempColumns.set(temperatureColumns(this.text, layout));
    const preset = savedMapping(this.memory.read(this.presetKey()));
    const fits = preset && preset.headerRow === layout.headerRow && preset.delimiter === layout.delimiter;
    this.mapping = fits ? structuredClone(preset) : suggestMapping(layout.headers, layout, this.timeZone) ?? {
      ...layout, time: { kind: 'elapsed', column: 0, unit: 's' }, co2: { column: Math.min(1, layout.headers.length - 1), unit: 'µmol/mol (ppm)' },
      h2o: null, pressure: null, temp: null, closureId: null,
    };
    this.step.set('map');
  }

  protected setTimeKind(kind: 'elapsed' | 'timestamp'): void {
    const m = this.mapping!;
    m.time = kind === 'elapsed' ? { kind, column: m.time.column, unit: 's' } : { kind, column: m.time.column, format: 'YYYY-MM-DD HH:mm:ss', timeZone: this.timeZone };
  }

  /** Optional columns: -1 in the select means "not in this file". */
  protected optional(key: 'h2o' | 'pressure' | 'temp' | 'closureId', column: number): void {
    const m = this.mapping! as unknown as Record<string, { column: number; unit?: string } | null>;
    const unit = { h2o: 'mmol/mol', pressure: 'kPa', temp: '°C', closureId: undefined }[key];
    m[key] = column < 0 ? null : { ...(m[key] ?? (unit ? { unit } : {})), column };
  }

  protected async parse(): Promise<void> {
    const m = this.mapping!;
    this.memory.write(this.presetKey(), m);
    this.step.set('parsing');
    this.progress.set(0);
    try {
      const read = await readLoggerFile(this.text, m, (f) => this.progress.set(f));
      this.read.set(read);
      const visits = await this.deviceDb.run((db) => loadRoundVisits(db, this.data.campaignId, this.data.round));
      this.visits.set(visits);
      const slots = visitSlots(visits);
      const taps = slots.flatMap((v) => v.taps);
      // Closure id column, else taps, else gaps. The taps need the clock offset first: the day's
      // clock check, else an estimate from the taps against the closures the gaps show.
      const own = splitClosures(read.samples);
      this.ownSplit = own;
      const timed = read.samples.length > 0 && read.samples.every((s) => s.atMs !== null);
      const est = own.method === 'gaps' && timed
        ? estimateClockOffset(taps.map((t) => ({ key: t.key, startMs: t.onMs, endMs: t.offMs })), own.pieces.map((p) => ({ key: p.key, startMs: p.startMs!, endMs: p.endMs })))
        : null;
      const check = timed ? await this.clockCheck(read.samples[0].atMs!) : null;
      this.offsetSources.set({ check, estimate: est?.offsetS ?? null, pairs: est?.pairs.length ?? 0 });
      this.offsetS.set(check ?? est?.offsetS ?? 0);
      const byTaps = own.method === 'gaps' && timed && taps.length > 0;
      this.methods.set(own.method === 'closureId' ? ['closureId'] : byTaps ? ['taps', 'gaps'] : ['gaps']);
      this.method.set(this.methods()[0]);
      this.resplit();
      this.step.set('review');
    } catch (err) {
      this.error.set(err instanceof Error ? err.message : String(err));
      this.step.set('map');
    }
  }

  /** The analyzer's clock offset from the start-of-day check on the file's day, when one was taken. */
  private async clockCheck(firstMs: number): Promise<number | null> {
    if (!this.data.analyzerId) return null;
    const day = localDay(new Date(firstMs).toISOString(), this.timeZone);
    const checks = await this.deviceDb.run((db) => db.records('analyzerCheck').where('siteId').equals(this.data.siteId)
      .filter((c) => !c.deleted && c['kind'] === 'clock' && c['analyzerId'] === this.data.analyzerId && typeof c['clockOffsetS'] === 'number').toArray());
    const today = checks.filter((c) => localDay(String(c['at']), this.timeZone) === day).sort((a, b) => String(b['at']).localeCompare(String(a['at'])));
    return today.length ? Number(today[0]['clockOffsetS']) : null;
  }

  protected changeOffset(v: number): void {
    this.offsetS.set(Number.isFinite(v) ? v : 0);
    this.resplit();
  }

  protected changeMethod(m: SplitMethod): void {
    this.method.set(m);
    this.resplit();
  }

  /** The pieces for the chosen method and offset (the taps move with the offset), then a fresh matching. */
  private resplit(): void {
    const read = this.read();
    if (!read || !this.ownSplit) return;
    if (this.method() === 'taps') {
      const windows = tapWindows(visitSlots(this.visits()), this.offsetS());
      this.split.set(splitByTaps(read.samples, windows, medianStepS(read.samples) / 2));
    } else {
      this.split.set(this.ownSplit);
    }
    this.assignments.set(defaultAssignments(this.matches()));
  }

  protected assign(pieceKey: string, value: string): void {
    this.assignments.update((a) => ({ ...a, [pieceKey]: parseAssignment(value) }));
  }

  protected value(pieceKey: string): string {
    return assignmentValue(this.assignments()[pieceKey]);
  }

  protected time(ms: number | null): string {
    return ms === null ? '—' : new Date(ms).toLocaleTimeString();
  }

  protected tapTime(c: { [k: string]: unknown }): string {
    return this.time(Date.parse(String(c['chamberOnAt'])));
  }

  protected async apply(): Promise<void> {
    const split = this.split()!;
    const a = this.assignments();
    const byId = new Map(this.visits().flatMap((v) => v.waiting.map((c) => [c.id, c] as const)));
    const visitById = new Map(this.visits().map((v) => [v.visit.id, v.visit]));
    const chosen = split.pieces.filter((p) => a[p.key] && a[p.key].kind !== 'none');
    const shift = this.offsetS() * 1000;
    const times = (p: (typeof chosen)[number]) => {
      const m = this.matches().find((x) => x.pieceKey === p.key);
      const tap = a[p.key].kind === 'closure' ? byId.get((a[p.key] as { closureId: string }).closureId) : null;
      // Elapsed-time files carry no clock: the tap's time stands in for the start.
      const start = p.startMs !== null ? p.startMs - shift : Date.parse(String(tap?.['chamberOnAt'] ?? new Date().toISOString()));
      const series = pieceSeries(p, this.mapping);
      const end = m?.correctedEndMs ?? start + 1000 * series.tS[series.tS.length - 1];
      return { series, startedAt: new Date(start).toISOString(), endedAt: new Date(end).toISOString() };
    };
    // New closures first, so the file can name one of them as its owner.
    const targets = new Map<string, string>();
    for (const p of chosen) {
      const x = a[p.key];
      if (x.kind === 'closure') targets.set(p.key, x.closureId);
    }
    const pending: { key: string; visitId: string }[] = chosen.filter((p) => a[p.key].kind === 'new').map((p) => ({ key: p.key, visitId: (a[p.key] as { visitId: string }).visitId }));
    const attachmentOwner = [...targets.values()][0];
    let attachmentId: string | null = null;
    if (attachmentOwner) attachmentId = await this.writes.keepFile(this.data.siteId, attachmentOwner, this.file!, this.file!.name);
    const [siteRec, profiles] = pending.length ? await this.deviceDb.run((db) => Promise.all([
      db.records('site').get(this.data.siteId),
      db.records('chamberProfile').where('siteId').equals(this.data.siteId).filter((p) => !p.deleted).toArray(),
    ])) : [undefined, []];
    for (const n of pending) {
      const v = visitById.get(n.visitId)!;
      const t = times(split.pieces.find((x) => x.key === n.key)!);
      const target = { siteId: this.data.siteId, campaignId: this.data.campaignId, collarId: String(v['collarId']), visitId: v.id, analyzerId: this.data.analyzerId,
        profileId: this.data.profileId ?? null };
      const rec = await this.writes.createFromPiece(target, siteRec ?? null, profiles, t.series, t.startedAt, t.endedAt, attachmentId);
      if (!attachmentId) {
        // No tapped closure to own the file: the first new closure owns it and then names it.
        attachmentId = await this.writes.keepFile(this.data.siteId, rec.id, this.file!, this.file!.name);
        await this.writes.saveSeries(rec, t.series, t.startedAt, t.endedAt, attachmentId);
      }
    }
    for (const p of chosen) {
      const closureId = targets.get(p.key);
      if (!closureId) continue;
      const t = times(p);
      await this.writes.saveSeries(byId.get(closureId)!, t.series, t.startedAt, t.endedAt, attachmentId);
    }
    const left = split.pieces.length - chosen.length;
    this.summary.set(`${chosen.length} closure${chosen.length === 1 ? '' : 's'} filled from ${this.file!.name}${left ? `; ${left} piece(s) left unassigned (kept in the file)` : ''}.`);
    this.step.set('done');
  }

  protected close(): void {
    this.ref.close();
  }
}
