import type { DataSource } from 'typeorm';
import type { SessionUser } from '../../shared/auth/roles';
import { exclusionProblems } from '../../shared/flux/point-exclusion';
import type { PointExclusion } from '../../shared/model/point-exclusion';
import { AppError, notFound } from '../core/errors';
import { ChangeBuffer } from '../records/change-buffer';
import { writeRecord, type WriteOutcome } from '../records/record-writer';
import { ClosureEntity } from './closure.entity';

type Exclude = { indices: number[]; reason: string };
type Restore = { indices: number[] };

/**
 * Leaves samples of a closure out of its fit, or puts excluded ones back: the new list of
 * exclusions goes through the one write path (role, locked campaign, the record's rule that a fit
 * stays possible, the flux and flags recomputed by the engine, a history row with who, when, the
 * points and the reason). The request is checked first so its errors name its own indices.
 */
export async function changeExclusions(
  ds: DataSource,
  user: SessionUser,
  id: string,
  change: { exclude: Exclude } | { restore: Restore },
): Promise<WriteOutcome> {
  return ds.transaction(async (em) => {
    const c = await em
      .getRepository(ClosureEntity)
      .createQueryBuilder('c')
      .setLock('pessimistic_write')
      .where('c.id = :id', { id })
      .getOne();
    if (!c || c.deleted) throw notFound(`No closure ${id}`);
    const current: PointExclusion[] = c.reviewExclusions ?? [];
    const next = 'exclude' in change ? excluded(c, current, change.exclude) : restored(current, change.restore);
    const changes = new ChangeBuffer();
    const outcome = await writeRecord(
      em,
      user,
      { entity: 'closure', id, baseRev: Number(c.rev), op: 'upsert', fields: { reviewExclusions: next } },
      changes,
    );
    if (outcome.status === 'applied' || outcome.status === 'merged') await changes.flush(em);
    return outcome;
  });
}

function excluded(c: ClosureEntity, current: PointExclusion[], req: Exclude): PointExclusion[] {
  const already = new Set(current.map((e) => e.index));
  const fields = req.indices.flatMap((i, k) =>
    already.has(i) ? [{ path: `indices.${k}`, message: `Point ${i} is already left out` }] : [],
  );
  if (fields.length) throw new AppError(400, 'Some of these points are already left out of the fit', fields);
  const series = c.series as {
    tS: (number | null)[];
    co2Ppm: (number | null)[];
    h2oMmolMol?: (number | null)[] | null;
    co2IsDry?: boolean;
  };
  const problems = exclusionProblems(series, c.reviewSettleS ?? c.settleS, c.reviewWindowEndS, [
    ...current.map((e) => e.index),
    ...req.indices,
  ]);
  if (problems.length) {
    throw new AppError(
      400,
      problems.length === 1 ? problems[0].message : 'These points cannot be left out',
      problems.map((p) => ({ path: p.index === null ? 'indices' : `indices.${p.index - current.length}`, message: p.message })),
    );
  }
  return [...current, ...req.indices.map((index) => ({ index, reason: req.reason }))].sort((a, b) => a.index - b.index);
}

function restored(current: PointExclusion[], req: Restore): PointExclusion[] {
  const left = new Set(current.map((e) => e.index));
  const fields = req.indices.flatMap((i, k) => (left.has(i) ? [] : [{ path: `indices.${k}`, message: `Point ${i} is not left out` }]));
  if (fields.length) throw new AppError(400, 'Only points left out of the fit can be put back', fields);
  const back = new Set(req.indices);
  return current.filter((e) => !back.has(e.index));
}
