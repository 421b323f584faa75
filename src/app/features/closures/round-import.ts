import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import {
  guessLayout,
  mappingFits,
  matchPiecesToVisits,
  plainExportMapping,
  savedMapping,
  type LoggerMapping,
  type LoggerPiece,
  type PieceMatch,
} from '../../../../shared/logger';
import { counted } from '../../../../shared/text/counted';
import { siteTimeParts } from '../../../../shared/time/site-time';
import { DeviceDb } from '../../core/db/device-db';
import { DeviceMemory } from '../../core/device/device-memory';
import { WalkContext } from '../field-day/walk-context';
import {
  assignmentProblems,
  assignmentValue,
  cutBy,
  dayClockCheck,
  defaultAssignments,
  firstCut,
  loadRoundVisits,
  mappingPresetKey,
  parseAssignment,
  visitSlots,
  type Assignment,
  type RoundVisit,
} from './import-plan';
import { ImportWriter } from './import-writer';
import { LoggerImport, type LoggerImportData } from './logger-import';
import { readLoggerFile } from './logger-reader';
import { PieceCard } from './piece-card';

type Step = 'pick' | 'parsing' | 'unmapped' | 'review' | 'done';

/**
 * The logger file of a whole round in one pass: every piece of the file goes to its chamber tap at
 * whichever collar it was, by the same matching the per-collar import uses. A file whose header
 * fits the analyzer's saved mapping (or our plain export) is read at once; when every piece
 * matched, one tap saves them all. Pieces without a tap, taps without a piece and ambiguous pieces
 * are listed for the crew to place before saving.
 */
