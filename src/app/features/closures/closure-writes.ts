import { Injectable, inject } from '@angular/core';
import { TYPICAL_SETTLE_TIME_S } from '../../../../shared/flux';
import type { LocalRecord } from '../../core/db/db-schema';
import { textMediaType } from '../../core/db/device-files';
import { LocalWrites } from '../../core/sync/local-writes';
import { validated } from '../../core/db/validated';
import { localDay } from './closure-flux';

export interface ClosureSeries {
  tS: (number | null)[];
  co2Ppm: (number | null)[];
  h2oMmolMol: (number | null)[] | null;
  pressureKpa: (number | null)[] | null;
  tempC: (number | null)[] | null;
}

export interface ClosureTarget {
  siteId: string;
  campaignId: string;
  collarId: string;
  visitId: string;
  analyzerId: string | null;
}

const EMPTY_SERIES: ClosureSeries = { tS: [], co2Ppm: [], h2oMmolMol: null, pressureKpa: null, tempC: null };

/**
 * Closure writes on the device. A "chamber on" tap makes the closure record at once (with the
 * phone's time and an empty series) so a tap is never lost; the series arrives later from the
 * logger file or by hand. A redo is a new closure at the same visit naming the one it redoes.
 */
@Injectable({ providedIn: 'root' })
export class ClosureWrites {
  private readonly writes = inject(LocalWrites);

  /** The profile version valid on the day, among the versions of the site's default profile when it has one. */
  private profileFor(site: LocalRecord | null, profiles: LocalRecord[], at: Date): LocalRecord | null {
    const day = localDay(at.toISOString(), String(site?.['timezone'] ?? 'UTC'));
    const defaultName = profiles.find((p) => p.id === site?.['defaultProfileId'])?.['name'];
    const pool = defaultName ? profiles.filter((p) => p['name'] === defaultName) : profiles;
    return pool.filter((p) => String(p['validFrom']) <= day).sort((a, b) => String(b['validFrom']).localeCompare(String(a['validFrom'])))[0] ?? null;
  }

  async chamberOn(t: ClosureTarget, site: LocalRecord | null, profiles: LocalRecord[], redoOf: LocalRecord | null = null, now = new Date()): Promise<LocalRecord> {
    const profile = this.profileFor(site, profiles, now);
    const at = now.toISOString();
    const fields = validated('closure', {
      siteId: t.siteId, visitId: t.visitId, collarId: t.collarId, campaignId: t.campaignId,
      profileId: profile?.id ?? null, analyzerId: t.analyzerId, startedAt: at, chamberOnAt: at,
      settleS: Number(profile?.['settleS'] ?? TYPICAL_SETTLE_TIME_S), series: EMPTY_SERIES, redoOfId: redoOf?.id ?? null,
    });
    return this.writes.create('closure', fields);
  }

  async chamberOff(closure: LocalRecord, now = new Date()): Promise<void> {
    await this.writes.edit('closure', closure.id, { chamberOffAt: now.toISOString(), endedAt: closure['endedAt'] ?? now.toISOString() });
  }

  /** A series for a closure (from a logger piece or typed in), checked by the shared schema first. */
  async saveSeries(closure: LocalRecord, series: ClosureSeries, startedAt: string, endedAt: string | null, sourceAttachmentId: string | null): Promise<void> {
    const changes = { series, startedAt, endedAt, sourceAttachmentId };
    validated('closure', { ...closure, ...changes });
    await this.writes.edit('closure', closure.id, changes);
  }

  /** A closure made from a logger piece the crew assigned to a visit without a tap. */
  async createFromPiece(t: ClosureTarget, settleS: number, series: ClosureSeries, startedAt: string, endedAt: string | null, sourceAttachmentId: string | null): Promise<LocalRecord> {
    const fields = validated('closure', {
      siteId: t.siteId, visitId: t.visitId, collarId: t.collarId, campaignId: t.campaignId, analyzerId: t.analyzerId,
      startedAt, endedAt, settleS, series, sourceAttachmentId,
    });
    return this.writes.create('closure', fields);
  }

  /** Keeps a logger file of a closure on the device (record and bytes in one transaction). */
  keepFile(siteId: string, ownerId: string, file: Blob, fileName: string): Promise<string> {
    return this.writes.keepFile({ siteId, ownerEntity: 'closure', ownerId }, { blob: file, fileName, mediaType: textMediaType(fileName) });
  }
}
