import type { Request } from 'express';
import type { DataSource } from 'typeorm';
import { AppError, notFound } from '../core/errors';
import { campaignProgress } from '../campaigns/campaign-progress';
import { writeOne } from '../records/record-routes';
import type { WriteOutcome } from '../records/record-writer';

/** Collars that keep a campaign from being closed: anything not complete and not skipped with a reason. */
export async function openCollars(ds: DataSource, req: Request, campaignId: string): Promise<{ code: string; state: string }[]> {
  const progress = await campaignProgress(ds, req.user!, campaignId, null);
  return progress.collars.filter((c) => c.state !== 'complete' && c.state !== 'skipped').map((c) => ({ code: c.code, state: c.state }));
}

/**
 * Locks (closes) a campaign through the one write path, only when every collar is complete or
 * skipped with a reason, so a closed campaign never hides work still due. Unlocking has no
 * precondition. Once locked, the writer refuses new field records (REST 423, sync `rejected`).
 */
export async function setCampaignLock(ds: DataSource, req: Request, campaignId: string, locked: boolean): Promise<WriteOutcome> {
  const [camp] = await ds.query(`SELECT rev, locked FROM campaign WHERE id = $1 AND NOT deleted`, [campaignId]);
  if (!camp) throw notFound('No such campaign');
  if (locked) {
    const open = await openCollars(ds, req, campaignId);
    if (open.length) {
      const sample = open.slice(0, 5).map((c) => `${c.code} (${c.state})`).join(', ');
      throw new AppError(409, `${open.length} collar(s) are still due or partial: ${sample}${open.length > 5 ? ', …' : ''}. Finish them or record a skip with its reason first.`);
    }
  }
  return writeOne(ds, req, { entity: 'campaign', id: campaignId, baseRev: Number(camp.rev), op: 'upsert', fields: { locked } });
}
