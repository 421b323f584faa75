import { Injectable, inject } from '@angular/core';
import { pieceSeries, type LoggerMapping, type LoggerPiece, type PieceMatch } from '../../../../shared/logger';
import type { LocalRecord } from '../../core/db/db-schema';
import { DeviceDb } from '../../core/db/device-db';
import { ClosureWrites } from './closure-writes';
import type { Assignment, RoundVisit } from './import-plan';

export interface ImportTarget {
  siteId: string;
  campaignId: string;
  analyzerId: string | null;
  profileId: string | null;
}

/** What one import asks to write: the file, how it was read, and where each piece goes. */
export interface ImportBatch {
  file: Blob;
  fileName: string;
  mapping: LoggerMapping | null;
  pieces: readonly LoggerPiece[];
  matches: readonly PieceMatch[];
  assignments: Record<string, Assignment>;
  visits: readonly RoundVisit[];
  offsetS: number;
}

/**
 * Writes the assigned pieces as closure series through the local writes (Dexie + outbox). The
 * file is kept once, as one attachment, and every closure filled from it names it
 * (sourceAttachmentId); pieces left out stay in that file only.
 */
@Injectable({ providedIn: 'root' })
export class ImportWriter {
  private readonly deviceDb = inject(DeviceDb);
  private readonly writes = inject(ClosureWrites);

  async write(t: ImportTarget, b: ImportBatch): Promise<{ filled: number; left: number }> {
    const a = b.assignments;
    const byId = new Map(b.visits.flatMap((v) => v.waiting.map((c) => [c.id, c] as const)));
    const visitById = new Map(b.visits.map((v) => [v.visit.id, v.visit]));
    const chosen = b.pieces.filter((p) => a[p.key] && a[p.key].kind !== 'none');
    const shift = b.offsetS * 1000;
    const times = (p: LoggerPiece) => {
      const m = b.matches.find((x) => x.pieceKey === p.key);
      const x = a[p.key];
      const tap = x.kind === 'closure' ? byId.get(x.closureId) : null;
      // Elapsed-time files carry no clock: the tap's time stands in for the start.
      const start = p.startMs !== null ? p.startMs - shift : Date.parse(tap?.chamberOnAt ?? new Date().toISOString());
      const series = pieceSeries(p, b.mapping);
      const end = m?.correctedEndMs ?? start + 1000 * (series.tS[series.tS.length - 1] ?? 0);
      return { series, startedAt: new Date(start).toISOString(), endedAt: new Date(end).toISOString() };
    };
    // Tapped closures exist already, so one of them can own the file before any new closure is made.
    const targets = new Map<string, string>();
    for (const p of chosen) {
      const x = a[p.key];
      if (x.kind === 'closure') targets.set(p.key, x.closureId);
    }
    const pending = chosen.flatMap((p) => {
      const x = a[p.key];
      return x.kind === 'new' ? [{ piece: p, visitId: x.visitId }] : [];
    });
    const owner = [...targets.values()][0];
    let attachmentId: string | null = owner ? await this.writes.keepFile(t.siteId, owner, b.file, b.fileName) : null;
    const [siteRec, profiles]: [LocalRecord<'site'> | undefined, LocalRecord<'chamberProfile'>[]] = pending.length
      ? await this.deviceDb.run((db) =>
          Promise.all([
            db.records('site').get(t.siteId),
            db
              .records('chamberProfile')
              .where('siteId')
              .equals(t.siteId)
              .filter((p) => !p.deleted)
              .toArray(),
          ]),
        )
      : [undefined, []];
    for (const n of pending) {
      const v = visitById.get(n.visitId)!;
      const s = times(n.piece);
      const target = { ...t, collarId: v.collarId, visitId: v.id };
      const rec = await this.writes.createFromPiece(target, siteRec ?? null, profiles, s.series, s.startedAt, s.endedAt, attachmentId);
      if (!attachmentId) {
        // No tapped closure to own the file: the first new closure owns it and then names it.
        attachmentId = await this.writes.keepFile(t.siteId, rec.id, b.file, b.fileName);
        await this.writes.saveSeries(rec, s.series, s.startedAt, s.endedAt, attachmentId);
      }
    }
    for (const p of chosen) {
      const closureId = targets.get(p.key);
      if (!closureId) continue;
      const s = times(p);
      await this.writes.saveSeries(byId.get(closureId)!, s.series, s.startedAt, s.endedAt, attachmentId);
    }
    return { filled: chosen.length, left: b.pieces.length - chosen.length };
  }
}
