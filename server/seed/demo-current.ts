import { createHash } from 'node:crypto';
import { DEMO_SITE_ID } from './demo-accounts';
import { soilTempC } from './demo-climate';
import type { DemoLayout } from './demo-layout';
import { createOp, demoUserId, MINUTE_MS, updateOp, type SeedWrite } from './demo-plan';
import { dayChecks } from './demo-season';
import { buildVisit, type VisitPlan } from './demo-visit';
import { demoId, hashString, Rng } from './prng';
import { z } from 'zod';
import { closureSeriesSchema } from '../../shared/model/field-records';

/**
 * The campaign under way when the demo opens: two rounds in the first days of December, both
 * loops assigned to the crew, the first seven stops of round 1 on the west loop already walked
 * (five complete, one partial, one skipped). Not locked: the Walk and Board screens work on it.
 */
export const CURRENT_CAMPAIGN_ID = demoId('campaign:2026-12');
export const CURRENT_DAY = '2026-12-01';

export function buildCurrentCampaign(layout: DemoLayout): SeedWrite[] {
  const crew = demoUserId('crew');
  const writes: SeedWrite[] = [
    createOp('campaign', CURRENT_CAMPAIGN_ID, 'lead', {
      siteId: DEMO_SITE_ID,
      name: 'December 2026 survey, two rounds',
      startsOn: CURRENT_DAY,
      endsOn: '2026-12-04',
      rounds: 2,
      dueOffset: true,
      dueClosures: 1,
      dueProbes: true,
      routes: layout.routes.map((r) => ({ routeId: r.id, crewIds: [crew], direction: 'alternate' })),
      roundWindows: [
        { round: 1, from: '2026-12-01T08:00:00Z', to: '2026-12-02T16:00:00Z' },
        { round: 2, from: '2026-12-03T08:00:00Z', to: '2026-12-04T16:00:00Z' },
      ],
      locked: false,
    }),
  ];
  const dayMs = Date.parse(`${CURRENT_DAY}T00:00:00Z`);
  writes.push(...dayChecks(layout.analyzerId, dayMs + 3_600_000));
  const rng = new Rng(hashString('walk:2026-12'));
  let t = dayMs + 8.75 * 3_600_000; // 09:45 local winter time, after the checks
  const stops = layout.routes[0].collarIds.slice(0, 7);
  stops.forEach((collarId, i) => {
    const collar = layout.collars.find((c) => c.id === collarId)!;
    const plan: VisitPlan = {
      campaignId: CURRENT_CAMPAIGN_ID,
      campaignKey: '2026-12',
      round: 1,
      collar,
      arrivalMs: t,
      profiles: layout.profiles,
      analyzerId: layout.analyzerId,
      closure: 'normal',
      conditions: { rain24h: true, frostSnow: soilTempC(t, collar.climate) < 2 || i < 2 },
    };
    if (i === 5) {
      plan.closure = null;
      plan.conditions = { ...plan.conditions, other: 'Analyzer battery flat: closure still to do after the swap' };
    }
    if (i === 6) {
      plan.skipReason = 'Standing water over the collar rim after overnight rain';
      plan.conditions = { ...plan.conditions, standingWater: true };
    }
    const visit = buildVisit(plan);
    writes.push(...visit.writes);
    if (i === 0) writes.push(...sourceFile(visit.writes.find((w) => w.entity === 'closure')!));
    t += (7 + rng.uniform(-1, 1.5)) * MINUTE_MS;
  });
  return writes;
}

/** What the source file reads of a seeded closure write (built by demo-visit.ts closureWrite). */
const seededClosure = z.object({ series: closureSeriesSchema, startedAt: z.string() });

/**
 * The analyzer's own file for the first closure of the day, kept as the closure's source: a
 * plain CSV of the same samples. The record carries the file's size and SHA-256; the bytes are
 * `demoSourceCsv()`, for whoever stores them in the object store.
 */
export function demoSourceCsv(closure: SeedWrite): string {
  const s = seededClosure.parse(closure.fields).series;
  const lines = ['elapsed_s,co2_umol_mol,h2o_mmol_mol,pressure_kpa,chamber_temp_c'];
  s.tS.forEach((t, i) => lines.push([t, s.co2Ppm[i], s.h2oMmolMol?.[i], s.pressureKpa?.[i], s.tempC?.[i]].join(',')));
  return `${lines.join('\n')}\n`;
}

function sourceFile(closure: SeedWrite): SeedWrite[] {
  const csv = demoSourceCsv(closure);
  const id = demoId(`attachment:${closure.id}`);
  return [
    createOp('attachment', id, 'crew', {
      siteId: DEMO_SITE_ID,
      ownerEntity: 'closure',
      ownerId: closure.id,
      fileName: `A1-${seededClosure.parse(closure.fields).startedAt.slice(0, 16).replace(/[-:]/g, '').replace('T', '-')}.csv`,
      mediaType: 'text/csv',
      sizeBytes: Buffer.byteLength(csv),
      sha256: createHash('sha256').update(csv).digest('hex'),
    }),
    updateOp('closure', closure.id, 'crew', { sourceAttachmentId: id }),
  ];
}