@Component({
  selector: 'fw-round-import',
  imports: [MatButtonModule, MatProgressBarModule, RouterLink, PieceCard],
  templateUrl: './round-import.html',
  styleUrl: './round-import.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RoundImport {
  private readonly deviceDb = inject(DeviceDb);
  private readonly memory = inject(DeviceMemory);
  private readonly writer = inject(ImportWriter);
  private readonly dialog = inject(MatDialog);
  protected readonly choice = inject(WalkContext).choice;
  protected readonly counted = counted;
  protected readonly step = signal<Step>('pick');
  protected readonly error = signal('');
  protected readonly progress = signal(0);
  protected readonly fileName = signal('');
  protected readonly visits = signal<RoundVisit[]>([]);
  protected readonly pieces = signal<LoggerPiece[]>([]);
  protected readonly matches = signal<PieceMatch[]>([]);
  /** Only what the crew or the matcher placed; an unplaced piece has no entry and blocks saving. */
  protected readonly assignments = signal<Record<string, Assignment>>({});
  protected readonly summary = signal('');
  /** Lines the mapping could not read (left out, kept in the file). */
  protected readonly unread = signal(0);
  protected timeZone = 'UTC';
  private siteId = '';
  private mapping: LoggerMapping | null = null;
  private file: File | null = null;
  private offsetS = 0;

  protected readonly rows = computed(() => this.matches().map((m, i) => ({ m, p: this.pieces()[i] })));
  protected readonly open = computed(() => this.rows().filter((r) => r.m.status !== 'matched'));
  protected readonly placed = computed(() => this.rows().filter((r) => r.m.status === 'matched'));
  protected readonly unplaced = computed(() => this.pieces().filter((p) => !this.assignments()[p.key]).length);
  protected readonly problems = computed(() => assignmentProblems(this.pieces(), this.assignments()));
  /** Taps of the round no piece went to: the crew sees which collars the file does not cover. */
  protected readonly tapsWithout = computed(() => {
    const used = new Set(Object.values(this.assignments()).flatMap((a) => (a.kind === 'closure' ? [a.closureId] : [])));
    return this.visits().flatMap((v) => v.waiting.filter((c) => !used.has(c.id)).map((c) => ({ code: v.collarCode, at: c.chamberOnAt })));
  });
  protected readonly toWrite = computed(() => Object.values(this.assignments()).filter((a) => a.kind !== 'none').length);
  protected readonly collars = computed(
    () =>
      new Set(
        this.visits()
          .filter((v) => v.waiting.length)
          .map((v) => v.visit.collarId),
      ).size,
  );

  protected async chooseFile(input: HTMLInputElement): Promise<void> {
    const f = input.files?.[0];
    const c = this.choice();
    if (!f || !c.campaignId) return;
    this.error.set('');
    if (f.size > 5 * 1024 * 1024) {
      this.error.set(`${f.name} has ${(f.size / 1048576).toFixed(1)} MiB; files are limited to 5 MiB (split the day into several files)`);
      return;
    }
    this.file = f;
    this.fileName.set(f.name);
    const text = await f.text();
    const campaign = await this.deviceDb.run((db) => db.records('campaign').get(c.campaignId!));
    this.siteId = campaign?.siteId ?? '';
    const site = await this.deviceDb.run((db) => db.records('site').get(this.siteId));
    this.timeZone = site?.timezone ?? 'UTC';
    const layout = guessLayout(text);
    const preset = savedMapping(this.memory.read(mappingPresetKey(c.analyzerId)));
    this.mapping = mappingFits(preset, layout) ? preset : plainExportMapping(layout.headers, layout, this.timeZone);
    if (!this.mapping) {
      this.step.set('unmapped');
      return;
    }
    this.step.set('parsing');
    this.progress.set(0);
    try {
      const read = await readLoggerFile(text, this.mapping, (x) => this.progress.set(x));
      if (!read.samples.length && read.problems.length) {
        // Our column names but another time format, say: the mapping has to be confirmed first.
        this.error.set(`No line of ${f.name} could be read with the mapping kept for this analyzer (${read.problems[0].message})`);
        this.step.set('unmapped');
        return;
      }
      this.unread.set(read.problems.length);
      const visits = await this.deviceDb.run((db) => loadRoundVisits(db, c.campaignId!, c.round));
      const slots = visitSlots(visits);
      const timed = read.samples.length > 0 && read.samples.every((s) => s.atMs !== null);
      const check = timed
        ? await this.deviceDb.run((db) => dayClockCheck(db, this.siteId, c.analyzerId, read.samples[0].atMs!, this.timeZone))
        : null;
      const cut = firstCut(read.samples, slots, check);
      this.offsetS = cut.offsetS;
      const split = cutBy(cut.methods[0], read.samples, cut.own, slots, cut.offsetS);
      const matches = matchPiecesToVisits(split.pieces, slots, { offsetS: cut.offsetS });
      const start = defaultAssignments(matches);
      for (const m of matches) if (m.status !== 'matched') delete start[m.pieceKey];
      this.visits.set(visits);
      this.pieces.set(split.pieces);
      this.matches.set(matches);
      this.assignments.set(start);
      if (!split.pieces.length) this.error.set(`No closures found in ${f.name}`);
      this.step.set('review');
    } catch (err) {
      this.error.set(err instanceof Error ? err.message : String(err));
      this.step.set('pick');
    }
  }

  /** A file in columns this analyzer has no saved mapping for: mapped once in the full import, kept for next time. */
  protected mapColumns(): void {
    const c = this.choice();
    const data: LoggerImportData = {
      siteId: this.siteId,
      campaignId: c.campaignId!,
      round: c.round,
      analyzerId: c.analyzerId,
      profileId: c.profileId,
    };
    this.dialog.open(LoggerImport, { data, width: '960px', maxWidth: '100vw', autoFocus: 'first-tabbable' });
  }

  protected value(key: string): string {
    return this.assignments()[key] ? assignmentValue(this.assignments()[key]) : '';
  }

  protected assign(key: string, value: string): void {
    this.assignments.update((a) => ({ ...a, [key]: parseAssignment(value) }));
  }

  protected async save(): Promise<void> {
    const c = this.choice();
    const { filled, left } = await this.writer.write(
      { siteId: this.siteId, campaignId: c.campaignId!, analyzerId: c.analyzerId, profileId: c.profileId },
      {
        file: this.file!,
        fileName: this.file!.name,
        mapping: this.mapping,
        pieces: this.pieces(),
        matches: this.matches(),
        assignments: this.assignments(),
        visits: this.visits(),
        offsetS: this.offsetS,
      },
    );
    this.summary.set(
      `${counted(filled, 'closure')} filled from ${this.file!.name}${left ? `; ${counted(left, 'piece')} left out (kept in the file)` : ''}.`,
    );
    this.step.set('done');
  }

  protected clock(at: string): string {
    // The site's wall clock (shared/time), as the crew's logger and taps read it; one zone for the whole list.
    return siteTimeParts(at, this.timeZone, true).time;
  }
}
