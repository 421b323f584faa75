import { Signal } from '@angular/core';
import type { LocalRecord } from '../../core/db/db-schema';
import { liveSignal } from '../../core/db/live-query-signal';

export interface CollarView {
  collar: LocalRecord<'collar'>;
  plotCode: string | null;
  treatment: string | null;
  lastVisit: string | null;
  pending: boolean;
}

/**
 * The collar page's data, live from the device store (so it is the same offline): the collar,
 * its plot and treatment, the latest visit, and whether an edit is still waiting to be synced.
 * Call in an injection context. `undefined` while loading, `null` when the collar is not here.
 */
export function collarView(id: () => string): Signal<CollarView | null | undefined> {
  return liveSignal(
    id,
    async (db, collarId) => {
      const collar = await db.records('collar').get(collarId);
      if (!collar) return null;
      const plot = await db.records('plot').get(collar.plotId);
      // A collar-level treatment wins over its plot's.
      const treatmentId = collar.treatmentId ?? plot?.treatmentId ?? null;
      const treatment = treatmentId ? await db.records('treatment').get(treatmentId) : undefined;
      const visits = await db.records('visit').where('collarId').equals(collarId).toArray();
      const last =
        visits
          .filter((v) => !v.skipped)
          .map((v) => v.arrivedAt)
          .sort()
          .at(-1) ?? null;
      const pending = (await db.outbox.where('[entity+id]').equals(['collar', collarId]).count()) > 0;
      return {
        collar,
        plotCode: plot?.code ?? null,
        treatment: treatment ? [treatment.code, treatment.name].filter(Boolean).join(' · ') : null,
        lastVisit: last,
        pending,
      };
    },
    undefined as CollarView | null | undefined,
  );
}

export interface CollarRow {
  id: string;
  code: string;
  status: LocalRecord<'collar'>['status'];
  notes: string;
}

/** Collars of a site by code, live from the device store. */
export function collarList(siteId: () => string | null): Signal<CollarRow[] | undefined> {
  return liveSignal(
    siteId,
    async (db, site) => {
      const all = site ? await db.records('collar').where('siteId').equals(site).toArray() : await db.records('collar').toArray();
      return all
        .map((c) => ({ id: c.id, code: c.code, status: c.status, notes: c.notes }))
        .sort((a, b) => a.code.localeCompare(b.code, undefined, { numeric: true }));
    },
    undefined as CollarRow[] | undefined,
  );
}
