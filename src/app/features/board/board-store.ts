import { Injectable, computed, inject, signal } from '@angular/core';
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
  readonly campaigns = signal<Campaign[]>([]);
  readonly campaignId = signal<string | null>(null);
  readonly round = signal<number | null>(null);
  readonly progress = signal<Progress | null>(null);
  readonly routes = signal<StoredRecord<'route'>[]>([]);
  readonly plots = signal<StoredRecord<'plot'>[]>([]);
  readonly treatments = signal<StoredRecord<'treatment'>[]>([]);
  readonly members = signal<Member[]>([]);
  /** The site's collars (positions, codes), loaded only by the screens that need them (Plan, Map). */
  readonly collars = signal<StoredRecord<'collar'>[]>([]);
  private collarsFor: string | null = null;
  readonly loading = signal(false);
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

  /** Campaigns and the site's layout; picks the latest open campaign unless one is chosen. */
  async loadSite(): Promise<void> {
    const site = this.site();
    if (!site) return;
    this.problem.set('');
    this.offlineSince.set(null);
    try {
      const q = { siteId: site.id };
      const [campaigns, routes, plots, treatments] = await Promise.all([
        this.guard(`campaigns.${site.id}`, () => this.api.list('campaign', q)),
        this.guard(`routes.${site.id}`, () => this.api.list('route', q)),
        this.guard(`plots.${site.id}`, () => this.api.list('plot', q)),
        this.guard(`treatments.${site.id}`, () => this.api.list('treatment', q)),
      ]);
      this.campaigns.set(campaigns);
      this.routes.set(routes);
      this.plots.set(plots);
      this.treatments.set(treatments);
      this.members.set(await this.guard(`members.${site.id}`, () => this.api.members(site.id)).catch(() => []));
      if (!campaigns.some((c) => c.id === this.campaignId())) {
        this.campaignId.set((campaigns.find((c) => !c.locked) ?? campaigns[0])?.id ?? null);
      }
      await this.loadProgress();
      // Refresh re-reads the collars too: new ones belong on the map and in the rows.
      this.collarsFor = null;
      void this.ensureCollars();
    } catch (err) {
      this.problem.set(serverMessage(err, 'The Board could not be loaded'));
    }
  }

  async loadProgress(): Promise<void> {
    const id = this.campaignId();
    if (!id) {
      this.progress.set(null);
      return;
    }
    this.loading.set(true);
    try {
      const round = this.round();
      const p = await this.guard(`progress.${id}.${round ?? 'all'}`, () => this.api.progress(id, round));
      performance.mark('board-progress-data');
      this.progress.set(p);
    } catch (err) {
      this.problem.set(serverMessage(err, 'Progress could not be loaded'));
    } finally {
      this.loading.set(false);
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
    void this.loadProgress();
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

function upsert<T extends { id: string }>(xs: T[], rec: T): T[] {
  return xs.some((x) => x.id === rec.id) ? xs.map((x) => (x.id === rec.id ? rec : x)) : [rec, ...xs];
}
