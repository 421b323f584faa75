import { probeValuesSchema } from '../../../../shared/model/field-records';
import { parseCm } from './offset-form';

export interface ProbeKit {
  probeId: string;
  rodLengthCm: number | null;
  moistureKind: 'vwc' | 'permittivity';
}

export interface ProbeReadingInput extends ProbeKit {
  soilTemps: { depthCm: number; tempC: number }[];
  moistureRaw: number | null;
}

export interface ProbeBoxes {
  temps: { depth: string; temp: string }[];
  kind: 'vwc' | 'permittivity';
  moisture: string;
  rod: string;
  probeId: string;
}

type Parsed = { ok: true; value: number | null } | { ok: false; message: string };

/** A number as typed, with the one unit the box is in allowed after it ("23 %", "6.4 °C"); any other unit is named back. */
function parseWithUnit(text: string, allowed: RegExp, what: string, unitHelp: string): Parsed {
  const t = text.trim();
  if (!t) return { ok: true, value: null };
  const bare = t.replace(allowed, '').trim();
  const v = parseCm(bare);
  if (v !== null) return { ok: true, value: v };
  const unit = /^-?[\d.,]+\s*(\S.*)$/.exec(t)?.[1];
  if (unit) return { ok: false, message: `${what} is in ${unitHelp}; "${unit}" is another unit.` };
  return { ok: false, message: `${what} must be a number in ${unitHelp}.` };
}

/**
 * Reads the probe boxes into one replicate, or says what is wrong: numbers (decimal comma allowed),
 * the box's own unit only, and the ranges of the shared record schema (the server applies the same).
 */
export function readProbe(v: ProbeBoxes): { ok: true; reading: ProbeReadingInput } | { ok: false; message: string } {
  const soilTemps: { depthCm: number; tempC: number }[] = [];
  for (const row of v.temps) {
    if (!row.temp.trim()) continue;
    const temp = parseWithUnit(row.temp, /\s*°?\s*C$/i, 'Soil temperature', '°C');
    if (!temp.ok) return temp;
    const depth = parseWithUnit(row.depth, /\s*cm$/i, 'Depth', 'cm');
    if (!depth.ok) return depth;
    if (depth.value === null)
      return { ok: false, message: 'Give both depth and temperature for each soil temperature, or leave the temperature empty.' };
    soilTemps.push({ depthCm: depth.value, tempC: temp.value! });
  }
  const moisture =
    v.kind === 'vwc'
      ? parseWithUnit(v.moisture, /\s*%$/, 'Moisture', '% VWC (e.g. 23.5)')
      : parseWithUnit(v.moisture, /^$/, 'Permittivity', 'Ka, no unit (e.g. 20)');
  if (!moisture.ok) return moisture;
  const rod = parseWithUnit(v.rod, /\s*cm$/i, 'Rod length', 'cm');
  if (!rod.ok) return rod;
  if (!soilTemps.length && moisture.value === null) return { ok: false, message: 'Enter a soil temperature or a moisture reading.' };
  const reading: ProbeReadingInput = {
    soilTemps,
    moistureRaw: moisture.value,
    moistureKind: v.kind,
    rodLengthCm: rod.value,
    probeId: v.probeId.trim(),
  };
  const checked = probeValuesSchema.safeParse(reading);
  if (!checked.success) return { ok: false, message: checked.error.issues[0].message };
  return { ok: true, reading };
}
