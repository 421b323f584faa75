import { randomUUID } from 'node:crypto';
import type { DataSource, EntityManager } from 'typeorm';
import { In } from 'typeorm';
import { z } from 'zod';
import type { EntityFields } from '../../shared/model/entities';
import { chamberProfileFields } from '../../shared/model/site-layout';
import { ClosureEntity } from '../closures/closure.entity';
import { computeClosureResults } from '../closures/closure-results';
import { AppError } from '../core/errors';
import { ChangeBuffer, writeRecord, type Actor } from '../records/record-writer';
import { sameValue, toWire } from '../records/wire';
import type { PendingWrite } from '../records/write-guards';
import { rejected, type WriteOutcome } from '../records/write-outcome';
import { siteForActor } from './site-access';

/** A new version names its day and the geometry that changed; the rest is copied from the version it follows. */
export const newVersionSchema = chamberProfileFields
  .pick({
    validFrom: true,
    chamberVolumeCm3: true,
    loopVolumeCm3: true,
    settleS: true,
    closureLengthS: true,
    footprintAreaCm2: true,
  })
  .partial()
  .required({ validFrom: true })
  .strict();
export const previewSchema = z.object({ validFrom: chamberProfileFields.shape.validFrom });

/** Editing these on a profile that closures use would silently change stored fluxes. */
const GEOMETRY = ['validFrom', 'chamberVolumeCm3', 'loopVolumeCm3', 'footprintAreaCm2'];

type Db = DataSource | EntityManager;

/** A stored chamber profile version as loadProfile selects it (rev is bigint: text from the driver). */
type ProfileRow = EntityFields<'chamberProfile'> & { id: string; rev: string };

async function loadProfile(db: Db, id: string): Promise<ProfileRow> {
  const [p]: ProfileRow[] = await db.query(
    `SELECT id, site_id AS "siteId", name, to_char(valid_from, 'YYYY-MM-DD') AS "validFrom", chamber_volume_cm3 AS "chamberVolumeCm3",
            loop_volume_cm3 AS "loopVolumeCm3", settle_s AS "settleS", closure_length_s AS "closureLengthS",
            footprint_area_cm2 AS "footprintAreaCm2", rev FROM chamber_profile WHERE id = $1 AND NOT deleted`,
    [id],
  );
  if (!p) throw new AppError(404, 'There is no such chamber profile');
  return p;
}

/** Closures whose stored flux was computed with this profile version. */
export async function closuresUsing(db: Db, profileId: string): Promise<number> {
  const [r]: { n: number }[] = await db.query(
    `SELECT count(*)::int AS n FROM closure WHERE NOT deleted AND (profile_id = $1 OR results->>'profileId' = $1::text)`,
    [profileId],
  );
  return r.n;
}

export async function profileUsage(ds: DataSource, actor: Actor, profileId: string) {
  const p = await loadProfile(ds, profileId);
  await siteForActor(ds, actor, p.siteId);
  return { profileId, closures: await closuresUsing(ds, profileId) };
}

/**
 * A version valid from D is used for closures whose local day is on or after D and before the
 * next later version (chamber-volume.ts picks the latest validFrom ≤ day). Closures of locked
 * campaigns keep their stored flux and are counted apart.
 */
async function affectedClosures(db: Db, siteId: string, validFrom: string) {
  const rows: { id: string; locked: boolean }[] = await db.query(
    `WITH nxt AS (SELECT min(valid_from) AS d FROM chamber_profile WHERE site_id = $1 AND NOT deleted AND valid_from > $2::date)
     SELECT c.id, k.locked FROM closure c JOIN campaign k ON k.id = c.campaign_id JOIN site s ON s.id = c.site_id, nxt
      WHERE c.site_id = $1 AND NOT c.deleted
        AND (c.started_at AT TIME ZONE s.timezone)::date >= $2::date
        AND (nxt.d IS NULL OR (c.started_at AT TIME ZONE s.timezone)::date < nxt.d)`,
    [siteId, validFrom],
  );
  const until: { d: string | null }[] = await db.query(
    `SELECT to_char(min(valid_from), 'YYYY-MM-DD') AS d FROM chamber_profile WHERE site_id = $1 AND NOT deleted AND valid_from > $2::date`,
    [siteId, validFrom],
  );
  return {
    recompute: rows.filter((r) => !r.locked).map((r) => r.id),
    lockedKept: rows.filter((r) => r.locked).length,
    until: until[0]?.d ?? null,
  };
}

