import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { DEFAULT_CALIBRATION_DRIFT_LIMIT_PCT, calibrationAgeDays } from '../../../../shared/model/calibration';
import { AuthStore } from '../../core/auth/auth-store';
import type { LocalRecord } from '../../core/db/db-schema';
import { liveSignal } from '../../core/db/live-query-signal';
import { validated } from '../../core/db/validated';
import { LocalWrites } from '../../core/sync/local-writes';
import { CalibrationForm, type CalibrationEntry } from '../calibration/calibration-form';
import { siteTime } from '../calibration/site-clock';

/**
 * The chosen analyzer's calibration at the start of the day: when it was last calibrated against
 * its interval, and a zero/span calibration recorded on this device (store + outbox, synced later).
 */
@Component({
  selector: 'fw-calibration-card',
  imports: [MatButtonModule, CalibrationForm],
  template: `
    <section class="card" aria-labelledby="calibration-heading" data-testid="calibration-card">
      <h2 id="calibration-heading">Calibration</h2>
      @if (!analyzer()) {
        <p>Choose the analyzer to see its calibration.</p>
      } @else {
        @if (last(); as c) {
          <p [class.ok]="!overdue()" [class.warning]="overdue()" data-testid="calibration-status">
            Last calibrated {{ when(c.at) }} ({{ ageDays() }} days ago; due every {{ analyzer()!.calibrationIntervalDays }} days)@if (overdue()) {: overdue}
            @if (c.driftPpm !== null) { · span drift {{ c.driftPpm }} µmol/mol }
          </p>
        } @else {
          <p class="warning" data-testid="calibration-status">No calibration of {{ analyzer()!.name }} on record</p>
        }
        @if (open()) {
          <fw-calibration-form [driftLimitPct]="driftLimitPct()" [timeZone]="timeZone()" [recordedBy]="recordedBy()" [busy]="busy()" (save)="saveCalibration($event)" />
          <button mat-button type="button" (click)="open.set(false)">Cancel</button>
        } @else {
          <button mat-stroked-button type="button" (click)="open.set(true)">Record a calibration…</button>
        }
      }
      <p role="status" class="message">{{ message() }}</p>
      <p role="alert" class="problem">{{ problem() }}</p>
    </section>
  `,
  styleUrl: './walk.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CalibrationCard {
  private readonly writes = inject(LocalWrites);
  private readonly auth = inject(AuthStore);
  readonly siteId = input.required<string>();
  readonly analyzer = input<LocalRecord<'analyzer'> | null>(null);
  readonly driftLimitPct = input(DEFAULT_CALIBRATION_DRIFT_LIMIT_PCT);
  readonly timeZone = input('UTC');

  protected readonly open = signal(false);
  protected readonly busy = signal(false);
  protected readonly message = signal('');
  protected readonly problem = signal('');
  protected readonly recordedBy = computed(() => this.auth.user()?.displayName ?? '');
  /** The analyzer's latest calibration on this device (skipped ones do not count). */
  protected readonly last = liveSignal(
    () => ({ siteId: this.siteId(), analyzerId: this.analyzer()?.id ?? null }),
    async (db, p) => {
      if (!p.analyzerId) return null;
      const all = await db.records('analyzerCheck').where('siteId').equals(p.siteId).toArray();
      return (
        all
          .filter((c) => c.analyzerId === p.analyzerId && c.kind === 'calibration' && !c.skipped && !c.deleted && c.passed !== false)
          .sort((a, b) => b.at.localeCompare(a.at))[0] ?? null
      );
    },
    null as LocalRecord<'analyzerCheck'> | null,
  );
  protected readonly ageDays = computed(() => {
    const c = this.last();
    return c ? calibrationAgeDays(c.at, new Date()) : null;
  });
  protected readonly overdue = computed(() => {
    const age = this.ageDays();
    return age === null || age >= (this.analyzer()?.calibrationIntervalDays ?? Infinity);
  });

  protected when(iso: string): string {
    return siteTime(iso, this.timeZone());
  }

  protected async saveCalibration(entry: CalibrationEntry): Promise<void> {
    const analyzer = this.analyzer();
    if (!analyzer) return;
    this.busy.set(true);
    this.problem.set('');
    try {
      const rec = validated('analyzerCheck', { siteId: this.siteId(), analyzerId: analyzer.id, kind: 'calibration', ...entry });
      await this.writes.create('analyzerCheck', rec);
      this.open.set(false);
      this.message.set(`Calibration of ${analyzer.name} saved on this device.`);
    } catch (err) {
      this.problem.set(err instanceof Error ? err.message : 'Could not save on this device');
    } finally {
      this.busy.set(false);
    }
  }
}
