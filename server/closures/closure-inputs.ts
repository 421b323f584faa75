import type { EntityManager } from 'typeorm';
import {
  ambientForClosure,
  withCollarArea,
  type AmbientCheck,
  type AmbientChoice,
  type FitContext,
  type OffsetSetRecord,
  type StoredProfileVersion,
} from '../../shared/flux';
import { localDay } from '../../shared/time/site-time';

type Db = Pick<EntityManager, 'query'>;

/** The fit context (shared/flux closure-fit-plan.ts) and what the server stores or checks beside it. */
export interface ClosureContext extends FitContext {
  areaCm2: number | null;
  offsetSets: (OffsetSetRecord & { id: string; takenAt: string })[];
  rangeMinPpm: number | null;
  rangeMaxPpm: number | null;
  /** The ambient reading of the closure's own analyzer nearest in time (null: none). */
  ambient: AmbientChoice | null;
}

/** The site's part of the fit context, read once per site. */
type SiteInputs = Pick<
  FitContext,
  'timezone' | 'elevationM' | 'ambientMarginPpm' | 'slopeBasis' | 'defaultProfileId' | 'defaultAirTempC'
> & {
  profiles: StoredProfileVersion[];
  /** Every usable ambient reading of the site, of any analyzer (ambientForClosure picks the closure's). */
  ambientChecks: AmbientCheck[];
};

interface AnalyzerInputs {
  precisionPpm: number | null;
  rangeMinPpm: number | null;
  rangeMaxPpm: number | null;
}

/**
 * Everything a closure's flux depends on beyond its own series — site defaults, collar area, the
 * site's profile versions, the collar's live offset sets (a superseded set no longer counts), the
 * analyzer and the day's ambient reading — read once per site, collar and analyzer and reused
 * for every closure that shares them. One closure's write and a recompute of thousands use this
 * same code, so both derive the same flux.
 */
export class ClosureInputs {
  private readonly sites = new Map<string, SiteInputs>();
  private readonly collars = new Map<string, { areaCm2: number | null; offsetSets: ClosureContext['offsetSets'] }>();
  private readonly analyzers = new Map<string, AnalyzerInputs>();
  private readonly visits = new Map<string, number | null>();

  constructor(private readonly db: Db) {}

  /** Reads the inputs of many closures in a few set-wise queries (recompute pages). */
  async preload(closures: readonly Record<string, unknown>[]): Promise<void> {
    const missing = (ids: unknown[], known: Map<string, unknown>) => [
      ...new Set(ids.filter((x): x is string => typeof x === 'string' && !known.has(x))),
    ];
    for (const siteId of missing(
      closures.map((c) => c['siteId']),
      this.sites,
    ))
      await this.loadSite(siteId);
    const collarIds = missing(
      closures.map((c) => c['collarId']),
      this.collars,
    );
    if (collarIds.length) await this.loadCollars(collarIds);
    const analyzerIds = missing(
      closures.map((c) => c['analyzerId']),
      this.analyzers,
    );
    if (analyzerIds.length) await this.loadAnalyzers(analyzerIds);
    const visitIds = missing(
      closures.map((c) => c['visitId']),
      this.visits,
    );
    if (visitIds.length) await this.loadVisits(visitIds);
  }

  async contextFor(c: Record<string, unknown>): Promise<ClosureContext> {
    await this.preload([c]);
    const site = this.sites.get(String(c['siteId']));
    const collar = this.collars.get(String(c['collarId']));
    const analyzer = typeof c['analyzerId'] === 'string' ? this.analyzers.get(c['analyzerId']) : undefined;
    const timezone = site?.timezone ?? 'UTC';
    const areaCm2 = collar?.areaCm2 ?? null;
    const ambient = ambientForClosure(site?.ambientChecks ?? [], (c['analyzerId'] as string | null) ?? null, String(c['startedAt']));
    return {
      timezone,
      elevationM: site?.elevationM ?? null,
      ambientMarginPpm: site?.ambientMarginPpm ?? 100,
      slopeBasis: site?.slopeBasis ?? 'closure',
      areaCm2,
      defaultProfileId: site?.defaultProfileId ?? null,
      profiles: withCollarArea(site?.profiles ?? [], areaCm2),
      offsetSets: collar?.offsetSets ?? [],
      precisionPpm: analyzer?.precisionPpm ?? null,
      rangeMinPpm: analyzer?.rangeMinPpm ?? null,
      rangeMaxPpm: analyzer?.rangeMaxPpm ?? null,
      ambient,
      ambientPpm: ambient?.ppm ?? null,
      visitAirTempC: this.visits.get(String(c['visitId'])) ?? null,
      defaultAirTempC: site?.defaultAirTempC ?? 15,
    };
  }

