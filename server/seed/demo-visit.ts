import { profileValidOn } from '../../shared/flux';
import { DEMO_SITE_ID } from './demo-accounts';
import { airH2oMmolMol, airTempC, permittivityForVwc, pressureKpa, rainedOn, soilTempC, soilVwcPct } from './demo-climate';
import { COLLAR_DIAMETER_CM, DEMO_Q10, type DemoCollar, type DemoProfile } from './demo-layout';
import { createOp, DAY_MS, demoUserId, iso, MINUTE_MS, type SeedWrite } from './demo-plan';
import { respirationUmolM2S, synthesizeClosure, type ClosureKind } from './demo-series';
import { demoId, hashString, Rng } from './prng';

/** One crew stop at one collar: conditions, offset set, probe reading and closure(s), as the Walk screen would record them. */
export interface VisitPlan {
  campaignId: string;
  /** Short key of the campaign for stable ids ("2026-04"). */
  campaignKey: string;
  round: number;
  collar: DemoCollar;
  arrivalMs: number;
  profiles: readonly DemoProfile[];
  analyzerId: string;
  /** How the (first) closure goes; `null` = no closure at this visit (a partial visit). */
  closure: ClosureKind | null;
  /** Redo a bad first closure on the spot with a good one. */
  redo?: boolean;
  skipReason?: string;
  /** Extra offset after a reseat etc., cm. */
  offsetShiftCm?: number;
  conditions?: Partial<VisitConditions>;
}

export interface VisitConditions {
  rainNow: boolean;
  rain24h: boolean;
  standingWater: boolean;
  frostSnow: boolean;
  trampled: boolean;
  animal: boolean;
  other: string;
}

export interface DemoClosureRef {
  id: string;
  collarCode: string;
  kind: ClosureKind;
  redoOfId: string | null;
}

export interface VisitOutcome {
  visitId: string;
  writes: SeedWrite[];
  closures: DemoClosureRef[];
}

const AREA_CM2 = (Math.PI * COLLAR_DIAMETER_CM * COLLAR_DIAMETER_CM) / 4;
const round = (x: number, d: number) => Math.round(x * 10 ** d) / 10 ** d;

/** The probe kit differs by route: a permittivity probe on the west loop, a VWC probe on the east loop. */
function probeKit(collar: DemoCollar): { kind: 'permittivity' | 'vwc'; probeId: string; rodLengthCm: number } {
  return collar.blockIndex < 2
    ? { kind: 'permittivity', probeId: 'TDR-2', rodLengthCm: 12 }
    : { kind: 'vwc', probeId: 'SM-7', rodLengthCm: 6 };
}

/** The rim is never perfectly level: each collar tilts a little in its own direction. */
function offsetReadings(collar: DemoCollar, ms: number, shiftCm: number, rng: Rng): number[] {
  const shape = new Rng(hashString(`tilt:${collar.code}`));
  const tilt = shape.uniform(0.1, 0.35);
  const direction = shape.uniform(0, 2 * Math.PI);
  // Slow rise over the season as the disturbed soil around the collar settles (a few mm).
  const days = (ms - Date.UTC(2026, 3, 1)) / DAY_MS;
  const mean = collar.baseOffsetCm + 0.0012 * days + shiftCm;
  return [0, 1, 2, 3].map((i) => round(Math.max(0.1, mean + tilt * Math.cos((i * Math.PI) / 2 - direction) + rng.normal(0, 0.07)), 1));
}

/** The soil temperature depth of the demo site (the schema's default, ±1 cm counts). */
const PROBE_DEPTH_CM = 5;
/** The thermistor a crew sometimes reads by mistake: 10 cm, outside the site's ±1 cm, so it is flagged, not averaged. */
const OFF_DEPTH_CM = 10;

/**
 * A visit's probe insertions around the collar: two or three replicates a minute apart, each its own
 * probe reading. The visit's wetness is shared; each insertion adds its own spot-to-spot spread
 * (about 1.5 % VWC, 0.2 °C); about one visit in ten has a temperature read at the wrong depth.
 */
function probeReplicates(collar: DemoCollar, key: string, link: Record<string, string>, firstMs: number, rng: Rng): SeedWrite[] {
  const kit = probeKit(collar);
  const visitVwc = soilVwcPct(firstMs, collar.vwcOffsetPct) + rng.normal(0, 0.8);
  const n = rng.chance(0.5) ? 3 : 2;
  const offDepthAt = rng.chance(0.1) ? rng.int(0, n - 1) : -1;
  return Array.from({ length: n }, (_, i) => {
    const ms = firstMs + i * MINUTE_MS + rng.int(0, 20) * 1000;
    const vwc = visitVwc + rng.normal(0, 1.5);
    const depthCm = i === offDepthAt ? OFF_DEPTH_CM : PROBE_DEPTH_CM;
    // The first replicate keeps the id a visit's single reading always had.
    return createOp('probeReading', demoId(i ? `probe:${key}:${i + 1}` : `probe:${key}`), 'crew', {
      ...link,
      takenAt: iso(ms),
      takenById: demoUserId('crew'),
      soilTemps: [{ depthCm, tempC: round(soilTempC(ms, collar.climate, depthCm) + rng.normal(0, 0.2), 1) }],
      moistureRaw: kit.kind === 'vwc' ? round(Math.max(1, vwc), 1) : round(permittivityForVwc(vwc) + rng.normal(0, 0.2), 1),
      moistureKind: kit.kind,
      rodLengthCm: kit.rodLengthCm,
      probeId: kit.probeId,
    });
  });
}

