import { Injectable, computed, inject, linkedSignal, resource, signal } from '@angular/core';
import { serverMessage } from '../../core/api/api-error';
import { SiteChoice } from '../../core/auth/site-choice';
import type { StoredRecord } from '../../../../shared/model/stored-record';
import { BoardApi, type Campaign, type Member, type Progress } from './board-api';
import { BoardCache } from './board-cache';
import type { ProgressRow } from './progress-rows';

/**
 * The Board's data for the chosen site and campaign: read from the API, each answer kept for
 * offline viewing, joined into progress rows with route, plot, treatment and crew names.
 * Provided per Board screen.
 */
@Injectable()
export class BoardStore {
  private readonly api = inject(BoardApi);
  private readonly cache = inject(BoardCache);
  private readonly siteChoice = inject(SiteChoice);

  readonly site = this.siteChoice.current;
  /** The site's IANA zone: every time the Board shows, and its "today", is in it. */
  readonly zone = computed(() => this.site()?.timezone ?? 'UTC');
  /** Set by the Board screen when it opens; the panels alone (and their tests) read nothing. */
  private readonly shown = signal(false);
  /**
   * The site's campaigns and layout, read when a site is chosen (and on Refresh). A resource, so
   * an answer for a site no longer chosen is dropped.
   */
  private readonly siteLayout = resource({
    params: () => (this.shown() ? this.site()?.id : undefined),
    loader: ({ params: siteId, abortSignal }) => this.readSite(siteId, abortSignal),
  });
  /** Campaigns as read, with the ones saved here since laid over them. */
  readonly campaigns = linkedSignal(() => this.siteLayout.value()?.campaigns ?? []);
  /** The chosen campaign: kept while the site's campaigns still hold it, else the latest open one. */
  readonly campaignId = linkedSignal<Campaign[], string | null>({
    source: this.campaigns,
    computation: (campaigns, previous) => pickCampaign(campaigns, previous?.value ?? null),
  });
  readonly round = signal<number | null>(null);
  /** The chosen campaign's progress in the chosen round, read again whenever either changes (an older answer is dropped). */
  private readonly progressRead = resource({
    params: () => {
      const id = this.campaignId();
      return this.shown() && id ? { id, round: this.round() } : undefined;
    },
    loader: ({ params, abortSignal }) => this.readProgress(params.id, params.round, abortSignal),
  });
  /** The progress shown: the last answer stays on screen while another round or campaign is read; none without a campaign. */
  readonly progress = linkedSignal<{ value: Progress | undefined; idle: boolean }, Progress | null>({
    source: () => ({ value: this.progressRead.value(), idle: this.progressRead.status() === 'idle' }),
    computation: (read, previous) => (read.idle ? null : (read.value ?? previous?.value ?? null)),
  });
  readonly routes = linkedSignal(() => this.siteLayout.value()?.routes ?? []);
  readonly plots = computed(() => this.siteLayout.value()?.plots ?? []);
  readonly treatments = computed(() => this.siteLayout.value()?.treatments ?? []);
  readonly members = computed(() => this.siteLayout.value()?.members ?? []);
  /** The site's collars (positions, codes), loaded only by the screens that need them (Plan, Map). */
  readonly collars = signal<StoredRecord<'collar'>[]>([]);
  private collarsFor: string | null = null;
  readonly loading = computed(() => this.siteLayout.isLoading() || this.progressRead.isLoading());
  readonly problem = signal('');
  /** Set when what is shown is the last answer kept on this device, not a live one. */
  readonly offlineSince = signal<string | null>(null);

  readonly campaign = computed(() => this.campaigns().find((c) => c.id === this.campaignId()) ?? null);

  readonly crewRoutes = computed(() => {
    const map = new Map<string, string[]>();
    for (const r of this.campaign()?.routes ?? []) for (const c of r.crewIds) map.set(c, [...(map.get(c) ?? []), r.routeId]);
    return map;
  });

  readonly rows = computed<ProgressRow[]>(() => {
    const p = this.progress();
    if (!p) return [];
    const routeName = new Map(this.routes().map((r) => [r.id, r.name]));
    const plot = new Map(this.plots().map((x) => [x.id, x]));
    const treatment = new Map(this.treatments().map((t) => [t.id, t.code]));
    const memberName = new Map(this.members().map((m) => [m.id, m.displayName]));
    // Collar-level treatments (e.g. trenched/untrenched) arrive with the collar list, after the first paint.
    const collarTreatment = new Map(this.collars().flatMap((k) => (k.treatmentId ? [[k.id, k.treatmentId] as const] : [])));
    const crewOf = new Map((this.campaign()?.routes ?? []).map((r) => [r.routeId, r.crewIds.map((id) => memberName.get(id) ?? 'someone')]));
    return p.collars.map((c, order) => {
      const pl = plot.get(c.plotId);
      const codes = [pl?.treatmentId, collarTreatment.get(c.collarId)]
        .map((id) => (id ? treatment.get(id) : undefined))
        .filter((x): x is string => !!x);
      return {
        ...c,
        order,
        routeName: c.routeId ? (routeName.get(c.routeId) ?? '') : '',
        plotCode: pl?.code ?? '',
        treatmentCodes: codes,
        crewNames: c.routeId ? (crewOf.get(c.routeId) ?? []) : [],
      };
    });
  });

