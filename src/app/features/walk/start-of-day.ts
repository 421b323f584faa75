import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import { TYPICAL_SETTLE_TIME_S } from '../../../../shared/flux';
import { siteFields } from '../../../../shared/model/site-layout';
import { siteDayStart, siteToday } from '../../../../shared/time/site-time';
import { SiteChoice } from '../../core/auth/site-choice';
import type { LocalRecord } from '../../core/db/db-schema';
import type { EntityFields } from '../../../../shared/model/entities';
import { textMediaType } from '../../core/db/device-files';
import { liveSignal } from '../../core/db/live-query-signal';
import { validated } from '../../core/db/validated';
import { LocalWrites } from '../../core/sync/local-writes';
import { CalibrationCard } from './calibration-card';
import { LeakCheck, type LeakResult } from './leak-check';
import { parseCm } from './offset-form';
import { CHECK_ITEMS, clockOffsetS, type CheckKind } from './start-of-day-items';
import { WalkContext } from '../field-day/walk-context';
import { SiteTimePipe } from '../../core/time/site-time-pipe';
import { todayChecks, walkOptions } from './walk-query';

/** What the start of day reads from the site's record. */
const siteDayRules = siteFields.pick({ leakSlopeUmolMolS: true, calibrationDriftLimitPct: true, safetyNote: true });

/**
 * The checks before the first collar: the site's safety note (acknowledged), analyzer, warm-up,
 * ambient CO2, leak check against the site's limit and the clock offset. Each is stored as an
 * analyzer check; a skip needs a reason and shows on the lead's Board.
 */
