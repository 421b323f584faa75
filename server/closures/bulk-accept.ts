import type { DataSource } from 'typeorm';
import type { SessionUser } from '../../shared/auth/roles';
import { AppError } from '../core/errors';
import { ChangeBuffer } from '../records/change-buffer';
import { writeRecord } from '../records/record-writer';
import type { QueueFilter } from '../../shared/bench/review-wire';
import { queueIds } from './review-queue';

/** More than this in one request is refused: accept a season in a few filtered steps, each a readable amount. */
export const BULK_ACCEPT_CAP = 2000;

/**
 * Accepts every unreviewed closure without any flag that the filter selects, each through the
 * one write path (so each gets its history row and change-log entry), all in one transaction.
 * A flagged or already reviewed closure is never touched, whatever the filter says.
 */
export async function bulkAccept(ds: DataSource, user: SessionUser, filter: QueueFilter) {
  const targets = await queueIds(ds, user, { ...filter, flag: 'none', reviewState: 'unreviewed' }, BULK_ACCEPT_CAP + 1);
  if (targets.length > BULK_ACCEPT_CAP) {
    throw new AppError(
      400,
      `This filter selects more than ${BULK_ACCEPT_CAP} closures; narrow it (a campaign, a round) and accept in steps`,
    );
  }
  return ds.transaction(async (em) => {
    const changes = new ChangeBuffer();
    let accepted = 0;
    const skipped: { id: string; reason: string }[] = [];
    for (const t of targets) {
      const out = await writeRecord(
        em,
        user,
        { entity: 'closure', id: t.id, baseRev: t.rev, op: 'upsert', fields: { reviewState: 'accepted' } },
        changes,
      );
      if (out.status === 'applied' || out.status === 'merged') accepted++;
      else skipped.push({ id: t.id, reason: out.error?.message ?? out.status });
    }
    await changes.flush(em);
    return { accepted, skipped };
  });
}