export function profileOn(profiles: readonly DemoProfile[], day: string): DemoProfile {
  const valid = profileValidOn(profiles, day);
  if (!valid) throw new Error(`no demo profile valid on ${day}`);
  return valid;
}

export function buildVisit(plan: VisitPlan): VisitOutcome {
  const { collar, arrivalMs: t0 } = plan;
  const key = `${plan.campaignKey}:r${plan.round}:${collar.code}`;
  const visitId = demoId(`visit:${key}`);
  const rng = new Rng(hashString(visitId));
  const crewId = demoUserId('crew');
  const site = DEMO_SITE_ID;
  const link = { siteId: site, visitId, collarId: collar.id, campaignId: plan.campaignId };

  const soilNow = soilTempC(t0, collar.climate);
  const conditions: VisitConditions = {
    rainNow: rainedOn(t0) && rng.chance(0.15),
    rain24h: rainedOn(t0 - DAY_MS),
    standingWater: false,
    frostSnow: airTempC(t0) < 0.5 || soilNow < 0.5,
    trampled: false,
    animal: false,
    other: '',
    ...plan.conditions,
  };
  const writes: SeedWrite[] = [
    createOp('visit', visitId, 'crew', {
      siteId: site,
      campaignId: plan.campaignId,
      round: plan.round,
      collarId: collar.id,
      crewId,
      arrivedAt: iso(t0),
      conditions,
      skipped: !!plan.skipReason,
      skipReason: plan.skipReason ?? null,
    }),
  ];
  if (plan.skipReason) return { visitId, writes, closures: [] };

  const readingsCm = offsetReadings(collar, t0, plan.offsetShiftCm ?? 0, rng);
  writes.push(
    createOp('offsetSet', demoId(`offset:${key}`), 'crew', {
      ...link,
      takenAt: iso(t0 + 1.5 * MINUTE_MS),
      readingsCm,
      supersedesId: null,
    }),
  );

  const closures: DemoClosureRef[] = [];
  if (plan.closure) {
    const kinds: ClosureKind[] = plan.redo ? [plan.closure, 'normal'] : [plan.closure];
    let previous: string | null = null;
    kinds.forEach((planned, i) => {
      // Water standing over the soil blocks diffusion: whatever was planned, the closure is flat.
      const kind: ClosureKind = conditions.standingWater ? 'flat' : planned;
      const id = demoId(`closure:${key}:${i + 1}`);
      const startMs = t0 + (3 + 3.5 * i) * MINUTE_MS + rng.int(0, 40) * 1000;
      writes.push(closureWrite(plan, link, id, kind, startMs, readingsCm, previous, conditions, rng));
      closures.push({ id, collarCode: collar.code, kind, redoOfId: previous });
      previous = id;
    });
  }

  const probeMs = t0 + (closures.length ? 4 + 3.5 * closures.length : 3) * MINUTE_MS;
  writes.push(...probeReplicates(collar, key, link, probeMs, rng));
  return { visitId, writes, closures };
}

function closureWrite(
  plan: VisitPlan,
  link: Record<string, string>,
  id: string,
  kind: ClosureKind,
  startMs: number,
  readingsCm: number[],
  redoOfId: string | null,
  conditions: VisitConditions,
  rng: Rng,
): SeedWrite {
  const { collar } = plan;
  const profile = profileOn(plan.profiles, iso(startMs).slice(0, 10));
  const meanOffset = readingsCm.reduce((a, b) => a + b, 0) / readingsCm.length;
  const soil = soilTempC(startMs, collar.climate);
  const flux = respirationUmolM2S({
    r10: collar.r10,
    q10: DEMO_Q10,
    soilTempC: soil,
    vwcPct: soilVwcPct(startMs, collar.vwcOffsetPct),
    factor: collar.respirationFactor * Math.exp(rng.normal(0, 0.08)),
  });
  // Near-ground air carries a little extra CO2 in the morning and in winter (weaker mixing).
  const ambient = 419 + (conditions.frostSnow ? 8 : 4) + rng.normal(0, 3);
  const series = synthesizeClosure(
    {
      kind,
      fluxUmolM2S: flux,
      ambientPpm: ambient,
      pressureKpa: pressureKpa(startMs),
      airTempC: airTempC(startMs),
      h2oMmolMol: airH2oMmolMol(startMs),
      volumeCm3: profile.chamberVolumeCm3 + profile.loopVolumeCm3 + AREA_CM2 * meanOffset,
      areaCm2: AREA_CM2,
      settleS: profile.settleS,
      durationS: profile.closureLengthS,
      noisePpm: 0.5,
    },
    rng,
  );
  const endMs = startMs + profile.closureLengthS * 1000;
  return createOp('closure', id, 'crew', {
    ...link,
    profileId: profile.id,
    analyzerId: plan.analyzerId,
    startedAt: iso(startMs),
    endedAt: iso(endMs),
    settleS: profile.settleS,
    series: { tS: series.tS, co2Ppm: series.co2Ppm, h2oMmolMol: series.h2oMmolMol, pressureKpa: series.pressureKpa, tempC: series.tempC },
    // The phone's chamber-on/off taps land a second or two off the logger's clock.
    chamberOnAt: iso(startMs - rng.int(0, 2) * 1000),
    chamberOffAt: iso(endMs + rng.int(0, 3) * 1000),
    sourceAttachmentId: null,
    redoOfId,
    reviewState: 'unreviewed',
    reviewReason: null,
    reviewSettleS: null,
    reviewWindowEndS: null,
    reviewModel: null,
  });
}
