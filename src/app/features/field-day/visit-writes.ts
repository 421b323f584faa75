import { Injectable, inject } from '@angular/core';
import { AuthStore } from '../../core/auth/auth-store';
import type { LocalRecord } from '../../core/db/db-schema';
import type { EntityFields } from '../../../../shared/model/entities';
import { RecordMissingError } from '../../core/db/outbox-writer';
import { validated } from '../../core/db/validated';
import { LocalWrites } from '../../core/sync/local-writes';

export interface VisitTarget {
  siteId: string;
  campaignId: string;
  round: number;
  collarId: string;
}

/** What the crew notes at a collar (the visit schema's conditions; airTempC °C, null when not read). */
export type VisitConditions = EntityFields<'visit'>['conditions'];

/** The values of one probe replicate the crew types (the probe reading schema's own fields). */
export type ProbeValues = Pick<EntityFields<'probeReading'>, 'soilTemps' | 'moistureRaw' | 'moistureKind' | 'rodLengthCm' | 'probeId'>;

/** A visit as most writes need it: its id (closures hand theirs over too). */
type VisitRef = { id: string };

/**
 * Everything a visit writes, through the one local write path (record + outbox op in one Dexie
 * transaction). The visit record is made on the first save at a collar, so nothing is lost when
 * the crew saves conditions, offsets and probes in any order.
 */
@Injectable({ providedIn: 'root' })
export class VisitWrites {
  private readonly writes = inject(LocalWrites);
  private readonly auth = inject(AuthStore);
  private readonly creating = new Map<string, Promise<VisitRef>>();
  private readonly probeSaves = new Map<string, Promise<void>>();

  /** The visit at this collar in this round: the existing one, or a new one (made once even on a double tap). */
  async ensureVisit(target: VisitTarget, existing: VisitRef | null, extra: Partial<EntityFields<'visit'>> = {}): Promise<VisitRef> {
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

  async saveConditions(target: VisitTarget, visit: LocalRecord<'visit'> | null, conditions: VisitConditions): Promise<void> {
    if (!visit) {
      await this.ensureVisit(target, null, { conditions });
      return;
    }
    const checked = validated('visit', { ...target, arrivedAt: visit.arrivedAt, conditions });
    await this.writes.edit('visit', visit.id, { conditions: checked.conditions });
  }

  /** A new offset set; a second set at the same visit is a correction that supersedes the first (both are kept). */
  async saveOffsetSet(
    target: VisitTarget,
    visit: VisitRef | null,
    readingsCm: number[],
    previousAtVisit: { id: string } | null,
  ): Promise<void> {
    const v = await this.ensureVisit(target, visit);
    const fields = validated('offsetSet', {
      siteId: target.siteId,
      visitId: v.id,
      collarId: target.collarId,
      campaignId: target.campaignId,
      takenAt: new Date().toISOString(),
      readingsCm,
      supersedesId: previousAtVisit?.id ?? null,
    });
    await this.writes.create('offsetSet', fields);
  }

  /**
   * Saves one probe replicate under its id: the first save creates it (taken now, by the signed-in
   * user), later saves of the same id correct its values only. Another replicate is another id, so
   * saving one never overwrites another. Saves of one id run one after the other.
   */
  saveProbe(target: VisitTarget, visit: VisitRef | null, reading: ProbeValues, replicateId: string): Promise<void> {
    const previous = this.probeSaves.get(replicateId) ?? Promise.resolve();
    const next = previous
      .catch(() => undefined)
      .then(async () => {
        const v = await this.ensureVisit(target, visit);
        const fields = validated('probeReading', {
          siteId: target.siteId,
          visitId: v.id,
          collarId: target.collarId,
          campaignId: target.campaignId,
          takenAt: new Date().toISOString(),
          takenById: this.auth.user()?.id ?? null,
          ...reading,
        });
        const { takenAt: _at, takenById: _by, ...values } = fields;
        try {
          await this.writes.edit('probeReading', replicateId, values);
        } catch (err) {
          if (!(err instanceof RecordMissingError)) throw err;
          await this.writes.create('probeReading', fields, { id: replicateId });
        }
      });
    this.probeSaves.set(replicateId, next);
    next
      .finally(() => {
        if (this.probeSaves.get(replicateId) === next) this.probeSaves.delete(replicateId);
      })
      .catch(() => undefined);
    return next;
  }

  /** A wrong replicate goes: deleted here, a tombstone on the server after the next sync. */
  async deleteProbe(replicateId: string): Promise<void> {
    await this.probeSaves.get(replicateId)?.catch(() => undefined);
    await this.writes.remove('probeReading', replicateId);
  }

  async skip(target: VisitTarget, visit: LocalRecord<'visit'> | null, reason: string): Promise<void> {
    const changes = { skipped: true, skipReason: reason.trim() };
    if (!visit) {
      await this.ensureVisit(target, null, changes);
      return;
    }
    validated('visit', { ...target, arrivedAt: visit.arrivedAt, ...changes });
    await this.writes.edit('visit', visit.id, changes);
  }

  async unskip(visit: VisitRef): Promise<void> {
    await this.writes.edit('visit', visit.id, { skipped: false, skipReason: null });
  }
}
