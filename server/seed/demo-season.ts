import { DEMO_SITE_ID } from './demo-accounts';
import { collarByCode, type DemoLayout } from './demo-layout';
import { createOp, demoUserId, iso, MINUTE_MS, updateOp, type SeedWrite } from './demo-plan';
import type { ClosureKind } from './demo-series';
import { buildVisit, type DemoClosureRef, type VisitPlan } from './demo-visit';
import { demoId, hashString, Rng } from './prng';

/**
 * The past season: one campaign a month, April–October 2026, each walked over two mornings
 * (west loop, then east loop), reviewed in part by the lab and locked by the lead. The odd
 * closures are placed by hand so every QC flag shows up, some reviewed and some waiting.
 */

export const SEASON = [
  { key: '2026-04', name: 'April 2026 survey', days: ['2026-04-14', '2026-04-15'] },
  { key: '2026-05', name: 'May 2026 survey', days: ['2026-05-12', '2026-05-13'] },
  { key: '2026-06', name: 'June 2026 survey', days: ['2026-06-16', '2026-06-17'] },
  { key: '2026-07', name: 'July 2026 survey', days: ['2026-07-14', '2026-07-15'] },
  { key: '2026-08', name: 'August 2026 survey', days: ['2026-08-11', '2026-08-12'] },
  { key: '2026-09', name: 'September 2026 survey', days: ['2026-09-15', '2026-09-16'] },
  { key: '2026-10', name: 'October 2026 survey', days: ['2026-10-13', '2026-10-14'] },
] as const;

interface Oddity {
  kind: ClosureKind;
  redo?: boolean;
}

/** Hand-placed problems: campaign key → collar code → what went wrong. */
const ODDITIES: Record<string, Record<string, Oddity>> = {
  '2026-04': { 'B1-P02-C3': { kind: 'start-above', redo: true }, 'B3-P08-C1': { kind: 'leak' }, 'B4-P11-C4': { kind: 'spike' } },
  '2026-05': { 'B2-P05-C2': { kind: 'uptake' }, 'B1-P01-C4': { kind: 'spike', redo: true } },
  '2026-06': { 'B3-P09-C2': { kind: 'start-above' }, 'B4-P10-C3': { kind: 'leak', redo: true } },
  '2026-07': { 'B2-P04-C1': { kind: 'uptake' }, 'B1-P03-C2': { kind: 'spike' } },
  '2026-08': { 'B4-P12-C1': { kind: 'leak' }, 'B3-P07-C3': { kind: 'start-above', redo: true } },
  '2026-09': { 'B2-P06-C4': { kind: 'spike', redo: true }, 'B1-P02-C1': { kind: 'uptake' } },
  '2026-10': { 'B3-P08-C4': { kind: 'leak' }, 'B4-P12-C3': { kind: 'start-above' } },
};

/** Wet spring and autumn: water stands in the low corner of plot P10. */
const STANDING_WATER: Record<string, string[]> = { '2026-04': ['B4-P10-C1', 'B4-P10-C2'], '2026-10': ['B4-P10-C1'] };
const SKIPS: Record<string, Record<string, string>> = {
  '2026-09': { 'B4-P12-C2': 'Fallen branch across the collar after the storm; cleared the following week' },
};

/** The collar the wild boar rooted up in May: reported damaged, reseated a week later. */
export const BOAR_COLLAR = 'B2-P05-C3';
const RESEAT_DAY = '2026-05-20';
const RESEAT_SHIFT_CM = 0.6;

/** Which campaigns the lab has gone through: all of April, the west loop of May. */
const REVIEWED: Record<string, 'all' | 'west'> = { '2026-04': 'all', '2026-05': 'west' };

const REJECT_REASONS: Partial<Record<ClosureKind, string>> = {
  'start-above': 'Started far above ambient: chamber not aired after the previous closure',
  leak: 'Curve bends over within a minute: chamber not sealed on the collar rim',
  spike: 'Spike from a footstep beside the chamber distorts the fit',
  uptake: 'Uptake under an opaque chamber: light leak suspected, chamber seal checked afterwards',
};

export interface SeasonOutput {
  writes: SeedWrite[];
  campaignIds: string[];
  closures: DemoClosureRef[];
}

const DAY_START_UTC_H = 7.5; // 09:30 local summer time
const STOP_MIN = 7;

