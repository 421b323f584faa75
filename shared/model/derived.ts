import { meanOffsetCm, roundCollarAreaCm2 } from '../flux/chamber-volume';
import { polynomialVwc, toppVwc } from '../flux/soil-moisture';
import type { z } from 'zod';
import type { collarFields, probeReadingFields } from './field-records';
import type { moistureCalibrationSchema } from './site-layout';

/** Soil area inside a collar, cm²: π d²/4 for round collars, a·b for rectangular ones (plain geometry). */
export function collarAreaCm2(c: Pick<z.infer<typeof collarFields>, 'shape' | 'diameterCm' | 'sideACm' | 'sideBCm'>): number | null {
  if (c.shape === 'round') return c.diameterCm === null ? null : roundCollarAreaCm2(c.diameterCm);
  return c.sideACm === null || c.sideBCm === null ? null : c.sideACm * c.sideBCm;
}

/** Mean and sample standard deviation (n − 1) of an offset set's readings, cm. */
export function offsetStats(readingsCm: readonly number[]): { meanCm: number; sdCm: number } {
  const n = readingsCm.length;
  const meanCm = meanOffsetCm({ takenOn: '', offsetsCm: readingsCm });
  const ss = readingsCm.reduce((a, b) => a + (b - meanCm) ** 2, 0);
  return { meanCm, sdCm: n > 1 ? Math.sqrt(ss / (n - 1)) : 0 };
}

export type MoistureCalibration = z.infer<typeof moistureCalibrationSchema>;

/**
 * Volumetric water content in % from a probe reading: VWC readings pass through; permittivity
 * goes through Topp et al. (1980) or the site's own polynomial (organic soils, peat).
 */
export function probeVwcPct(
  p: Pick<z.infer<typeof probeReadingFields>, 'moistureRaw' | 'moistureKind'>,
  calibration: MoistureCalibration,
): number | null {
  if (p.moistureRaw === null || p.moistureKind === null) return null;
  if (p.moistureKind === 'vwc') return p.moistureRaw;
  const theta = calibration.kind === 'topp' ? toppVwc(p.moistureRaw) : polynomialVwc(p.moistureRaw, calibration.coefficients);
  return Math.max(0, theta) * 100;
}
