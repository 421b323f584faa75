import { Signal } from '@angular/core';
import type { FluxDb, LocalRecord } from '../../core/db/db-schema';
import { liveSignal } from '../../core/db/live-query-signal';
import type { MoistureCalibration } from '../../../../shared/model/derived';
import { siteFields } from '../../../../shared/model/site-layout';
import { collarSettling, newestDisturbance, siteSettlingLimits, type SettlingNote } from '../../../../shared/model/collar-settling';
import { liveOffsetSets } from '../../../../shared/model/live-offset-sets';
import { newest, offsetSetAtVisit, visitInRound } from '../field-day/visit-at-collar';

export type { SettlingNote };

export interface VisitKey {
  collarId: string;
  campaignId: string | null;
  round: number;
}

/** A chamber profile of the site as the visit screen offers it. */
export interface VisitProfile {
  id: string;
  name: string;
  validFrom: string;
  chamberVolumeCm3: number;
  loopVolumeCm3: number;
}

export interface VisitView {
  collar: LocalRecord<'collar'>;
  site: LocalRecord<'site'> | null;
  plotCode: string;
  treatment: string;
  profiles: VisitProfile[];
  visit: LocalRecord<'visit'> | null;
  /** This visit's newest offset set (a correction supersedes the earlier one). */
  offsetSet: LocalRecord<'offsetSet'> | null;
  /** The collar's last offset set before this visit. */
  lastOffsetSet: LocalRecord<'offsetSet'> | null;
  /** This visit's newest probe replicate. */
  probe: LocalRecord<'probeReading'> | null;
  /** Every live probe replicate of this visit, oldest first. */
  probes: LocalRecord<'probeReading'>[];
  /** Closures started at this visit. */
  closureCount: number;
  lastFlux: { value: number; at: string } | null;
  settling: SettlingNote | null;
  calibration: MoistureCalibration;
}

/** The site's moisture calibration; the schema's default (Topp) when the site's record is not on the device. */
const siteCalibration = siteFields.pick({ moistureCalibration: true });

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

export async function loadVisit(db: FluxDb, key: VisitKey): Promise<VisitView | null> {
  const collar = await db.records('collar').get(key.collarId);
  if (!collar) return null;
  const live = (r: { deleted?: boolean }) => !r.deleted;
  const ofCollar = <E extends 'visit' | 'offsetSet' | 'probeReading' | 'closure'>(entity: E) =>
    db.records(entity).where('collarId').equals(collar.id).filter(live).toArray();
  const [site, plot, events, visits, sets, probes, closures, profiles] = await Promise.all([
    db.records('site').get(collar.siteId),
    db.records('plot').get(collar.plotId),
    db.records('collarEvent').where('collarId').equals(collar.id).toArray(),
    ofCollar('visit'),
    ofCollar('offsetSet'),
    ofCollar('probeReading'),
    ofCollar('closure'),
    db.records('chamberProfile').where('siteId').equals(collar.siteId).filter(live).toArray(),
  ]);
  const treatmentId = collar.treatmentId ?? plot?.treatmentId ?? null;
  const treatment = treatmentId ? await db.records('treatment').get(treatmentId) : undefined;
  const visit = visitInRound(visits, key.campaignId, key.round);
  const offsetSet = visit ? offsetSetAtVisit(sets, visit.id) : null;
  const lastOffsetSet = newest(
    liveOffsetSets(sets).filter((s) => !visit || s.visitId !== visit.id),
    (s) => s.takenAt,
  );
  const visitProbes = visit
    ? probes.filter((p) => p.visitId === visit.id).sort((a, b) => a.takenAt.localeCompare(b.takenAt) || a.id.localeCompare(b.id))
    : [];
  const probe = visitProbes[visitProbes.length - 1] ?? null;
  // The flux is the server's: a closure made here has none until it has been pushed and pulled back.
  const lastClosure = newest(
    closures.filter((c) => typeof c.fluxUmolM2S === 'number'),
    (c) => c.startedAt,
  );
  return {
    collar,
    site: site ?? null,
    plotCode: plot?.code ?? '',
    treatment: treatment ? [treatment.code, treatment.name].filter(Boolean).join(' · ') : '',
    profiles: profiles.map((p) => ({
      id: p.id,
      name: p.name,
      validFrom: p.validFrom,
      chamberVolumeCm3: p.chamberVolumeCm3,
      loopVolumeCm3: p.loopVolumeCm3,
    })),
    visit,
    offsetSet,
    lastOffsetSet,
    probe,
    probes: visitProbes,
    closureCount: visit ? closures.filter((c) => c.visitId === visit.id).length : 0,
    lastFlux: lastClosure?.fluxUmolM2S != null ? { value: lastClosure.fluxUmolM2S, at: lastClosure.startedAt } : null,
    settling: settlingNote(collar, events, site ?? null),
    calibration: siteCalibration.parse(site ?? {}).moistureCalibration,
  };
}

export function visitView(key: () => VisitKey): Signal<VisitView | null | undefined> {
  return liveSignal(key, loadVisit, undefined as VisitView | null | undefined);
}