  private guard<T>(key: string, fetch: () => Promise<T>): Promise<T> {
    return this.cache.load(key, fetch).then((r) => {
      if (r.fromCache) this.offlineSince.set(r.savedAt);
      return r.value;
    });
  }

  /** The Board screen opened: from now on the chosen site's layout is read, and read again when another site is chosen. */
  show(): void {
    this.shown.set(true);
  }

  /** Reads the site's campaigns and layout again (Refresh), and the chosen campaign's progress. */
  loadSite(): void {
    this.siteLayout.reload();
    this.progressRead.reload();
  }

  /** Reads the chosen campaign's progress again (its plan or a route's order changed). */
  reloadProgress(): void {
    this.progressRead.reload();
  }

  private async readSite(siteId: string, abortSignal: AbortSignal): Promise<SiteLayout | undefined> {
    this.problem.set('');
    this.offlineSince.set(null);
    try {
      const q = { siteId };
      const [campaigns, routes, plots, treatments] = await Promise.all([
        this.guard(`campaigns.${siteId}`, () => this.api.list('campaign', q)),
        this.guard(`routes.${siteId}`, () => this.api.list('route', q)),
        this.guard(`plots.${siteId}`, () => this.api.list('plot', q)),
        this.guard(`treatments.${siteId}`, () => this.api.list('treatment', q)),
      ]);
      const members = await this.guard(`members.${siteId}`, () => this.api.members(siteId)).catch((): Member[] => []);
      // Another site was chosen meanwhile: its own read fills the Board.
      if (abortSignal.aborted) return undefined;
      // Refresh re-reads the collars too: new ones belong on the map and in the rows.
      this.collarsFor = null;
      void this.ensureCollars();
      return { campaigns, routes, plots, treatments, members };
    } catch (err) {
      this.problem.set(serverMessage(err, 'The Board could not be loaded'));
      return undefined;
    }
  }

  private async readProgress(id: string, round: number | null, abortSignal: AbortSignal): Promise<Progress | undefined> {
    try {
      const p = await this.guard(`progress.${id}.${round ?? 'all'}`, () => this.api.progress(id, round));
      if (abortSignal.aborted) return undefined;
      // The browser test times the first rows from here (a test DOM may have no User Timing).
      performance.mark?.('board-progress-data');
      return p;
    } catch (err) {
      this.problem.set(serverMessage(err, 'Progress could not be loaded'));
      return undefined;
    }
  }

  async ensureCollars(): Promise<void> {
    const site = this.site();
    if (!site || this.collarsFor === site.id) return;
    this.collarsFor = site.id;
    try {
      this.collars.set(await this.guard(`collars.${site.id}`, () => this.api.list('collar', { siteId: site.id })));
    } catch (err) {
      this.collarsFor = null;
      this.problem.set(serverMessage(err, 'Collars could not be loaded'));
    }
  }

  choose(campaignId: string | null): void {
    this.campaignId.set(campaignId);
    const c = this.campaign();
    if (c && (this.round() ?? 0) > c.rounds) this.round.set(null);
  }

  /** Puts a saved campaign into the list without a reload. */
  replaceCampaign(rec: Campaign): void {
    this.campaigns.update((xs) => upsert(xs, rec));
  }

  replaceRoute(rec: StoredRecord<'route'>): void {
    this.routes.update((xs) => upsert(xs, rec));
  }

  async setLocked(locked: boolean): Promise<void> {
    const id = this.campaignId();
    if (!id) return;
    this.problem.set('');
    try {
      this.replaceCampaign(await this.api.setLocked(id, locked));
    } catch (err) {
      this.problem.set(serverMessage(err, locked ? 'The campaign could not be closed' : 'The campaign could not be reopened'));
    }
  }
}

interface SiteLayout {
  campaigns: Campaign[];
  routes: StoredRecord<'route'>[];
  plots: StoredRecord<'plot'>[];
  treatments: StoredRecord<'treatment'>[];
  members: Member[];
}

/** The campaign to show: the chosen one while the site still has it, else the latest open one, else the latest. */
function pickCampaign(campaigns: readonly Campaign[], chosen: string | null): string | null {
  if (chosen && campaigns.some((c) => c.id === chosen)) return chosen;
  return (campaigns.find((c) => !c.locked) ?? campaigns[0])?.id ?? null;
}

function upsert<T extends { id: string }>(xs: T[], rec: T): T[] {
  return xs.some((x) => x.id === rec.id) ? xs.map((x) => (x.id === rec.id ? rec : x)) : [rec, ...xs];
}
