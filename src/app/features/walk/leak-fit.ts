import { fitLinearRaw } from '../../../../shared/flux';
import { readManualSeries } from '../closures/manual-series';

export type LeakFit = { ok: true; slopeUmolMolS: number; n: number; fromS: number; toS: number } | { ok: false; message: string };

/**
 * The CO2 slope of a closure on a sealed plate: the flux engine's least-squares line through the
 * samples at or after the settle time (the window rule of a closure fit), in µmol/mol/s. No
 * volume, area or dry-mole conversion: a sealed plate has no flux, only a drift that shows a leak.
 */
export function leakSlope(series: { tS: readonly (number | null)[]; co2Ppm: readonly (number | null)[] }, settleS: number): LeakFit {
  if (!Number.isFinite(settleS) || settleS < 0) return { ok: false, message: 'Give the settle time in seconds (0 or more).' };
  const tau: number[] = [];
  const co2: number[] = [];
  series.tS.forEach((t, i) => {
    const c = series.co2Ppm[i];
    if (typeof t === 'number' && Number.isFinite(t) && t >= settleS && typeof c === 'number' && Number.isFinite(c)) {
      tau.push(t - settleS);
      co2.push(c);
    }
  });
  if (tau.length < 3)
    return {
      ok: false,
      message: `${tau.length} sample${tau.length === 1 ? '' : 's'} after the ${settleS} s settle time: at least 3 are needed.`,
    };
  const fit = fitLinearRaw(tau, co2, tau.length);
  if (!fit) return { ok: false, message: 'The samples after the settle time share one time: no slope.' };
  return { ok: true, slopeUmolMolS: fit.slope, n: tau.length, fromS: settleS + tau[0], toS: settleS + tau[tau.length - 1] };
}

/**
 * A sealed-plate series typed by hand, read by closure capture's reader ("seconds CO2" a line).
 * The chamber air temperature it asks for does not enter a slope, so a placeholder stands in.
 */
export function leakFromTyped(text: string, settleS: number): LeakFit {
  const read = readManualSeries(text, 0, null);
  return read.ok ? leakSlope(read.series, settleS) : { ok: false, message: read.message };
}
