import { Injectable, inject } from '@angular/core';
import { profileForClosure, TYPICAL_SETTLE_TIME_S } from '../../../../shared/flux';
import type { LocalRecord } from '../../core/db/db-schema';
import { textMediaType } from '../../core/db/device-files';
import { LocalWrites } from '../../core/sync/local-writes';
import { validated } from '../../core/db/validated';
import { localDay } from '../../../../shared/time/site-time';

/** A closure's series as its schema stores it. */
export type ClosureSeries = LocalRecord<'closure'>['series'];

export interface ClosureTarget {
  siteId: string;
  campaignId: string;
  collarId: string;
  visitId: string;
  analyzerId: string | null;
  /** The chamber profile the crew chose at the start of the day (any version of that chamber). */
  profileId: string | null;
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

  /**
   * The version valid on the day of the chamber the crew chose at the start of the day, else of the
   * site's default or only chamber (the rule the server computes the volume with, shared/flux chamber-system.ts).
   */
  private profileFor(
    t: ClosureTarget,
    site: LocalRecord<'site'> | null,
    profiles: LocalRecord<'chamberProfile'>[],
    at: string,
  ): LocalRecord<'chamberProfile'> | null {
    const day = localDay(at, site?.timezone ?? 'UTC');
    const named = profiles.map((p) => ({
      id: p.id,
      name: p.name,
      validFrom: p.validFrom,
      chamberVolumeCm3: 0,
      loopVolumeCm3: 0,
      areaCm2: 0,
    }));
    const chosen = profileForClosure(named, t.profileId, day, site?.defaultProfileId ?? null);
    return chosen.ok ? (profiles.find((p) => p.id === chosen.profile.id) ?? null) : null;
  }

  /** A closure starts only with today's analyzer and chamber profile (see dayKit), so no closure is stored without them. */
  async chamberOn(
    t: ClosureTarget,
    profile: LocalRecord<'chamberProfile'> | null,
    redoOf: LocalRecord<'closure'> | null = null,
    now = new Date(),
  ): Promise<LocalRecord<'closure'>> {
    if (!t.analyzerId) throw new Error("Choose today's analyzer before a closure.");
    if (!profile) throw new Error("Choose today's chamber profile before a closure.");
    const at = now.toISOString();
    const fields = validated('closure', {
      siteId: t.siteId,
      visitId: t.visitId,
      collarId: t.collarId,
      campaignId: t.campaignId,
      profileId: profile.id,
      analyzerId: t.analyzerId,
      startedAt: at,
      chamberOnAt: at,
      settleS: profile.settleS,
      series: EMPTY_SERIES,
      redoOfId: redoOf?.id ?? null,
    });
    return this.writes.create('closure', fields);
  }

  async chamberOff(closure: LocalRecord<'closure'>, now = new Date()): Promise<void> {
    await this.writes.edit('closure', closure.id, { chamberOffAt: now.toISOString(), endedAt: closure.endedAt ?? now.toISOString() });
  }

  /** A series for a closure (from a logger piece or typed in), checked by the shared schema first. */
  async saveSeries(
    closure: LocalRecord<'closure'>,
    series: ClosureSeries,
    startedAt: string,
    endedAt: string | null,
    sourceAttachmentId: string | null,
  ): Promise<void> {
    const changes = { series, startedAt, endedAt, sourceAttachmentId };
    validated('closure', { ...closure, ...changes });
    await this.writes.edit('closure', closure.id, changes);
  }

  /**
   * A closure made from a logger piece the crew assigned to a visit without a tap: it carries the
   * crew's chamber profile and analyzer like a tapped one, and that profile's settle time.
   */
  async createFromPiece(
    t: ClosureTarget,
    site: LocalRecord<'site'> | null,
    profiles: LocalRecord<'chamberProfile'>[],
    series: ClosureSeries,
    startedAt: string,
    endedAt: string | null,
    sourceAttachmentId: string | null,
  ): Promise<LocalRecord<'closure'>> {
    const profile = this.profileFor(t, site, profiles, startedAt);
    const fields = validated('closure', {
      siteId: t.siteId,
      visitId: t.visitId,
      collarId: t.collarId,
      campaignId: t.campaignId,
      analyzerId: t.analyzerId,
      profileId: profile?.id ?? null,
      startedAt,
      endedAt,
      // No chamber profile valid on the day: the typical settle time until the lab reviews it.
      settleS: profile?.settleS ?? TYPICAL_SETTLE_TIME_S,
      series,
      sourceAttachmentId,
    });
    return this.writes.create('closure', fields);
  }

  /** Keeps a logger file of a closure on the device (record and bytes in one transaction). */
  keepFile(siteId: string, ownerId: string, file: Blob, fileName: string): Promise<string> {
    return this.writes.keepFile({ siteId, ownerEntity: 'closure', ownerId }, { blob: file, fileName, mediaType: textMediaType(fileName) });
  }
}
