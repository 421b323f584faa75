import { ScrollingModule } from '@angular/cdk/scrolling';
import { DOCUMENT, DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { Router, RouterLink } from '@angular/router';
import { SiteChoice } from '../../core/auth/site-choice';
import { DeviceDb } from '../../core/db/device-db';
import { SyncEngine } from '../../core/sync/sync-engine';
import { OutdoorMode } from '../../core/theme/outdoor-mode';
import { notYetSynced } from '../../core/sync/sync-status';
import { localDay, siteDayStart } from '../../../../shared/time/site-time';
import { Gps, wayTo } from './gps';
import { QrScan } from './qr-scan';
import { STATE_GLYPHS, STATE_WORDS } from '../../core/map/collar-states';
import { nextDueIndex, routeSummary } from './route-order';
import { CHECK_ITEMS } from './start-of-day-items';
import { WalkContext } from '../field-day/walk-context';
import type { RouteRow } from './route-query';
import { RouteStore } from './route-store';
import { todayChecks, walkOptions } from './walk-query';

/** One route row's height in rem (route-list.scss gives every row exactly this height). */
export const ROUTE_ROW_REM = 4.125;

/**
 * The route of today's round: pick campaign, round and route; collars in walking order with
 * what is due; the next due collar on top with distance and bearing from here. Reads the device
 * store only, so it is the same offline.
 */
@Component({
  selector: 'fw-walk',
  imports: [
    DecimalPipe,
    MatButtonModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatSlideToggleModule,
    QrScan,
    ReactiveFormsModule,
    RouterLink,
    ScrollingModule,
  ],
  templateUrl: './walk.html',
  styleUrls: ['./walk.scss', './route-list.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Walk {
  private readonly site = inject(SiteChoice).current;
  private readonly walk = inject(WalkContext);
  private readonly gps = inject(Gps);
  private readonly router = inject(Router);
  private readonly engine = inject(SyncEngine);
  private readonly deviceDb = inject(DeviceDb);
  private readonly outdoor = inject(OutdoorMode);
  private readonly document = inject(DOCUMENT);
  protected readonly choice = this.walk.choice;
  protected readonly options = walkOptions(() => this.site()?.id ?? null);
  protected readonly route = inject(RouteStore).view(() => {
    const c = this.choice();
    return { campaignId: c.campaignId, routeId: c.routeId, round: c.round, flipped: c.flipped };
  });
  /** The site's zone ("today" is the site's day); UTC until the site's record is on the device. */
  private readonly zone = computed(() => this.options()?.site?.timezone ?? 'UTC');
  // Asked once the site's record (its zone) is read, so "today" is never the UTC day for a moment.
  private readonly checks = todayChecks(() => ({
    siteId: this.options() ? (this.site()?.id ?? null) : null,
    since: siteDayStart(this.zone()),
  }));
  protected readonly checksDone = computed(() => CHECK_ITEMS.filter((i) => this.checks().some((c) => c.kind === i.kind)).length);
  protected readonly checkCount = CHECK_ITEMS.length;
  /** Today's analyzer by name, or '' when none was chosen today (closures wait for one). */
  protected readonly analyzerToday = computed(() => {
    const c = this.choice();
    const tz = this.zone();
    if (!c.kitAt || localDay(c.kitAt, tz) !== localDay(new Date().toISOString(), tz)) return '';
    return this.options()?.analyzers.find((a) => a.id === c.analyzerId)?.name ?? '';
  });
  protected readonly pendingLabel = computed(() => notYetSynced(this.engine.pending()));
  protected readonly fix = this.gps.fix;
  protected readonly gpsError = this.gps.error;
  protected readonly code = new FormControl('', { nonNullable: true });
  protected readonly codeProblem = signal('');
  protected readonly stateLabel = STATE_WORDS;
  protected readonly stateMark = STATE_GLYPHS;
  /** One row's height in px for the virtual scroll: rem follow the device's font size and the outdoor theme's larger type. */
  protected readonly rowPx = computed(() => {
    this.outdoor.enabled();
    const rootPx = parseFloat(getComputedStyle(this.document.documentElement).fontSize) || 16;
    return ROUTE_ROW_REM * rootPx;
  });
  protected readonly byId = (_: number, r: RouteRow) => r.id;

  protected readonly campaign = computed(() => this.options()?.campaigns.find((c) => c.id === this.choice().campaignId) ?? null);
  // Round 1 only until a campaign is chosen.
  protected readonly rounds = computed(() => Array.from({ length: this.campaign()?.rounds ?? 1 }, (_, i) => i + 1));
  /** Routes of the chosen campaign (all site routes when the campaign names none). */
  protected readonly routes = computed(() => {
    const planned = this.campaign()?.routes.map((r) => r.routeId) ?? [];
    const all = this.options()?.routes ?? [];
    return planned.length ? all.filter((r) => planned.includes(r.id)) : all;
  });
  protected readonly next = computed(() => {
    const rows = this.route()?.rows ?? [];
    const i = nextDueIndex(rows.map((r) => r.state));
    return i < 0 ? null : rows[i];
  });
  protected readonly nextWay = computed(() => {
    const n = this.next();
    return n ? wayTo(this.fix(), n.latitude, n.longitude) : null;
  });
  protected readonly summary = computed(() => routeSummary((this.route()?.rows ?? []).map((r) => r.state)));

  constructor() {
    const stop = this.gps.watch();
    inject(DestroyRef).onDestroy(stop);
    // First open, and whenever the device's campaigns change: keep the crew's choice if it is still
    // open, else take the newest open campaign and its first route, so the crew sees a route at once.
    toObservable(this.options)
      .pipe(takeUntilDestroyed())
      .subscribe((o) => {
        if (!o) return;
        const c = this.choice();
        const campaign = o.campaigns.find((x) => x.id === c.campaignId) ?? o.campaigns[0];
        if (!campaign) return;
        const planned = campaign.routes.map((r) => r.routeId);
        const routeOk = c.routeId && (!planned.length || planned.includes(c.routeId));
        if (campaign.id !== c.campaignId || !routeOk) {
          this.walk.update({ campaignId: campaign.id, routeId: routeOk ? c.routeId : (planned[0] ?? o.routes[0]?.id ?? null) });
        }
      });
  }

  protected pickCampaign(id: string): void {
    const c = this.options()?.campaigns.find((x) => x.id === id);
    const planned = c?.routes.map((r) => r.routeId) ?? [];
    this.walk.update({ campaignId: id, round: 1, routeId: planned[0] ?? this.choice().routeId });
  }

  protected pickRound(round: number): void {
    this.walk.update({ round });
  }

  protected pickRoute(id: string): void {
    this.walk.update({ routeId: id });
  }

  protected flip(on: boolean): void {
    this.walk.update({ flipped: on });
  }

  /**
   * Opens a collar by its code: looked up in the device store (not only the route on screen, which
   * may still be loading), so any collar of the site opens, on this route or not.
   */
  protected async openByCode(): Promise<void> {
    const typed = this.code.value.trim();
    if (!typed) return;
    const wanted = typed.toLowerCase();
    const siteId = this.site()?.id ?? null;
    const found = await this.deviceDb.run(async (db) => {
      const table = db.records('collar');
      const list = siteId ? await table.where('siteId').equals(siteId).toArray() : await table.toArray();
      return list.find((c) => !c.deleted && c.code.toLowerCase() === wanted) ?? null;
    });
    if (!found) {
      this.codeProblem.set(
        `No collar ${typed} on this device. Check the code, sync when you have signal (it may be new), scan its tag, or install it as a new collar.`,
      );
      return;
    }
    this.codeProblem.set('');
    await this.router.navigate(['/walk/visit', found.id]);
  }

  protected dueText(due: readonly string[]): string {
    return due.length ? due.join(', ') : 'nothing due';
  }
}
