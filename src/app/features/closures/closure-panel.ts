import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import type { LocalRecord } from '../../core/db/db-schema';
import { WalkContext } from '../field-day/walk-context';
import { VisitWrites } from '../field-day/visit-writes';
import { RouterLink } from '@angular/router';
import { ClosureCard } from './closure-card';
import { ClosureTimer, clockText } from './closure-timer';
import { dayKit } from './day-kit';
import { closureScene, DEFAULT_DUE_CLOSURES } from './closure-scene';
import { ClosureWrites, type ClosureTarget } from './closure-writes';
import { LoggerImport, type LoggerImportData } from './logger-import';
import { readManualSeries } from './manual-series';
import { chamberProfileFields } from '../../../../shared/model/site-layout';

/** A chamber profile's closure length when it names none (the schema's default). */
const DEFAULT_CLOSURE_LENGTH_S = chamberProfileFields.shape.closureLengthS.parse(undefined);

/**
 * Closures at one visit. A bar fixed to the bottom of the screen holds what the crew needs with
 * the chamber on: the big "chamber on" / "chamber off" tap (the phone's time), the elapsed time
 * against the profile's closure length, and "Next collar". A closure starts only with today's
 * analyzer and chamber profile, each chosen in one tap. Below: the due count, each closure with
 * its flux on the spot and a Redo (never beside a running closure), the logger file import, and a
 * short series by hand when there is no file.
 */
@Component({
  selector: 'fw-closure-panel',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, RouterLink, ClosureCard, ClosureTimer],
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
  /** The visit at this collar in this round, once it exists (made by the first save or tap). */
  readonly visit = input<{ id: string } | null>(null);
  /** The next due collar on the route, for the bar's "Next collar". */
  readonly next = input<{ id: string; code: string } | null>(null);

  protected readonly scene = closureScene(() => ({
    collarId: this.collarId(),
    campaignId: this.campaignId(),
    visitId: this.visit()?.id ?? null,
    analyzerId: this.walk.choice().analyzerId,
  }));
  protected readonly list = computed(() => this.scene()?.closures ?? []);
  protected readonly open = computed(() => this.list().find((c) => c.chamberOnAt && !c.chamberOffAt) ?? null);
  /** A redone closure is replaced by its redo, so it does not count twice toward the due closures. */
  protected readonly counted = computed(() => this.list().filter((c) => !this.list().some((o) => o.redoOfId === c.id)).length);
  protected readonly due = computed(() => this.scene()?.dueClosures ?? DEFAULT_DUE_CLOSURES);
  protected readonly kit = computed(() => {
    const s = this.scene();
    const c = this.walk.choice();
    if (!s) return null;
    return dayKit({
      analyzerId: c.analyzerId,
      kitAt: c.kitAt,
      profileId: c.profileId,
      site: s.inputs.site,
      analyzers: s.analyzers,
      profiles: s.inputs.profiles,
    });
  });
  protected readonly lastAnalyzerId = computed(() => this.walk.choice().analyzerId);
  /** The day's profile's closure length; before one is chosen, the schema's default length. */
  protected readonly targetS = computed(() => this.kit()?.profile?.closureLengthS ?? DEFAULT_CLOSURE_LENGTH_S);
  protected readonly targetLabel = computed(() => clockText(this.targetS()));
  protected readonly message = signal('');
  protected readonly manualFor = signal<string | null>(null);
  /** A short series typed by hand: samples, the chamber air temperature and (optional) pressure. */
  protected readonly manual = new FormGroup({
    text: new FormControl('', { nonNullable: true }),
    tempC: new FormControl<number | null>(null),
    pressureKpa: new FormControl<number | null>(null),
  });
  private busy = false;

  private async target(): Promise<ClosureTarget> {
    const visitId =
      this.visit()?.id ??
      (
        await this.visits.ensureVisit(
          { siteId: this.siteId(), campaignId: this.campaignId(), round: this.round(), collarId: this.collarId() },
          null,
        )
      ).id;
    return {
      siteId: this.siteId(),
      campaignId: this.campaignId(),
      collarId: this.collarId(),
      visitId,
      analyzerId: this.walk.choice().analyzerId,
      profileId: this.walk.choice().profileId,
    };
  }

  protected async chamberOn(redoOf: LocalRecord<'closure'> | null = null): Promise<void> {
    // One closure at a time: nothing starts (a redo least of all) while the chamber is on.
    if (this.busy || this.open()) return;
    this.busy = true;
    try {
      const kit = this.kit();
      if (!kit || kit.missing) {
        this.message.set(kit?.missing ?? "Loading the day's analyzer and chamber…");
        return;
      }
      await this.closures.chamberOn({ ...(await this.target()), analyzerId: kit.analyzer!.id }, kit.profile, redoOf);
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

  protected pickAnalyzer(id: string): void {
    this.walk.update({ analyzerId: id, kitAt: new Date().toISOString() });
    this.message.set('');
  }

  protected pickProfile(name: string): void {
    const version = this.scene()?.inputs.profiles.find((p) => p.name === name);
    if (version) this.walk.update({ profileId: version.id });
    this.message.set('');
  }

  protected openImport(): void {
    const data: LoggerImportData = {
      siteId: this.siteId(),
      campaignId: this.campaignId(),
      round: this.round(),
      analyzerId: this.walk.choice().analyzerId,
      profileId: this.walk.choice().profileId,
    };
    this.dialog.open(LoggerImport, { data, width: '960px', maxWidth: '100vw', autoFocus: 'first-tabbable' });
  }

  protected async saveManual(c: LocalRecord<'closure'>): Promise<void> {
    const m = this.manual.getRawValue();
    const r = readManualSeries(m.text, m.tempC, m.pressureKpa);
    if (!r.ok) {
      this.message.set(r.message);
      return;
    }
    const on = c.chamberOnAt ?? c.startedAt;
    const end = new Date(Date.parse(on) + 1000 * r.series.tS[r.series.tS.length - 1]!).toISOString();
    await this.closures.saveSeries(c, r.series, on, end, null);
    this.manualFor.set(null);
    this.manual.controls.text.reset();
    this.message.set('Series saved');
  }
}
