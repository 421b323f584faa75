import type { EntityManager } from 'typeorm';
import {
  ambientForClosure,
  withCollarArea,
  type AmbientCheck,
  type AmbientChoice,
  type FitContext,
  type OffsetSetRecord,
  type SlopeBasis,
  type StoredProfileVersion,
} from '../../shared/flux';
import { siteFields } from '../../shared/model/site-layout';
import type { StoredRecord } from '../../shared/model/stored-record';
import { localDay } from '../../shared/time/site-time';

type Db = Pick<EntityManager, 'query'>;

/** A site's fit settings when its row is missing: the schema's defaults (a closure always names a live site; this only keeps the fit defined). */
const SITE_DEFAULTS = siteFields
  .pick({ ambientMarginPpm: true, slopeBasis: true, defaultAirTempC: true, defaultProfileId: true })
  .parse({});

/** What the inputs of a closure's fit are looked up by. */
export type ClosureRefs = Pick<StoredRecord<'closure'>, 'siteId' | 'collarId' | 'analyzerId' | 'visitId' | 'startedAt'>;

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

interface SiteRow {
  timezone: string;
  elevation_m: number | null;
  ambient_margin_ppm: number;
  slope_basis: SlopeBasis;
  default_profile_id: string | null;
  default_air_temp_c: number;
}
/** A chamber-profile version as its row reads (`valid_from` as YYYY-MM-DD text). */
export interface ProfileRow {
  id: string;
  name: string;
  valid_from: string;
  chamber_volume_cm3: number;
  loop_volume_cm3: number;
  footprint_area_cm2: number | null;
}

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
  async preload(closures: readonly ClosureRefs[]): Promise<void> {
    const missing = (ids: (string | null)[], known: Map<string, unknown>) => [
      ...new Set(ids.filter((x): x is string => x !== null && !known.has(x))),
    ];
    for (const siteId of missing(
      closures.map((c) => c.siteId),
      this.sites,
    ))
      await this.loadSite(siteId);
    const collarIds = missing(
      closures.map((c) => c.collarId),
      this.collars,
    );
    if (collarIds.length) await this.loadCollars(collarIds);
    const analyzerIds = missing(
      closures.map((c) => c.analyzerId),
      this.analyzers,
    );
    if (analyzerIds.length) await this.loadAnalyzers(analyzerIds);
    const visitIds = missing(
      closures.map((c) => c.visitId),
      this.visits,
    );
    if (visitIds.length) await this.loadVisits(visitIds);
  }

  async contextFor(c: ClosureRefs): Promise<ClosureContext> {
    await this.preload([c]);
    const site = this.sites.get(c.siteId);
    const collar = this.collars.get(c.collarId);
    const analyzer = c.analyzerId === null ? undefined : this.analyzers.get(c.analyzerId);
    const timezone = site?.timezone ?? 'UTC';
    const areaCm2 = collar?.areaCm2 ?? null;
    const ambient = ambientForClosure(site?.ambientChecks ?? [], c.analyzerId, c.startedAt);
    return {
      timezone,
      elevationM: site?.elevationM ?? null,
      ambientMarginPpm: site?.ambientMarginPpm ?? SITE_DEFAULTS.ambientMarginPpm,
      slopeBasis: site?.slopeBasis ?? SITE_DEFAULTS.slopeBasis,
      areaCm2,
      defaultProfileId: site?.defaultProfileId ?? SITE_DEFAULTS.defaultProfileId,
      profiles: withCollarArea(site?.profiles ?? [], areaCm2),
      offsetSets: collar?.offsetSets ?? [],
      precisionPpm: analyzer?.precisionPpm ?? null,
      rangeMinPpm: analyzer?.rangeMinPpm ?? null,
      rangeMaxPpm: analyzer?.rangeMaxPpm ?? null,
      ambient,
      ambientPpm: ambient?.ppm ?? null,
      visitAirTempC: this.visits.get(c.visitId) ?? null,
      defaultAirTempC: site?.defaultAirTempC ?? SITE_DEFAULTS.defaultAirTempC,
    };
  }

  private async loadSite(siteId: string): Promise<void> {
    const [s]: (SiteRow | undefined)[] = await this.db.query(
      `SELECT timezone, elevation_m, ambient_margin_ppm, slope_basis, default_profile_id, default_air_temp_c FROM site WHERE id = $1`,
      [siteId],
    );
    const profiles: ProfileRow[] = await this.db.query(
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
      ambientMarginPpm: s?.ambient_margin_ppm ?? SITE_DEFAULTS.ambientMarginPpm,
      slopeBasis: s?.slope_basis ?? SITE_DEFAULTS.slopeBasis,
      defaultProfileId: s?.default_profile_id ?? SITE_DEFAULTS.defaultProfileId,
      defaultAirTempC: s?.default_air_temp_c ?? SITE_DEFAULTS.defaultAirTempC,
      profiles: profiles.map((p) => ({
        id: p.id,
        name: p.name,
        validFrom: p.valid_from,
        chamberVolumeCm3: p.chamber_volume_cm3,
        loopVolumeCm3: p.loop_volume_cm3,
        footprintAreaCm2: p.footprint_area_cm2,
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
    const rows: { id: string; precision_ppm: number | null; range_min_ppm: number | null; range_max_ppm: number | null }[] =
      await this.db.query(`SELECT id, precision_ppm, range_min_ppm, range_max_ppm FROM analyzer WHERE id = ANY($1)`, [ids]);
    for (const id of ids) {
      const a = rows.find((r) => r.id === id);
      this.analyzers.set(id, {
        precisionPpm: a?.precision_ppm ?? null,
        rangeMinPpm: a?.range_min_ppm ?? null,
        rangeMaxPpm: a?.range_max_ppm ?? null,
      });
    }
  }
}

/** The inputs of one closure (the write path); see ClosureInputs. */
export async function loadClosureContext(em: Db, c: ClosureRefs): Promise<ClosureContext> {
  return new ClosureInputs(em).contextFor(c);
}