  private async loadSite(siteId: string): Promise<void> {
    const [s] = await this.db.query(
      `SELECT timezone, elevation_m, ambient_margin_ppm, slope_basis, default_profile_id, default_air_temp_c FROM site WHERE id = $1`,
      [siteId],
    );
    const profiles = await this.db.query(
      `SELECT id, name, to_char(valid_from, 'YYYY-MM-DD') AS valid_from, chamber_volume_cm3, loop_volume_cm3, footprint_area_cm2
         FROM chamber_profile WHERE site_id = $1 AND NOT deleted`,
      [siteId],
    );
    const timezone: string = s?.timezone ?? 'UTC';
    const ambient: { id: string; analyzer_id: string | null; at: Date; co2_ppm: number }[] = await this.db.query(
      `SELECT id, analyzer_id, at, co2_ppm
         FROM analyzer_check WHERE site_id = $1 AND kind = 'ambient' AND NOT skipped AND NOT deleted AND co2_ppm IS NOT NULL`,
      [siteId],
    );
    this.sites.set(siteId, {
      timezone,
      elevationM: s?.elevation_m ?? null,
      ambientMarginPpm: s?.ambient_margin_ppm ?? 100,
      slopeBasis: s?.slope_basis === 'settle_end' ? 'settle_end' : 'closure',
      defaultProfileId: s?.default_profile_id ?? null,
      defaultAirTempC: s?.default_air_temp_c ?? 15,
      profiles: profiles.map((p: Record<string, unknown>) => ({
        id: p['id'] as string,
        name: p['name'] as string,
        validFrom: p['valid_from'] as string,
        chamberVolumeCm3: p['chamber_volume_cm3'] as number,
        loopVolumeCm3: p['loop_volume_cm3'] as number,
        footprintAreaCm2: (p['footprint_area_cm2'] as number | null) ?? null,
      })),
      ambientChecks: ambient.map((a) => ({ id: a.id, analyzerId: a.analyzer_id, at: a.at.toISOString(), co2Ppm: a.co2_ppm })),
    });
  }

  private async loadCollars(ids: string[]): Promise<void> {
    const collars: { id: string; area_cm2: number | null; timezone: string }[] = await this.db.query(
      `SELECT k.id, k.area_cm2, s.timezone FROM collar k JOIN site s ON s.id = k.site_id WHERE k.id = ANY($1)`,
      [ids],
    );
    const sets: { id: string; collar_id: string; taken_at: Date; readings_cm: number[] }[] = await this.db.query(
      `SELECT o.id, o.collar_id, o.taken_at, o.readings_cm FROM offset_set o
        WHERE o.collar_id = ANY($1) AND NOT o.deleted
          AND NOT EXISTS (SELECT 1 FROM offset_set n WHERE n.supersedes_id = o.id AND NOT n.deleted)`,
      [ids],
    );
    for (const id of ids) {
      const k = collars.find((x) => x.id === id);
      const tz = k?.timezone ?? 'UTC';
      this.collars.set(id, {
        areaCm2: k?.area_cm2 ?? null,
        offsetSets: sets
          .filter((o) => o.collar_id === id)
          .map((o) => ({
            id: o.id,
            takenAt: o.taken_at.toISOString(),
            takenOn: localDay(o.taken_at, tz),
            offsetsCm: o.readings_cm,
          })),
      });
    }
  }

  private async loadVisits(ids: string[]): Promise<void> {
    const rows: { id: string; air: number | null }[] = await this.db.query(
      `SELECT id, (conditions->>'airTempC')::double precision AS air FROM visit WHERE id = ANY($1)`,
      [ids],
    );
    for (const id of ids) this.visits.set(id, rows.find((r) => r.id === id)?.air ?? null);
  }

  private async loadAnalyzers(ids: string[]): Promise<void> {
    const rows = await this.db.query(`SELECT id, precision_ppm, range_min_ppm, range_max_ppm FROM analyzer WHERE id = ANY($1)`, [ids]);
    for (const id of ids) {
      const a = rows.find((r: { id: string }) => r.id === id);
      this.analyzers.set(id, {
        precisionPpm: a?.precision_ppm ?? null,
        rangeMinPpm: a?.range_min_ppm ?? null,
        rangeMaxPpm: a?.range_max_ppm ?? null,
      });
    }
  }
}

/** The inputs of one closure (the write path); see ClosureInputs. */
export async function loadClosureContext(em: Db, c: Record<string, unknown>): Promise<ClosureContext> {
  return new ClosureInputs(em).contextFor(c);
}
