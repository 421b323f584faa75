import { atProbeDepth } from './probe-replicates';

/**
 * Plausible-range checks of probe readings (soil temperature, soil moisture). A reading outside
 * its range is kept as typed and flagged for review, never dropped. Ranges are common practice for
 * range tests in soil monitoring QC (gross-error limits), not a published standard:
 * - soil temperature at 2 cm or deeper: −30 … 50 °C (deeper soil stays far inside the air-temperature
 *   extremes; the surface centimetre of bare dark soil can pass 60 °C, so the top 2 cm are not judged);
 * - VWC: 0 … 60 % (a mineral soil saturates near its porosity, 35–55 %; peat can pass 80 %, which is
 *   why it is a flag and not a refusal);
 * - apparent permittivity Ka: 1 (air) … 81 (free water near 20 °C, from memory).
 */
export const PROBE_FLAGS = {
  'soil-temp-implausible': 'A soil temperature at 2 cm or deeper is outside −30 … 50 °C (common-practice range test).',
  'vwc-implausible': 'Volumetric water content outside 0 … 60 % (common-practice range test; peat soils may exceed it).',
  'permittivity-implausible': 'Apparent permittivity outside 1 (air) … 81 (free water).',
  'soil-temp-off-depth':
    "A soil temperature taken further from the site's probe depth than the site's depth tolerance: kept, but not in the visit's mean temperature.",
} as const;
export type ProbeFlag = keyof typeof PROBE_FLAGS;

export const PROBE_RANGES = {
  soilTempC: { min: -30, max: 50, fromDepthCm: 2 },
  vwcPct: { min: 0, max: 60 },
  permittivity: { min: 1, max: 81 },
} as const;

export interface ProbeValues {
  soilTemps: readonly { depthCm: number; tempC: number }[];
  moistureRaw: number | null;
  moistureKind: 'vwc' | 'permittivity' | null;
  /** VWC after the site's calibration, when known. */
  vwcPct?: number | null;
  /** The site's probe depth and depth tolerance, cm: temperatures further off than the tolerance are flagged. */
  probeDepth?: { depthCm: number; toleranceCm: number };
}

const outside = (v: number, r: { min: number; max: number }) => v < r.min || v > r.max;

/** The plausibility flags of one probe reading, in the documented order. */
export function probeFlags(p: ProbeValues): ProbeFlag[] {
  const out: ProbeFlag[] = [];
  const t = PROBE_RANGES.soilTempC;
  if (p.soilTemps.some((s) => s.depthCm >= t.fromDepthCm && outside(s.tempC, t))) out.push('soil-temp-implausible');
  const vwc = p.moistureKind === 'vwc' ? p.moistureRaw : (p.vwcPct ?? null);
  if (vwc !== null && outside(vwc, PROBE_RANGES.vwcPct)) out.push('vwc-implausible');
  if (p.moistureKind === 'permittivity' && p.moistureRaw !== null && outside(p.moistureRaw, PROBE_RANGES.permittivity))
    out.push('permittivity-implausible');
  const d = p.probeDepth;
  if (d && p.soilTemps.some((s) => !atProbeDepth(s.depthCm, d.depthCm, d.toleranceCm))) out.push('soil-temp-off-depth');
  return out;
}
