import type { Request } from 'express';
import type { DataSource, EntityManager } from 'typeorm';
import { readsSite, type SessionUser } from '../../shared/auth/roles';
import { notFound } from '../core/errors';
import { campaignProgress } from '../campaigns/campaign-progress';
import { writeOne } from '../records/record-routes';
import type { WriteOutcome } from '../records/record-writer';
import type { PendingWrite } from '../records/write-guards';
import { noRecordMessage, rejected } from '../records/write-outcome';

// The lock rule reads the campaign as a role that sees every site: who may lock was decided by the writer.
const LOCK_CHECK: SessionUser = {
  id: '00000000-0000-0000-0000-000000000000',
  email: '',
  displayName: 'Campaign lock',
  roles: ['admin'],
  siteIds: [],
};

/** Collars that keep a campaign from being closed: anything not complete and not skipped with a reason. */
export async function openCollars(db: DataSource | EntityManager, campaignId: string): Promise<{ code: string; state: string }[]> {
  const progress = await campaignProgress(db, LOCK_CHECK, campaignId, null);
  return progress.collars.filter((c) => c.state !== 'complete' && c.state !== 'skipped').map((c) => ({ code: c.code, state: c.state }));
}

/**
 * The one home of the lock rule, a write guard on campaigns: a campaign is locked (closed) only when
 * every collar is complete or skipped with a reason, so a closed campaign never hides work still due,
 * whether the lock comes from the lock route, a PATCH of `locked` or a sync push. A campaign is
 * created open. Unlocking has no precondition. Once locked, the writer refuses new field records.
 */
export async function guardCampaignLock(w: PendingWrite<'campaign'>): Promise<WriteOutcome | null> {
  if (w.action === 'delete' || !w.changed.includes('locked') || w.next.locked !== true) return null;
  if (w.action === 'create')
    return rejected(400, 'A campaign is created open: lock it once its collars are done', [
      { path: 'locked', message: 'Create the campaign unlocked' },
    ]);
  const open = await openCollars(w.em, w.id);
  if (!open.length) return null;
  const sample = open
    .slice(0, 5)
    .map((c) => `${c.code} (${c.state})`)
    .join(', ');
  return rejected(
    409,
    `${open.length} collar(s) are still due or partial: ${sample}${open.length > 5 ? ', …' : ''}. Finish them or record a skip with its reason first.`,
  );
}

/**
 * Locks or unlocks a campaign through the one write path (the lock rule is its write guard). A
 * campaign the lead may not read is answered as a read would: 404, nothing of it.
 */
export async function setCampaignLock(ds: DataSource, req: Request, campaignId: string, locked: boolean): Promise<WriteOutcome> {
  const [camp] = await ds.query(`SELECT rev, site_id, deleted FROM campaign WHERE id = $1`, [campaignId]);
  if (!camp || camp.deleted || !readsSite(req.user!, camp.site_id)) throw notFound(noRecordMessage('campaign', campaignId));
  return writeOne(ds, req, { entity: 'campaign', id: campaignId, baseRev: Number(camp.rev), op: 'upsert', fields: { locked } });
}
