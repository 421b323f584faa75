import { chamberVolumeFor, type ChamberProfileVersion } from '../../../../shared/flux/chamber-volume';
import { offsetStats } from '../../../../shared/model/derived';

export interface OffsetThresholds {
  /** Largest SD × area allowed, as % of the total headspace volume (site setting, default 3 %). */
  offsetSpreadPct: number;
  /** Largest change of the mean since the collar's last set, cm (site setting). */
  offsetMoveCm: number;
}

export interface OffsetCheck {
  meanCm: number;
  sdCm: number;
  /** SD × collar area, cm³: how much the headspace volume is uncertain because the rim is uneven. */
  spreadCm3: number | null;
  volumeCm3: number | null;
  spreadPct: number | null;
  spreadTooLarge: boolean;
  /** Mean change since the last set, cm (null without a last set). */
  movedCm: number | null;
  movedTooFar: boolean;
  warnings: string[];
}

export interface OffsetContext {
  day: string;
  collarAreaCm2: number | null;
  profiles: readonly Omit<ChamberProfileVersion, 'areaCm2'>[];
  lastMeanCm: number | null;
  thresholds: OffsetThresholds;
}

const fmt = (x: number, d = 1) => x.toFixed(d);

/**
 * Live statistics of an offset set and its two tolerance checks. The spread check compares
 * SD × collar area with a share of the total headspace volume V = chamber + loop + A × mean
 * offset (common practice: an uneven rim makes V uncertain by about SD × A; flag it above ~3 %).
 * V comes from the flux engine's chamberVolumeFor, the same function the server uses.
 */
export function checkOffsets(readingsCm: readonly number[], ctx: OffsetContext): OffsetCheck | null {
  const values = readingsCm.filter((v) => Number.isFinite(v));
  if (values.length < 2) return null;
  const { meanCm, sdCm } = offsetStats(values);
  let spreadCm3: number | null = null;
  let volumeCm3: number | null = null;
  if (ctx.collarAreaCm2 !== null) {
    spreadCm3 = sdCm * ctx.collarAreaCm2;
    const area = ctx.collarAreaCm2;
    const volume = chamberVolumeFor(
      ctx.day,
      ctx.profiles.map((p) => ({ ...p, areaCm2: area })),
      [{ takenOn: ctx.day, offsetsCm: values }],
    );
    if (volume.ok) volumeCm3 = volume.value.volumeCm3;
  }
  const spreadPct = spreadCm3 !== null && volumeCm3 ? (100 * spreadCm3) / volumeCm3 : null;
  const spreadTooLarge = spreadPct !== null && spreadPct > ctx.thresholds.offsetSpreadPct;
  const movedCm = ctx.lastMeanCm === null ? null : meanCm - ctx.lastMeanCm;
  const movedTooFar = movedCm !== null && Math.abs(movedCm) > ctx.thresholds.offsetMoveCm;
  const warnings: string[] = [];
  if (spreadTooLarge) {
    warnings.push(
      `Uneven rim: SD × area is ${fmt(spreadPct!)} % of the headspace volume (limit ${fmt(ctx.thresholds.offsetSpreadPct)} %). Check the readings or reseat the collar.`,
    );
  }
  if (movedTooFar) {
    warnings.push(
      `The mean moved ${movedCm! > 0 ? '+' : ''}${fmt(movedCm!, 2)} cm since the last set (limit ${fmt(ctx.thresholds.offsetMoveCm, 2)} cm). Was the collar disturbed?`,
    );
  }
  return { meanCm, sdCm, spreadCm3, volumeCm3, spreadPct, spreadTooLarge, movedCm, movedTooFar, warnings };
}

/**
 * Positions whose reading sits furthest from the others' mean: the ones to re-read first when the
 * spread is too large (largest absolute deviation, ties all shown).
 */
export function outlierPositions(readingsCm: readonly (number | null)[], check: OffsetCheck | null): number[] {
  if (!check?.spreadTooLarge) return [];
  const dev = readingsCm.map((v) => (v === null || !Number.isFinite(v) ? -1 : Math.abs(v - check.meanCm)));
  const max = Math.max(...dev);
  return dev.flatMap((d, i) => (d === max && d > 0 ? [i] : []));
}
