import type { EntityManager } from 'typeorm';
import type { Warning } from '../../shared/model/common';
import { collarAreaCm2, offsetStats, probeVwcPct, type MoistureCalibration } from '../../shared/model/derived';
import type { EntityName } from '../../shared/model/entities';
import { computeClosureResults } from '../closures/closure-results';
import { closureWarnings } from '../closures/closure-warnings';
import { validatedAs } from './wire';

type Rec = Record<string, unknown>;

/** Values the server derives from a record about to be stored (area, offset mean/SD, VWC, flux). */
export async function deriveFields(em: EntityManager, entity: EntityName, next: Rec, _current: Rec | null): Promise<Rec> {
  switch (entity) {
    case 'collar':
      return { areaCm2: collarAreaCm2(validatedAs('collar', next)) };
    case 'offsetSet':
      return offsetStats(validatedAs('offsetSet', next).readingsCm);
    case 'probeReading': {
      const reading = validatedAs('probeReading', next);
      const rows: { moisture_calibration: MoistureCalibration }[] = await em.query(`SELECT moisture_calibration FROM site WHERE id = $1`, [
        reading.siteId,
      ]);
      return { vwcPct: probeVwcPct(reading, rows[0]?.moisture_calibration ?? { kind: 'topp' }) };
    }
    case 'closure':
      return computeClosureResults(em, next);
    case 'analyzerCheck': {
      // The schema computed the drifts from the readings; an edit stores them too.
      const check = validatedAs('analyzerCheck', next);
      return check.kind === 'calibration' ? { zeroDriftPpm: check.zeroDriftPpm, driftPpm: check.driftPpm } : {};
    }
    default:
      return {};
  }
}

/** Offsets of 0 or above 10 cm are stored but flagged: the chamber may not seal (common practice). */
function offsetWarnings(rec: Rec): Warning[] {
  const out: Warning[] = [];
  validatedAs('offsetSet', rec).readingsCm.forEach((v, i) => {
    if (v === 0) out.push({ path: `readingsCm.${i}`, message: 'Offset 0 cm: the chamber may not seal on the collar rim' });
    else if (v > 10)
      out.push({ path: `readingsCm.${i}`, message: `Offset ${v} cm is above 10 cm: check the reading; the chamber may not seal` });
  });
  return out;
}

/** Warnings returned beside accepted values; they never block a write. */
export async function warningsFor(em: EntityManager, entity: EntityName, rec: Rec): Promise<Warning[] | undefined> {
  let w: Warning[] = [];
  if (entity === 'offsetSet') w = offsetWarnings(rec);
  if (entity === 'closure') w = await closureWarnings(em, rec);
  return w.length ? w : undefined;
}