export function buildSeason(layout: DemoLayout): SeasonOutput {
  const writes: SeedWrite[] = [...collarStory(layout)];
  writes.push(...calibrations(layout.analyzerId));
  const campaignIds: string[] = [];
  const allClosures: DemoClosureRef[] = [];
  for (const c of SEASON) {
    const campaignId = demoId(`campaign:${c.key}`);
    campaignIds.push(campaignId);
    writes.push(
      createOp('campaign', campaignId, 'lead', {
        siteId: DEMO_SITE_ID,
        name: c.name,
        startsOn: c.days[0],
        endsOn: c.days[1],
        rounds: 1,
        dueOffset: true,
        dueClosures: 1,
        dueProbes: true,
        routes: layout.routes.map((r) => ({ routeId: r.id, crewIds: [demoUserId('crew')], direction: 'forward' })),
        roundWindows: [],
        locked: false,
      }),
    );
    const closures: DemoClosureRef[] = [];
    layout.routes.forEach((route, r) => {
      const dayMs = Date.parse(`${c.days[r]}T00:00:00Z`);
      writes.push(...dayChecks(layout.analyzerId, dayMs, c.key === '2026-08' && r === 0));
      const rng = new Rng(hashString(`walk:${c.key}:${route.id}`));
      let t = dayMs + DAY_START_UTC_H * 3_600_000;
      for (const collarId of route.collarIds) {
        const collar = layout.collars.find((x) => x.id === collarId)!;
        const odd = ODDITIES[c.key]?.[collar.code];
        const plan: VisitPlan = {
          campaignId,
          campaignKey: c.key,
          round: 1,
          collar,
          arrivalMs: t,
          profiles: layout.profiles,
          analyzerId: layout.analyzerId,
          closure: odd?.kind ?? 'normal',
          redo: odd?.redo,
          skipReason: SKIPS[c.key]?.[collar.code],
          offsetShiftCm: collar.code === BOAR_COLLAR && c.days[0] > RESEAT_DAY ? RESEAT_SHIFT_CM : 0,
          conditions: {
            standingWater: STANDING_WATER[c.key]?.includes(collar.code) ?? false,
            ...(collar.code === BOAR_COLLAR && c.key === '2026-05'
              ? { animal: true, other: 'Ground rooted by wild boar around the collar' }
              : {}),
            trampled: rng.chance(0.02),
          },
        };
        const visit = buildVisit(plan);
        writes.push(...visit.writes);
        closures.push(...visit.closures);
        t += (STOP_MIN + (odd?.redo ? 3.5 : 0) + rng.uniform(-1, 1.5)) * MINUTE_MS;
      }
    });
    // The lead closes the fieldwork once every collar is done; the lab reviews afterwards (a rejected
    // closure cannot be measured again weeks later, so it does not reopen the campaign).
    writes.push(updateOp('campaign', campaignId, 'lead', { locked: true }));
    writes.push(...reviews(c.key, closures, layout));
    allClosures.push(...closures);
  }
  return { writes, campaignIds, closures: allClosures };
}

/** Lab review: accept the good ones, reject the bad ones and redone originals with a reason. */
function reviews(key: string, closures: DemoClosureRef[], layout: DemoLayout): SeedWrite[] {
  const scope = REVIEWED[key];
  if (!scope) return [];
  const west = new Set(layout.routes[0].collarIds);
  const redone = new Set(closures.map((c) => c.redoOfId).filter((x): x is string => !!x));
  const out: SeedWrite[] = [];
  closures.forEach((c, i) => {
    if (scope === 'west' && !west.has(collarByCode(layout, c.collarCode).id)) return;
    const reason = redone.has(c.id) ? `Redone on site: ${REJECT_REASONS[c.kind] ?? 'first closure unusable'}` : REJECT_REASONS[c.kind];
    if (reason) {
      out.push(updateOp('closure', c.id, 'lab', { reviewState: 'rejected', reviewReason: reason }));
    } else if (i % 17 === 5) {
      // Now and then the lab moves the fit window and prefers the line (a reviewer's judgement).
      out.push(updateOp('closure', c.id, 'lab', { reviewState: 'accepted', reviewSettleS: 30, reviewModel: 'linear' }));
    } else {
      out.push(updateOp('closure', c.id, 'lab', { reviewState: 'accepted' }));
    }
  });
  return out;
}

