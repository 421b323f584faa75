import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import type { LocalRecord } from '../../core/db/db-schema';
import { WalkContext } from '../walk/walk-context';
import { VisitWrites } from '../walk/visit-writes';
import { ClosureCard } from './closure-card';
import { closureScene } from './closure-store';
import { ClosureWrites } from './closure-writes';
import { LoggerImport, type LoggerImportData } from './logger-import';
import { readManualSeries } from './manual-series';

/**
 * Closures at one visit: big "chamber on" / "chamber off" taps (the phone's time; several
 * closures per visit), the due count, each closure with its flux on the spot and a Redo, the
 * logger file import, and a short series by hand when there is no file.
 */
@Component({
  selector: 'fw-closure-panel',
  imports: [FormsModule, MatButtonModule, ClosureCard],
  templateUrl: './closure-panel.html',
  styleUrl: './closure-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ClosurePanel {
  private readonly visits = inject(VisitWrites);
  private readonly walk = inject(WalkContext);
  private readonly closures = inject(ClosureWrites);
  private readonly dialog = inject(MatDialog);

  readonly siteId = input.required<string>();
  readonly campaignId = input.required<string>();
  readonly round = input.required<number>();
  readonly collarId = input.required<string>();
  readonly visit = input<LocalRecord | null>(null);

  protected readonly scene = closureScene(() => ({ collarId: this.collarId(), campaignId: this.campaignId(), visitId: this.visit()?.id ?? null, analyzerId: this.walk.choice().analyzerId }));
  protected readonly list = computed(() => this.scene()?.closures ?? []);
  protected readonly open = computed(() => this.list().find((c) => c['chamberOnAt'] && !c['chamberOffAt']) ?? null);
  /** A redone closure is replaced by its redo, so it does not count twice toward the due closures. */
  protected readonly counted = computed(() => this.list().filter((c) => !this.list().some((o) => o['redoOfId'] === c.id)).length);
  protected readonly due = computed(() => this.scene()?.dueClosures ?? 1);
  protected readonly message = signal('');
  protected readonly manualFor = signal<string | null>(null);
  protected manualText = '';
  protected manualTemp: number | null = null;
  protected manualPressure: number | null = null;
  private busy = false;

  private async target() {
    const v = await this.visits.ensureVisit({ siteId: this.siteId(), campaignId: this.campaignId(), round: this.round(), collarId: this.collarId() }, this.visit());
    return { siteId: this.siteId(), campaignId: this.campaignId(), collarId: this.collarId(), visitId: v.id, analyzerId: this.walk.choice().analyzerId,
      profileId: this.walk.choice().profileId };
  }

  protected async chamberOn(redoOf: LocalRecord | null = null): Promise<void> {
    if (this.busy) return;
    this.busy = true;
    try {
      const s = this.scene();
      await this.closures.chamberOn(await this.target(), s?.inputs.site ?? null, s?.inputs.profiles ?? [], redoOf);
      this.message.set(redoOf ? 'Redo started: chamber on' : 'Chamber on');
    } catch (err) {
      this.message.set(err instanceof Error ? err.message : String(err));
    } finally {
      this.busy = false;
    }
  }

  protected async chamberOff(): Promise<void> {
    const c = this.open();
    if (!c) return;
    await this.closures.chamberOff(c);
    this.message.set('Chamber off');
  }

  protected openImport(): void {
    const data: LoggerImportData = { siteId: this.siteId(), campaignId: this.campaignId(), round: this.round(), analyzerId: this.walk.choice().analyzerId,
      profileId: this.walk.choice().profileId };
    this.dialog.open(LoggerImport, { data, width: '960px', maxWidth: '100vw', autoFocus: 'first-tabbable' });
  }

  protected async saveManual(c: LocalRecord): Promise<void> {
    const r = readManualSeries(this.manualText, this.manualTemp, this.manualPressure);
    if (!r.ok) {
      this.message.set(r.message);
      return;
    }
    const on = String(c['chamberOnAt'] ?? c['startedAt']);
    const end = new Date(Date.parse(on) + 1000 * r.series.tS[r.series.tS.length - 1]!).toISOString();
    await this.closures.saveSeries(c, r.series, on, end, null);
    this.manualFor.set(null);
    this.manualText = '';
    this.message.set('Series saved');
  }
}
