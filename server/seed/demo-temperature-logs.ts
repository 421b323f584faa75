import { DEMO_SITE_ID } from './demo-accounts';
import { soilTempC } from './demo-climate';
import type { DemoLayout } from './demo-layout';
import { createOp, type SeedWrite } from './demo-plan';
import { demoId, hashString, Rng } from './prng';

/** The season the plot loggers covered: hourly, 1 April to 31 October 2026 (UTC). */
export const LOG_FROM_MS = Date.UTC(2026, 3, 1);
export const LOG_TO_MS = Date.UTC(2026, 9, 31, 23);
const HOUR_MS = 3_600_000;

/**
 * One soil-temperature logger per plot at 5 cm, imported by the lab for gap filling. Values
 * follow the same invented weather as the probe readings, rounded to 0.1 °C like a logger file.
 */
export function buildTemperatureLogs(layout: DemoLayout): SeedWrite[] {
  const plots = new Map(layout.collars.map((c) => [c.plotId, c]));
  return [...plots.entries()].map(([plotId, collar]) => {
    const rng = new Rng(hashString(`logger:${collar.plotCode}`));
    const t: string[] = [];
    const tempC: number[] = [];
    for (let ms = LOG_FROM_MS; ms <= LOG_TO_MS; ms += HOUR_MS) {
      t.push(new Date(ms).toISOString());
      tempC.push(Math.round((soilTempC(ms, collar.climate) + rng.normal(0, 0.05)) * 10) / 10);
    }
    return createOp('temperatureLog', demoId(`templog:${collar.plotCode}`), 'lab', {
      siteId: DEMO_SITE_ID,
      plotId,
      depthCm: 5,
      source: `Plot logger ${collar.plotCode} (hourly export)`,
      series: { t, tempC },
    });
  });
}