/** Collar events beyond the installs: the June clipping round and the boar damage and reseat. */
function collarStory(layout: DemoLayout): SeedWrite[] {
  const out: SeedWrite[] = [];
  for (const c of layout.collars) {
    out.push(
      createOp('collarEvent', demoId(`event:clip:2026-06-08:${c.code}`), 'crew', {
        siteId: DEMO_SITE_ID,
        collarId: c.id,
        kind: 'clipped',
        date: '2026-06-08',
        note: 'Vegetation inside the collar clipped at the soil surface',
        replacedById: null,
      }),
    );
  }
  const boar = collarByCode(layout, BOAR_COLLAR);
  out.push(
    createOp('collarEvent', demoId('event:boar:damaged'), 'crew', {
      siteId: DEMO_SITE_ID,
      collarId: boar.id,
      kind: 'damaged',
      date: '2026-05-12',
      note: 'Tilted by rooting wild boar',
      replacedById: null,
    }),
    updateOp('collar', boar.id, 'crew', { status: 'damaged', statusReason: 'Tilted by rooting wild boar' }),
    createOp('collarEvent', demoId('event:boar:reseated'), 'lead', {
      siteId: DEMO_SITE_ID,
      collarId: boar.id,
      kind: 'reseated',
      date: RESEAT_DAY,
      note: 'Reseated 5 cm deep; left to settle before June',
      replacedById: null,
    }),
    updateOp('collar', boar.id, 'lead', { status: 'active', statusReason: null }),
  );
  return out;
}

/** Zero/span calibrations before the season and mid-season: zero on scrubbed air, span on a 1000 µmol/mol cylinder. */
function calibrations(analyzerId: string): SeedWrite[] {
  return (
    [
      ['2026-03-30T08:00:00Z', 0.8, 1003.1],
      ['2026-07-06T08:00:00Z', -1.2, 995.4],
    ] as const
  ).map(([at, zeroBefore, spanBefore]) =>
    createOp('analyzerCheck', demoId(`check:calibration:${at}`), 'lead', {
      siteId: DEMO_SITE_ID,
      analyzerId,
      kind: 'calibration',
      at,
      skipped: false,
      skipReason: null,
      passed: true,
      co2Ppm: null,
      slopeUmolMolS: null,
      clockOffsetS: null,
      zeroGasPpm: 0,
      zeroCylinder: null,
      zeroBeforePpm: zeroBefore,
      zeroAfterPpm: 0.1,
      spanGasPpm: 1000,
      spanCylinder: 'SG-1000-0417',
      spanBeforePpm: spanBefore,
      spanAfterPpm: 1000.2,
      note: 'Zero with scrubbed air, span with the 1000 µmol/mol cylinder',
    }),
  );
}

/** The start-of-day checklist: warm-up, clock, ambient, leak (sealed plate), safety note. */
export function dayChecks(analyzerId: string, dayMs: number, skipLeak = false): SeedWrite[] {
  const rng = new Rng(hashString(`checks:${dayMs}`));
  const at = (min: number) => iso(dayMs + 7 * 3_600_000 + min * MINUTE_MS);
  const base = {
    siteId: DEMO_SITE_ID,
    analyzerId,
    skipped: false,
    skipReason: null,
    passed: true as boolean | null,
    co2Ppm: null as number | null,
    slopeUmolMolS: null as number | null,
    clockOffsetS: null as number | null,
    spanGasPpm: null,
    driftPpm: null,
    note: '',
  };
  const id = (kind: string) => demoId(`check:${kind}:${dayMs}`);
  const slope = Math.round(rng.normal(0.01, 0.008) * 1000) / 1000;
  return [
    createOp('analyzerCheck', id('warm-up'), 'crew', { ...base, kind: 'warm-up', at: at(0), note: 'Warmed up 15 min in the car' }),
    createOp('analyzerCheck', id('clock'), 'crew', {
      ...base,
      kind: 'clock',
      at: at(16),
      clockOffsetS: Math.round(rng.normal(0.4, 0.3) * 10) / 10,
    }),
    createOp('analyzerCheck', id('ambient'), 'crew', {
      ...base,
      kind: 'ambient',
      at: at(18),
      co2Ppm: Math.round(rng.normal(423, 3) * 10) / 10,
    }),
    skipLeak
      ? createOp('analyzerCheck', id('leak'), 'crew', {
          ...base,
          kind: 'leak',
          at: at(20),
          skipped: true,
          passed: null,
          skipReason: 'Sealing plate left at the station',
        })
      : createOp('analyzerCheck', id('leak'), 'crew', {
          ...base,
          kind: 'leak',
          at: at(20),
          slopeUmolMolS: slope,
          passed: Math.abs(slope) <= 0.05,
        }),
    createOp('analyzerCheck', id('safety-ack'), 'crew', {
      ...base,
      kind: 'safety-ack',
      at: at(22),
      analyzerId: null,
      note: 'Safety note read',
    }),
  ];
}
