import { Injectable, inject } from '@angular/core';
import { AuthStore } from '../../core/auth/auth-store';
import type { LocalRecord } from '../../core/db/db-schema';
import { validated } from '../../core/db/validated';
import { LocalWrites } from '../../core/sync/local-writes';

export interface VisitTarget {
  siteId: string;
  campaignId: string;
  round: number;
  collarId: string;
}

export type VisitConditions = {
  rainNow: boolean; rain24h: boolean; standingWater: boolean; frostSnow: boolean; trampled: boolean; animal: boolean; other: string;
  /** °C at the collar; null when not read. */
  airTempC?: number | null;
};

/**
 * Everything a visit writes, through the one local write path (record + outbox op in one Dexie
 * transaction). The visit record is made on the first save at a collar, so nothing is lost when
 * the crew saves conditions, offsets and probes in any order.
 */
@Injectable({ providedIn: 'root' })
export class VisitWrites {
  private readonly writes = inject(LocalWrites);
  private readonly auth = inject(AuthStore);
  private readonly creating = new Map<string, Promise<LocalRecord>>();

  /** The visit at this collar in this round: the existing one, or a new one (made once even on a double tap). */
  async ensureVisit(target: VisitTarget, existing: LocalRecord | null, extra: Record<string, unknown> = {}): Promise<LocalRecord> {
    if (existing) return existing;
    const key = `${target.campaignId}:${target.round}:${target.collarId}`;
    let pending = this.creating.get(key);
    if (!pending) {
      const fields = validated('visit', { ...target, crewId: this.auth.user()?.id ?? null, arrivedAt: new Date().toISOString(), ...extra });
      pending = this.writes.create('visit', fields);
      this.creating.set(key, pending);
      pending.finally(() => setTimeout(() => this.creating.delete(key), 2000)).catch(() => undefined);
    }
    return pending;
  }

  async saveConditions(target: VisitTarget, visit: LocalRecord | null, conditions: VisitConditions): Promise<void> {
    if (!visit) {
      await this.ensureVisit(target, null, { conditions });
      return;
    }
    validated('visit', { ...target, arrivedAt: visit['arrivedAt'], conditions });
    await this.writes.edit('visit', visit.id, { conditions });
  }

  /** A new offset set; a second set at the same visit is a correction that supersedes the first (both are kept). */
  async saveOffsetSet(target: VisitTarget, visit: LocalRecord | null, readingsCm: number[], previousAtVisit: LocalRecord | null): Promise<LocalRecord> {
    const v = await this.ensureVisit(target, visit);
    const fields = validated('offsetSet', {
      siteId: target.siteId, visitId: v.id, collarId: target.collarId, campaignId: target.campaignId,
      takenAt: new Date().toISOString(), readingsCm, supersedesId: previousAtVisit?.id ?? null,
    });
    return this.writes.create('offsetSet', fields);
  }

  async saveProbe(target: VisitTarget, visit: LocalRecord | null, reading: Record<string, unknown>, existing: LocalRecord | null): Promise<void> {
    const v = await this.ensureVisit(target, visit);
    const fields = validated('probeReading', {
      siteId: target.siteId, visitId: v.id, collarId: target.collarId, campaignId: target.campaignId,
      takenAt: new Date().toISOString(), ...reading,
    });
    if (existing) await this.writes.edit('probeReading', existing.id, fields);
    else await this.writes.create('probeReading', fields);
  }

  async skip(target: VisitTarget, visit: LocalRecord | null, reason: string): Promise<void> {
    const changes = { skipped: true, skipReason: reason.trim() };
    if (!visit) {
      await this.ensureVisit(target, null, changes);
      return;
    }
    validated('visit', { ...target, arrivedAt: visit['arrivedAt'], ...changes });
    await this.writes.edit('visit', visit.id, changes);
  }

  async unskip(visit: LocalRecord): Promise<void> {
    await this.writes.edit('visit', visit.id, { skipped: false, skipReason: null });
  }
}
