import type { DataSource, EntityManager } from 'typeorm';
import { notFound } from '../core/errors';
import { probeSummary, type ProbeSummary, type ReplicateValues } from '../../shared/model/probe-replicates';
import type { CampaignIn, ClosureIn, CollarIn, DesignInput, PlotIn, VisitIn } from './design-aggregation';

type Db = Pick<DataSource, 'query'> | Pick<EntityManager, 'query'>;

/** Rows as the SELECTs below name them (snake case, as PostgreSQL returns them). */
interface TreatmentCols {
  t_id: string | null;
  t_code: string | null;
  t_name: string | null;
}
type PlotRow = TreatmentCols & { id: string; code: string; block_id: string | null; block_code: string | null };
type CollarRow = TreatmentCols & { id: string; code: string; plot_id: string };
interface CampaignRow {
  id: string;
  name: string;
  starts_on: string;
  ends_on: string;
}
interface VisitRow {
  id: string;
  collar_id: string;
  campaign_id: string;
  round: number;
  arrived_at: Date;
}
interface ProbeRow {
  id: string;
  visit_id: string;
  soil_temps: { depthCm: number; tempC: number }[];
  vwc_pct: number | null;
}
interface ClosureRow {
  id: string;
  visit_id: string;
  flux_umol_m2_s: number;
}
interface TemperatureLogRow {
  id: string;
  plot_id: string;
  depth_cm: number;
  source: string;
  series: { t: string[]; tempC: number[] };
}

/** Which closures enter the results: the lab's accepted ones, or those not rejected while review goes on. */
export type ClosureSelection = 'accepted' | 'not-rejected';

export interface SiteInfo {
  id: string;
  name: string;
  timezone: string;
  tempDepthCm: number;
  /** ± cm around tempDepthCm within which a probe temperature counts (read when results are built). */
  tempDepthToleranceCm: number;
  latitude: number | null;
  longitude: number | null;
  elevationM: number | null;
}

export interface SiteDesign extends DesignInput {
  site: SiteInfo;
  selection: ClosureSelection;
}

export async function loadSite(db: Db, siteId: string): Promise<SiteInfo> {
  const [s] = await db.query(
    `SELECT id, name, timezone, temp_depth_cm, temp_depth_tolerance_cm, latitude, longitude, elevation_m FROM site WHERE id = $1 AND NOT deleted`,
    [siteId],
  );
  if (!s) throw notFound(`No site ${siteId}`);
  return {
    id: s.id,
    name: s.name,
    timezone: s.timezone,
    tempDepthCm: s.temp_depth_cm,
    tempDepthToleranceCm: s.temp_depth_tolerance_cm,
    latitude: s.latitude,
    longitude: s.longitude,
    elevationM: s.elevation_m,
  };
}

const ref = (id: string | null, code: string | null, name: string | null) => (id ? { id, code: code ?? '', name: name ?? '' } : null);

/**
 * Each visit's probe value: the mean of its replicates (moisture as converted VWC; soil temperature
 * at the site's probe depth ± the site's tolerance, temperatures further off left out and counted).
 */
async function visitProbes(db: Db, siteId: string, depthCm: number, toleranceCm: number): Promise<Map<string, ProbeSummary>> {
  const rows: ProbeRow[] = await db.query(
    `SELECT id, visit_id, soil_temps, vwc_pct FROM probe_reading WHERE site_id = $1 AND NOT deleted ORDER BY taken_at, id`,
    [siteId],
  );
  const byVisit = new Map<string, ReplicateValues[]>();
  for (const r of rows) {
    const list = byVisit.get(r.visit_id) ?? [];
    list.push({ id: r.id, soilTemps: r.soil_temps, vwcPct: r.vwc_pct });
    byVisit.set(r.visit_id, list);
  }
  return new Map([...byVisit].map(([visitId, reps]) => [visitId, probeSummary(reps, depthCm, toleranceCm)]));
}

/**
 * Everything the design aggregation needs for one site, in six queries. Soil temperature and
 * moisture of a visit are the means of its probe replicates (visitProbes; the temperature at the
 * site's chosen depth, DESIGN: the depth used for responses). Skipped and deleted visits, deleted closures and closures without a flux are left out.
 */
