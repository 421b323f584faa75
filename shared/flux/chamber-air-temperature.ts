/**
 * The chamber air temperature T of the ideal-gas flux (DESIGN.md), in order of preference:
 * the analyzer file's own column; the air temperature the crew noted at the visit; the site's
 * default. Many analyzer files carry no chamber temperature: without this order such closures
 * had no flux at all. T enters the flux as 1/T (K), so 10 °C off moves the flux by about 3.5 %.
 * Each source other than the file is flagged (temp-from-visit, temp-site-default) and reported.
 */
export type AirTempSource = 'series' | 'visit' | 'site-default';
export const AIR_TEMP_SOURCES: readonly AirTempSource[] = ['series', 'visit', 'site-default'];

/**
 * The site default when the site states none: 15 °C, the sea-level temperature of the US Standard
 * Atmosphere 1976 (288.15 K), the same atmosphere the default pressure comes from.
 */
export const DEFAULT_SITE_AIR_TEMP_C = 15;

export type AirTempChoice = { ok: true; tempC: number | readonly (number | null)[]; source: AirTempSource } | { ok: false; error: string };

const usable = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);

export function chamberAirTemperature(
  seriesTempC: readonly (number | null)[] | null | undefined,
  visitAirTempC: number | null | undefined,
  siteDefaultAirTempC: number | null | undefined,
): AirTempChoice {
  if (seriesTempC && seriesTempC.some(usable)) return { ok: true, tempC: seriesTempC, source: 'series' };
  if (usable(visitAirTempC)) return { ok: true, tempC: visitAirTempC, source: 'visit' };
  if (usable(siteDefaultAirTempC)) return { ok: true, tempC: siteDefaultAirTempC, source: 'site-default' };
  return { ok: false, error: 'no chamber air temperature in the series, at the visit or as the site default' };
}
