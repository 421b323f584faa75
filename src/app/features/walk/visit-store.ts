import { Signal } from '@angular/core';
import type { FluxDb, LocalRecord } from '../../core/db/db-schema';
import { liveSignal } from '../../core/db/live-query-signal';
import type { MoistureCalibration } from '../../../../shared/model/derived';
import { collarSettling, newestDisturbance, siteSettlingLimits, type SettlingNote } from '../../../../shared/model/collar-settling';

export type { SettlingNote };

export interface VisitKey {
  collarId: string;
  campaignId: string | null;
  round: number;
}

export interface VisitView {
  collar: LocalRecord;
  site: LocalRecord | null;
  plotCode: string;
  treatment: string;
  profiles: { id: string; name: string; validFrom: string; chamberVolumeCm3: number; loopVolumeCm3: number }[];
  visit: LocalRecord | null;
  /** This visit's newest offset set (a correction supersedes the earlier one). */
  offsetSet: LocalRecord | null;
  /** The collar's last offset set before this visit. */
  lastOffsetSet: LocalRecord | null;
  /** This visit's newest probe replicate. */
  probe: LocalRecord | null;
  /** Every live probe replicate of this visit, oldest first. */
  probes: LocalRecord[];
  /** Closures started at this visit. */
  closureCount: number;
  lastFlux: { value: number; at: string } | null;
  settling: SettlingNote | null;
  calibration: MoistureCalibration;
}

/** The collar's settling note at the site's today (the rule and its limits: shared/model/collar-settling.ts). */
export function settlingNote(
  collar: LocalRecord<'collar'>,
  events: readonly LocalRecord<'collarEvent'>[],
  site: LocalRecord<'site'> | null,
  now = new Date(),
): SettlingNote | null {
  // Without the site's record on the device, the schema's limits apply and days count in UTC.
  return collarSettling(newestDisturbance(events, collar.installedOn), siteSettlingLimits.parse(site ?? {}), site?.timezone ?? 'UTC', now);
}

const newest = (list: LocalRecord[], field: string) =>
  [...list].sort((a, b) => String(b[field]).localeCompare(String(a[field])))[0] ?? null;

export async function loadVisit(db: FluxDb, key: VisitKey): Promise<VisitView | null> {
  const collar = await db.records('collar').get(key.collarId);
  if (!collar) return null;
  const siteId = String(collar['siteId']);
  const [site, plot, events, visits, sets, probes, closures, profiles] = await Promise.all([
    db.records('site').get(siteId),
    db.records('plot').get(String(collar['plotId'])),
    db.records('collarEvent').where('collarId').equals(collar.id).toArray(),
    db
      .records('visit')
      .where('collarId')
      .equals(collar.id)
      .filter((v) => !v.deleted)
      .toArray(),
    db
      .records('offsetSet')
      .where('collarId')
      .equals(collar.id)
      .filter((s) => !s.deleted)
      .toArray(),
    db
      .records('probeReading')
      .where('collarId')
      .equals(collar.id)
      .filter((s) => !s.deleted)
      .toArray(),
    db
      .records('closure')
      .where('collarId')
      .equals(collar.id)
      .filter((s) => !s.deleted)
      .toArray(),
    db
      .records('chamberProfile')
      .where('siteId')
      .equals(siteId)
      .filter((s) => !s.deleted)
      .toArray(),
  ]);
  const treatmentId = (collar['treatmentId'] as string | null) ?? (plot?.['treatmentId'] as string | null) ?? null;
  const treatment = treatmentId ? await db.records('treatment').get(treatmentId) : undefined;
  const visit = newest(
    visits.filter((v) => v['campaignId'] === key.campaignId && v['round'] === key.round),
    'arrivedAt',
  );
  const superseded = new Set(sets.map((s) => s['supersedesId']).filter(Boolean));
  const current = sets.filter((s) => !superseded.has(s.id));
  const offsetSet = visit
    ? newest(
        current.filter((s) => s['visitId'] === visit.id),
        'takenAt',
      )
    : null;
  const lastOffsetSet = newest(
    current.filter((s) => !visit || s['visitId'] !== visit.id),
    'takenAt',
  );
  const visitProbes = visit
    ? probes
        .filter((p) => p['visitId'] === visit.id)
        .sort((a, b) => String(a['takenAt']).localeCompare(String(b['takenAt'])) || a.id.localeCompare(b.id))
    : [];
  const probe = visitProbes[visitProbes.length - 1] ?? null;
  const withFlux = closures.filter((c) => typeof c['fluxUmolM2S'] === 'number');
  const lastClosure = newest(withFlux, 'startedAt');
  return {
    collar,
    site: site ?? null,
    plotCode: String(plot?.['code'] ?? ''),
    treatment: treatment ? [treatment['code'], treatment['name']].filter(Boolean).join(' · ') : '',
    profiles: profiles.map((p) => ({
      id: p.id,
      name: String(p['name'] ?? ''),
      validFrom: String(p['validFrom']),
      chamberVolumeCm3: Number(p['chamberVolumeCm3']),
      loopVolumeCm3: Number(p['loopVolumeCm3']),
    })),
    visit,
    offsetSet,
    lastOffsetSet,
    probe,
    probes: visitProbes,
    closureCount: visit ? closures.filter((c) => c['visitId'] === visit.id).length : 0,
    lastFlux: lastClosure ? { value: Number(lastClosure['fluxUmolM2S']), at: String(lastClosure['startedAt']) } : null,
    settling: settlingNote(collar, events, site ?? null),
    calibration: (site?.['moistureCalibration'] as MoistureCalibration | undefined) ?? { kind: 'topp' },
  };
}

export function visitView(key: () => VisitKey): Signal<VisitView | null | undefined> {
  return liveSignal(key, loadVisit, undefined as VisitView | null | undefined);
}