export async function loadSiteDesign(db: Db, siteId: string, selection: ClosureSelection): Promise<SiteDesign> {
  const site = await loadSite(db, siteId);
  const plots: PlotIn[] = (
    await db.query(
      `SELECT p.id, p.code, p.block_id, b.code AS block_code, t.id AS t_id, t.code AS t_code, t.name AS t_name
       FROM plot p LEFT JOIN block b ON b.id = p.block_id LEFT JOIN treatment t ON t.id = p.treatment_id
      WHERE p.site_id = $1 AND NOT p.deleted ORDER BY p.code`,
      [siteId],
    )
  ).map((r: PlotRow) => ({
    plotId: r.id,
    plotCode: r.code,
    blockId: r.block_id,
    blockCode: r.block_code,
    plotTreatment: ref(r.t_id, r.t_code, r.t_name),
  }));
  const collars: CollarIn[] = (
    await db.query(
      `SELECT c.id, c.code, c.plot_id, t.id AS t_id, t.code AS t_code, t.name AS t_name
       FROM collar c LEFT JOIN treatment t ON t.id = c.treatment_id
      WHERE c.site_id = $1 AND NOT c.deleted ORDER BY c.code`,
      [siteId],
    )
  ).map((r: CollarRow) => ({ collarId: r.id, collarCode: r.code, plotId: r.plot_id, collarTreatment: ref(r.t_id, r.t_code, r.t_name) }));
  const campaigns: CampaignIn[] = (
    await db.query(
      `SELECT id, name, starts_on::text AS starts_on, ends_on::text AS ends_on FROM campaign
      WHERE site_id = $1 AND NOT deleted ORDER BY starts_on, name`,
      [siteId],
    )
  ).map((r: CampaignRow) => ({ campaignId: r.id, name: r.name, startsOn: r.starts_on, endsOn: r.ends_on }));
  const probes = await visitProbes(db, siteId, site.tempDepthCm, site.tempDepthToleranceCm);
  const visits: VisitIn[] = (
    await db.query(
      `SELECT v.id, v.collar_id, v.campaign_id, v.round, v.arrived_at
       FROM visit v WHERE v.site_id = $1 AND NOT v.deleted AND NOT v.skipped ORDER BY v.arrived_at, v.id`,
      [siteId],
    )
  ).map((r: VisitRow) => {
    const p = probes.get(r.id);
    return {
      visitId: r.id,
      collarId: r.collar_id,
      campaignId: r.campaign_id,
      round: r.round,
      arrivedAt: r.arrived_at.toISOString(),
      soilTempC: p?.soilTemp.mean ?? null,
      vwcPct: p?.vwc.mean ?? null,
      probe: {
        soilTempSdC: p?.soilTemp.sd ?? null,
        soilTempN: p?.soilTemp.n ?? 0,
        vwcSdPct: p?.vwc.sd ?? null,
        vwcN: p?.vwc.n ?? 0,
        offDepthN: p?.offDepth.length ?? 0,
      },
    };
  });
  const states = selection === 'accepted' ? ['accepted'] : ['accepted', 'unreviewed'];
  const closures: ClosureIn[] = (
    await db.query(
      `SELECT id, visit_id, flux_umol_m2_s FROM closure
      WHERE site_id = $1 AND NOT deleted AND flux_umol_m2_s IS NOT NULL AND review_state = ANY($2) ORDER BY started_at, id`,
      [siteId, states],
    )
  ).map((r: ClosureRow) => ({ closureId: r.id, visitId: r.visit_id, fluxUmolM2S: r.flux_umol_m2_s }));
  return { site, selection, plots, collars, campaigns, visits, closures };
}

export interface TemperatureLogSeries {
  id: string;
  plotId: string;
  depthCm: number;
  source: string;
  t: string[];
  tempC: number[];
}

export async function loadTemperatureLogs(db: Db, siteId: string): Promise<TemperatureLogSeries[]> {
  const rows = await db.query(
    `SELECT id, plot_id, depth_cm, source, series FROM temperature_log WHERE site_id = $1 AND NOT deleted ORDER BY plot_id, depth_cm`,
    [siteId],
  );
  return rows.map((r: TemperatureLogRow) => ({
    id: r.id,
    plotId: r.plot_id,
    depthCm: r.depth_cm,
    source: r.source,
    t: r.series.t,
    tempC: r.series.tempC,
  }));
}
