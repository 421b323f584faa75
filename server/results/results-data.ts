import type { DataSource, EntityManager } from 'typeorm';
import { notFound } from '../core/errors';
import type { CampaignIn, ClosureIn, CollarIn, DesignInput, PlotIn, VisitIn } from './design-aggregation';

type Db = Pick<DataSource, 'query'> | Pick<EntityManager, 'query'>;

/** Rows as the SELECTs below name them (snake case, as PostgreSQL returns them). */
interface TreatmentCols { t_id: string | null; t_code: string | null; t_name: string | null }
type PlotRow = TreatmentCols & { id: string; code: string; block_id: string | null; block_code: string | null };
type CollarRow = TreatmentCols & { id: string; code: string; plot_id: string };
interface CampaignRow { id: string; name: string; starts_on: string; ends_on: string }
interface VisitRow { id: string; collar_id: string; campaign_id: string; round: number; arrived_at: Date; soil_temp_c: string | number | null; vwc_pct: string | number | null }
interface ClosureRow { id: string; visit_id: string; flux_umol_m2_s: number }
interface TemperatureLogRow { id: string; plot_id: string; depth_cm: number; source: string; series: { t: string[]; tempC: number[] } }

/** Which closures enter the results: the lab's accepted ones, or those not rejected while review goes on. */
export type ClosureSelection = 'accepted' | 'not-rejected';

export interface SiteInfo {
  id: string; name: string; timezone: string; tempDepthCm: number;
  latitude: number | null; longitude: number | null; elevationM: number | null;
}

export interface SiteDesign extends DesignInput { site: SiteInfo; selection: ClosureSelection }

export async function loadSite(db: Db, siteId: string): Promise<SiteInfo> {
  const [s] = await db.query(`SELECT id, name, timezone, temp_depth_cm, latitude, longitude, elevation_m FROM site WHERE id = $1 AND NOT deleted`, [siteId]);
  if (!s) throw notFound(`No site ${siteId}`);
  return { id: s.id, name: s.name, timezone: s.timezone, tempDepthCm: s.temp_depth_cm, latitude: s.latitude, longitude: s.longitude, elevationM: s.elevation_m };
}

const ref = (id: string | null, code: string | null, name: string | null) => (id ? { id, code: code ?? '', name: name ?? '' } : null);

/**
 * Everything the design aggregation needs for one site, in five queries. Soil temperature is the
 * probe's reading at the site's chosen depth (DESIGN: the depth used for responses); moisture is
 * the converted VWC. Skipped and deleted visits, deleted closures and closures without a flux are left out.
 */
export async function loadSiteDesign(db: Db, siteId: string, selection: ClosureSelection): Promise<SiteDesign> {
  const site = await loadSite(db, siteId);
  const plots: PlotIn[] = (await db.query(
    `SELECT p.id, p.code, p.block_id, b.code AS block_code, t.id AS t_id, t.code AS t_code, t.name AS t_name
       FROM plot p LEFT JOIN block b ON b.id = p.block_id LEFT JOIN treatment t ON t.id = p.treatment_id
      WHERE p.site_id = $1 AND NOT p.deleted ORDER BY p.code`, [siteId]))
    .map((r: PlotRow) => ({ plotId: r.id, plotCode: r.code, blockId: r.block_id, blockCode: r.block_code, plotTreatment: ref(r.t_id, r.t_code, r.t_name) }));
  const collars: CollarIn[] = (await db.query(
    `SELECT c.id, c.code, c.plot_id, t.id AS t_id, t.code AS t_code, t.name AS t_name
       FROM collar c LEFT JOIN treatment t ON t.id = c.treatment_id
      WHERE c.site_id = $1 AND NOT c.deleted ORDER BY c.code`, [siteId]))
    .map((r: CollarRow) => ({ collarId: r.id, collarCode: r.code, plotId: r.plot_id, collarTreatment: ref(r.t_id, r.t_code, r.t_name) }));
  const campaigns: CampaignIn[] = (await db.query(
    `SELECT id, name, starts_on::text AS starts_on, ends_on::text AS ends_on FROM campaign
      WHERE site_id = $1 AND NOT deleted ORDER BY starts_on, name`, [siteId]))
    .map((r: CampaignRow) => ({ campaignId: r.id, name: r.name, startsOn: r.starts_on, endsOn: r.ends_on }));
  const visits: VisitIn[] = (await db.query(
    `SELECT v.id, v.collar_id, v.campaign_id, v.round, v.arrived_at,
       (SELECT avg((e->>'tempC')::float8) FROM probe_reading p CROSS JOIN jsonb_array_elements(p.soil_temps) e
         WHERE p.visit_id = v.id AND NOT p.deleted AND abs((e->>'depthCm')::float8 - $2) < 1e-6) AS soil_temp_c,
       (SELECT avg(p.vwc_pct) FROM probe_reading p WHERE p.visit_id = v.id AND NOT p.deleted) AS vwc_pct
       FROM visit v WHERE v.site_id = $1 AND NOT v.deleted AND NOT v.skipped ORDER BY v.arrived_at, v.id`, [siteId, site.tempDepthCm]))
    .map((r: VisitRow) => ({ visitId: r.id, collarId: r.collar_id, campaignId: r.campaign_id, round: r.round, arrivedAt: r.arrived_at.toISOString(),
      soilTempC: r.soil_temp_c === null ? null : Number(r.soil_temp_c), vwcPct: r.vwc_pct === null ? null : Number(r.vwc_pct) }));
  const states = selection === 'accepted' ? ['accepted'] : ['accepted', 'unreviewed'];
  const closures: ClosureIn[] = (await db.query(
    `SELECT id, visit_id, flux_umol_m2_s FROM closure
      WHERE site_id = $1 AND NOT deleted AND flux_umol_m2_s IS NOT NULL AND review_state = ANY($2) ORDER BY started_at, id`, [siteId, states]))
    .map((r: ClosureRow) => ({ closureId: r.id, visitId: r.visit_id, fluxUmolM2S: r.flux_umol_m2_s }));
  return { site, selection, plots, collars, campaigns, visits, closures };
}

export interface TemperatureLogSeries { id: string; plotId: string; depthCm: number; source: string; t: string[]; tempC: number[] }

export async function loadTemperatureLogs(db: Db, siteId: string): Promise<TemperatureLogSeries[]> {
  const rows = await db.query(`SELECT id, plot_id, depth_cm, source, series FROM temperature_log WHERE site_id = $1 AND NOT deleted ORDER BY plot_id, depth_cm`, [siteId]);
  return rows.map((r: TemperatureLogRow) => ({ id: r.id, plotId: r.plot_id, depthCm: r.depth_cm, source: r.source, t: r.series.t, tempC: r.series.tempC }));
}
