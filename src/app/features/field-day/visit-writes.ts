import { Injectable, inject } from '@angular/core';
import { AuthStore } from '../../core/auth/auth-store';
import type { LocalRecord } from '../../core/db/db-schema';
import type { EntityFields } from '../../../../shared/model/entities';
import { DeviceDb } from '../../core/db/device-db';
import { RecordMissingError } from '../../core/db/outbox-writer';
import { sameValue } from '../../core/db/record-values';
import { validated } from '../../core/db/validated';
import { Turns } from '../../core/async/turns';
import { LocalWrites } from '../../core/sync/local-writes';
import { offsetSetAtVisit, visitInRound } from './visit-at-collar';

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

/** The one visit of a collar in a round, as a key. */
const visitKey = (t: VisitTarget) => `${t.campaignId}:${t.round}:${t.collarId}`;

/** Where and when a reading is taken: at this visit (its collar and campaign, as the server checks), now. */
const takenNowAt = (t: VisitTarget, visit: VisitRef) => ({
  siteId: t.siteId,
  visitId: visit.id,
  collarId: t.collarId,
  campaignId: t.campaignId,
  takenAt: new Date().toISOString(),
});

/**
 * Everything a visit writes, through the one local write path (record + outbox op in one Dexie
 * transaction). The visit record is made on the first save at a collar, so nothing is lost when
 * the crew saves conditions, offsets and probes in any order. A write that first asks what the
 * device holds (is there a visit, which offset set counts) takes its turn per visit and asks
 * IndexedDB, not the screen's copy, which may be a save behind: a keypress and an autosave at
 * once then make one record, never two.
 */
@Injectable({ providedIn: 'root' })
export class VisitWrites {
  private readonly writes = inject(LocalWrites);
  private readonly deviceDb = inject(DeviceDb);
  private readonly auth = inject(AuthStore);
  private readonly turns = new Turns();

  /**
   * The visit at this collar in this round: the one given, else the one the device holds (taking
   * `extra` in), else a new one with `extra`.
   */
  async ensureVisit(target: VisitTarget, existing: VisitRef | null, extra: Partial<EntityFields<'visit'>> = {}): Promise<VisitRef> {
    if (existing) return existing;
    return this.turns.run(`visit:${visitKey(target)}`, async () => {
      const stored = await this.storedVisit(target);
      if (stored) {
        if (Object.keys(extra).length) {
          validated('visit', { ...target, arrivedAt: stored.arrivedAt, ...extra });
          await this.writes.edit('visit', stored.id, extra);
        }
        return stored;
      }
      const fields = validated('visit', { ...target, crewId: this.auth.user()?.id ?? null, arrivedAt: new Date().toISOString(), ...extra });
      return this.writes.create('visit', fields);
    });
  }

  private storedVisit(target: VisitTarget): Promise<LocalRecord<'visit'> | null> {
    return this.deviceDb.run(async (db) =>
      visitInRound(await db.records('visit').where('collarId').equals(target.collarId).toArray(), target.campaignId, target.round),
    );
  }

  async saveConditions(target: VisitTarget, visit: LocalRecord<'visit'> | null, conditions: VisitConditions): Promise<void> {
    if (!visit) {
      await this.ensureVisit(target, null, { conditions });
      return;
    }
    const checked = validated('visit', { ...target, arrivedAt: visit.arrivedAt, conditions });
    await this.writes.edit('visit', visit.id, { conditions: checked.conditions });
  }

  /**
   * An offset set at the visit. The set that counts there now (read from the device in this save's
   * turn) is superseded by the new one (both are kept); the same readings again change nothing.
   */
  saveOffsetSet(target: VisitTarget, visit: VisitRef | null, readingsCm: number[]): Promise<void> {
    return this.turns.run(`offsets:${visitKey(target)}`, async () => {
      const v = await this.ensureVisit(target, visit);
      const current = await this.deviceDb.run(async (db) =>
        offsetSetAtVisit(await db.records('offsetSet').where('visitId').equals(v.id).toArray(), v.id),
      );
      if (current && sameValue(current.readingsCm, readingsCm)) return;
      const fields = validated('offsetSet', {
        ...takenNowAt(target, v),
        readingsCm,
        supersedesId: current?.id ?? null,
      });
      await this.writes.create('offsetSet', fields);
    });
  }

  /**
   * Saves one probe replicate under its id: the first save creates it (taken now, by the signed-in
   * user), later saves of the same id correct its values only. Another replicate is another id, so
   * saving one never overwrites another. Saves of one id run one after the other.
   */
  saveProbe(target: VisitTarget, visit: VisitRef | null, reading: ProbeValues, replicateId: string): Promise<void> {
    return this.turns.run(`probe:${replicateId}`, async () => {
      const v = await this.ensureVisit(target, visit);
      const fields = validated('probeReading', {
        ...takenNowAt(target, v),
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
  }

  /** A wrong replicate goes: deleted here, a tombstone on the server after the next sync. */
  deleteProbe(replicateId: string): Promise<void> {
    return this.turns.run(`probe:${replicateId}`, async () => {
      await this.writes.remove('probeReading', replicateId);
    });
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