export async function recomputePreview(ds: DataSource, actor: Actor, siteId: string, validFrom: string) {
  await siteForActor(ds, actor, siteId);
  const a = await affectedClosures(ds, siteId, validFrom);
  return { validFrom, until: a.until, closures: a.recompute.length, lockedKept: a.lockedKept };
}

/** Two versions of one chamber cannot start on the same day; two chambers of a site may (several systems run at once). */
async function refuseSameDay(db: Db, siteId: string, name: string, validFrom: string, exceptId: string | null) {
  const [dup]: { name: string }[] = await db.query(
    `SELECT name FROM chamber_profile WHERE site_id = $1 AND name = $4 AND NOT deleted AND valid_from = $2::date AND ($3::uuid IS NULL OR id <> $3)`,
    [siteId, validFrom, exceptId, name],
  );
  if (dup)
    throw new AppError(409, `A chamber profile version valid from ${validFrom} exists already (${dup.name}); pick another day`, [
      { path: 'validFrom', message: 'Another version starts on this day' },
    ]);
}

/** Re-derives the flux of closures after their profile version changed, with a change-log entry each. */
async function recomputeClosures(em: EntityManager, actor: Actor, ids: string[], changes: ChangeBuffer): Promise<number> {
  if (!ids.length) return 0;
  const repo = em.getRepository(ClosureEntity);
  const rows = await repo.find({ where: { id: In(ids) }, lock: { mode: 'pessimistic_write' } });
  for (const row of rows) {
    const current = toWire(row);
    const derived = await computeClosureResults(em, current);
    const changed = Object.keys(derived).filter((k) => !sameValue(derived[k], current[k]));
    if (!changed.length) continue;
    const rev = row.rev + 1;
    await repo.update({ id: row.id }, { ...derived, rev, updatedAt: new Date(), updatedBy: actor.id } as never);
    changes.add({
      entity: 'closure',
      recordId: row.id,
      rev,
      siteId: row.siteId,
      fields: changed,
      deleted: false,
      userId: actor.id,
      deviceId: null,
    });
  }
  return rows.length;
}

/** Adds a version after `profileId` and recomputes the closures that now fall under it, in one transaction. */
export async function createProfileVersion(ds: DataSource, actor: Actor, profileId: string, body: z.infer<typeof newVersionSchema>) {
  return ds.transaction(async (em) => {
    const base = await loadProfile(em, profileId);
    const siteId = base.siteId;
    await siteForActor(em, actor, siteId);
    await em.query(`SELECT id FROM site WHERE id = $1 FOR UPDATE`, [siteId]);
    await refuseSameDay(em, siteId, base.name, body.validFrom, null);
    const { id: _id, rev: _rev, ...copy } = base;
    const changes = new ChangeBuffer();
    const id = randomUUID();
    const out = await writeRecord(
      em,
      actor,
      { entity: 'chamberProfile', id, baseRev: null, op: 'upsert', fields: { ...copy, ...body } },
      changes,
    );
    if (out.status !== 'applied')
      throw new AppError(out.httpStatus ?? 400, out.error?.message ?? 'The version was not saved', out.error?.fields);
    const a = await affectedClosures(em, siteId, body.validFrom);
    const recomputed = await recomputeClosures(em, actor, a.recompute, changes);
    await changes.flush(em);
    return { record: out.record, recomputed, lockedKept: a.lockedKept };
  });
}

/**
 * A write guard for chamber profiles (every write path: REST, sync, seed): once closures use a
 * version, its geometry and day are fixed — a new version is added instead; a name or a default
 * settle time for future closures may still change.
 */
export async function guardProfileWrite(w: PendingWrite<'chamberProfile'>): Promise<WriteOutcome | null> {
  if (w.action === 'create') return null; // a new version is what this rule asks for
  const touched = w.action === 'delete' ? ['deleted'] : GEOMETRY.filter((k) => w.changed.includes(k));
  if (!touched.length) return null;
  try {
    if (w.action === 'update' && w.changed.includes('validFrom')) {
      await refuseSameDay(w.em, w.next.siteId, w.next.name, w.next.validFrom, w.id);
    }
  } catch (err) {
    if (err instanceof AppError) return rejected(err.status, err.message, err.fields);
    throw err;
  }
  const n = await closuresUsing(w.em, w.id);
  if (n === 0) return null;
  return rejected(
    409,
    `${n} closure${n === 1 ? ' uses' : 's use'} this chamber profile; add a new version valid from a date instead of ` +
      (w.action === 'delete' ? 'deleting it' : 'editing it'),
    touched.filter((k) => k !== 'deleted').map((path) => ({ path, message: 'Fixed once closures use this version' })),
  );
}