@Component({
  selector: 'fw-start-of-day',
  imports: [
    SiteTimePipe,
    MatButtonModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    ReactiveFormsModule,
    RouterLink,
    LeakCheck,
    CalibrationCard,
  ],
  templateUrl: './start-of-day.html',
  styleUrl: './walk.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StartOfDay {
  private readonly site = inject(SiteChoice).current;
  private readonly walk = inject(WalkContext);
  private readonly writes = inject(LocalWrites);
  protected readonly choice = this.walk.choice;
  protected readonly options = walkOptions(() => this.site()?.id ?? null);
  // Asked once the site's record (its zone) is read, so "today" is never the UTC day for a moment.
  private readonly checks = todayChecks(() => ({
    siteId: this.options() ? (this.site()?.id ?? null) : null,
    since: siteDayStart(this.timeZone()),
  }));
  protected readonly items = CHECK_ITEMS;
  protected readonly latest = computed(() => {
    const by: Partial<Record<CheckKind | 'calibration', LocalRecord<'analyzerCheck'>>> = {};
    for (const c of this.checks()) by[c.kind] ??= c;
    return by;
  });
  protected readonly doneCount = computed(() => CHECK_ITEMS.filter((i) => this.latest()[i.kind]).length);
  /** The site's limits and note (the schema's defaults until the site's record is on the device). */
  private readonly siteRules = computed(() => siteDayRules.parse(this.options()?.site ?? {}));
  protected readonly leakLimit = computed(() => this.siteRules().leakSlopeUmolMolS);
  protected readonly timeZone = computed(() => this.options()?.site?.timezone ?? 'UTC');
  /** The settle time of the site's current chamber profile: the sealed-plate closure is fitted like any other. */
  private readonly profiles = liveSignal(
    () => this.site()?.id ?? null,
    async (db, siteId) =>
      siteId ? (await db.records('chamberProfile').where('siteId').equals(siteId).toArray()).filter((p) => !p.deleted) : [],
    [],
  );
  protected readonly settleDefault = computed(() => {
    const today = siteToday(this.timeZone());
    const current = this.profiles()
      .filter((p) => p.validFrom <= today)
      .sort((a, b) => b.validFrom.localeCompare(a.validFrom))[0];
    // Without a profile valid today, the typical settle time of the flux engine.
    return current?.settleS ?? TYPICAL_SETTLE_TIME_S;
  });
  protected readonly analyzer = computed(() => this.options()?.analyzers.find((a) => a.id === this.choice().analyzerId) ?? null);
  protected readonly driftLimit = computed(() => this.siteRules().calibrationDriftLimitPct);
  /** The site's chambers (one entry per profile name, its version valid today): the crew picks the one it carries. */
  protected readonly chambers = computed(() => {
    const today = siteToday(this.timeZone());
    const byName = new Map<string, LocalRecord<'chamberProfile'>>();
    for (const p of this.profiles()) {
      const best = byName.get(p.name);
      const valid = p.validFrom <= today;
      if (!best || (valid && (best.validFrom > today || p.validFrom > best.validFrom))) byName.set(p.name, p);
    }
    return [...byName.entries()].sort(([a], [b]) => a.localeCompare(b)).map(([name, p]) => ({ id: p.id, name }));
  });
  /** The chosen chamber, shown by name even when the remembered id is another version of it. */
  protected readonly chamberChoice = computed(() => {
    const id = this.choice().profileId;
    const name = this.profiles().find((p) => p.id === id)?.name;
    return this.chambers().find((c) => c.name === name)?.id ?? null;
  });
  protected readonly safetyNote = computed(() => this.siteRules().safetyNote.trim());

  protected readonly ambient = new FormControl('', { nonNullable: true });
  protected readonly analyzerTime = new FormControl('', { nonNullable: true });
  protected readonly skipping = signal<CheckKind | null>(null);
  protected readonly skipReason = new FormControl('', { nonNullable: true });
  protected readonly problem = signal('');
  protected readonly message = signal('');

  protected pickAnalyzer(id: string): void {
    this.walk.update({ analyzerId: id });
  }

  protected pickChamber(id: string): void {
    this.walk.update({ profileId: id });
  }

  protected acknowledgeSafety(): Promise<void> {
    return this.record('safety-ack', { passed: true, note: 'Safety note read and acknowledged' });
  }

  protected warmUpDone(): Promise<void> {
    return this.record('warm-up', { passed: true });
  }

  protected saveAmbient(): Promise<void> {
    const v = parseCm(this.ambient.value);
    if (v === null) return this.fail('Enter the ambient CO2 reading in µmol/mol.');
    return this.record('ambient', { co2Ppm: v });
  }

  protected saveLeak(r: LeakResult): Promise<void> {
    const file = r.file ? { blob: r.file, fileName: r.file.name, mediaType: textMediaType(r.file.name) } : null;
    return this.record('leak', { slopeUmolMolS: r.slopeUmolMolS, passed: r.passed, note: r.note }, file);
  }

  protected saveClock(): Promise<void> {
    const off = clockOffsetS(this.analyzerTime.value, new Date(), this.timeZone());
    if (off === null) return this.fail('Enter the time the analyzer shows, as HH:MM:SS.');
    return this.record('clock', { clockOffsetS: off });
  }

  protected startSkip(kind: CheckKind): void {
    this.skipping.set(kind);
    this.skipReason.setValue('');
  }

  protected saveSkip(kind: CheckKind): Promise<void> {
    const reason = this.skipReason.value.trim();
    if (!reason) return this.fail('Say why this check is skipped: the lead sees it on the Board.');
    return this.record(kind, { skipped: true, skipReason: reason }).then(() => this.skipping.set(null));
  }

  protected summary(c: LocalRecord<'analyzerCheck'>): string {
    if (c.skipped) return `Skipped: ${c.skipReason}`;
    switch (c.kind) {
      case 'ambient':
        return `${c.co2Ppm} µmol/mol`;
      case 'leak':
        return `${c.slopeUmolMolS === null ? '—' : c.slopeUmolMolS.toFixed(4)} µmol/mol/s — ${c.passed ? 'passed' : 'FAILED: check seals and tubing'}`;
      case 'clock':
        return `analyzer ${(c.clockOffsetS ?? 0) >= 0 ? '+' : ''}${c.clockOffsetS} s against this phone`;
      case 'safety-ack':
        return 'Acknowledged';
      default:
        return 'Done';
    }
  }

  private async fail(msg: string): Promise<void> {
    this.problem.set(msg);
  }

  /** Stores one check; a file it was read from (the leak check's logger file) is kept with it. */
  private async record(
    kind: CheckKind,
    fields: Partial<EntityFields<'analyzerCheck'>>,
    file: { blob: Blob; fileName: string; mediaType: string } | null = null,
  ): Promise<void> {
    const siteId = this.site()?.id;
    if (!siteId) return this.fail('No site chosen.');
    const analyzerId = kind === 'safety-ack' ? null : this.choice().analyzerId;
    if (kind !== 'safety-ack' && !analyzerId && !fields.skipped) return this.fail('Choose the analyzer first.');
    this.problem.set('');
    try {
      const rec = validated('analyzerCheck', { siteId, analyzerId, kind, at: new Date().toISOString(), ...fields });
      if (file) await this.writes.createWithFile('analyzerCheck', rec, file);
      else await this.writes.create('analyzerCheck', rec);
      this.message.set(`${CHECK_ITEMS.find((i) => i.kind === kind)!.title}: saved on this device${file ? `, with ${file.fileName}` : ''}.`);
    } catch (err) {
      this.problem.set(err instanceof Error ? err.message : 'Could not save on this device');
    }
  }
}
