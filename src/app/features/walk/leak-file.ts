import { guessLayout, pieceSeries, splitClosures, suggestMapping, type LoggerMapping } from '../../../../shared/logger';
import { formatSiteTime } from '../../../../shared/time/site-time';
import { readLoggerFile } from '../closures/logger-reader';

export interface LeakPiece {
  label: string;
  series: { tS: number[]; co2Ppm: number[] };
}

/**
 * The pieces of a logger file the sealed-plate closure may be in, read the way closure capture
 * reads files: the analyzer's mapping remembered on this device when it fits the file's layout,
 * else one guessed from the header names, else elapsed time and CO2 in the first two columns;
 * then cut by the closure id column or by gaps.
 */
export async function leakPieces(text: string, timeZone: string, preset: LoggerMapping | null): Promise<LeakPiece[]> {
  const layout = guessLayout(text);
  const fits = preset && preset.headerRow === layout.headerRow && preset.delimiter === layout.delimiter;
  const mapping: LoggerMapping = fits
    ? preset
    : (suggestMapping(layout.headers, layout, timeZone) ?? {
        delimiter: layout.delimiter,
        decimalComma: layout.decimalComma,
        headerRow: layout.headerRow,
        time: { kind: 'elapsed', column: 0, unit: 's' },
        co2: { column: Math.min(1, layout.headers.length - 1), unit: 'µmol/mol (ppm)' },
        h2o: null,
        pressure: null,
        temp: null,
        closureId: null,
      });
  const read = await readLoggerFile(text, mapping, () => undefined);
  return splitClosures(read.samples).pieces.map((p, i) => {
    const s = pieceSeries(p);
    // The site's wall clock, as the crew's logger and watch read it (not the phone's zone).
    const when = p.startMs !== null ? `, ${formatSiteTime(p.startMs, timeZone, { timeOnly: true, seconds: true })}` : '';
    return {
      label: `Piece ${i + 1}: lines ${p.firstLine}–${p.lastLine}${when}, ${s.tS.length} samples`,
      series: { tS: s.tS, co2Ppm: s.co2Ppm },
    };
  });
}

/** Closure capture remembers the confirmed column mapping per analyzer under this device key. */
export const loggerPresetKey = (analyzerId: string | null) => `fw.logger-preset.${analyzerId ?? 'none'}`;
