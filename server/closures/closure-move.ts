import type { DataSource } from 'typeorm';
import { z } from 'zod';
import type { SessionUser } from '../../shared/auth/roles';
import { AppError, notFound } from '../core/errors';
import { ChangeBuffer } from '../records/change-buffer';
import { writeRecord, type WriteOutcome } from '../records/record-writer';
import { ClosureEntity } from './closure.entity';

/** Bench request: the visit (collar and round) of the same campaign the closure belongs to. */
export const moveClosureSchema = z.object({
  visitId: z.string({ message: 'Name the visit to move the closure to' }).uuid('Visit ids are UUIDs'),
});

/**
 * Moves a closure to another visit of its campaign (a crew tapped the wrong collar): the closure
 * takes the target visit and its collar through the one write path with the `move` option (the
 * only write that may change these fixed fields), so the locked-campaign check, the parent
 * agreement, the flux recomputed with the target collar's area and offsets, the change log and a
 * `move` history row come as with any other write. Refused across sites and campaigns.
 */
export async function moveClosure(ds: DataSource, user: SessionUser, id: string, visitId: string): Promise<WriteOutcome> {
  return ds.transaction(async (em) => {
    const c = await em
      .getRepository(ClosureEntity)
      .createQueryBuilder('c')
      .setLock('pessimistic_write')
      .where('c.id = :id', { id })
      .getOne();
    if (!c || c.deleted) throw notFound(`No closure ${id}`);
    const [v]: { site_id: string; campaign_id: string; collar_id: string; deleted: boolean }[] = await em.query(
      `SELECT site_id, campaign_id, collar_id, deleted FROM visit WHERE id = $1`,
      [visitId],
    );
    const field = (message: string) => [{ path: 'visitId', message }];
    if (!v || v.deleted) throw new AppError(404, `No visit ${visitId}`, field('No such visit'));
    if (v.site_id !== c.siteId)
      throw new AppError(400, 'That visit is at another site: a closure moves only within its site', field('Another site'));
    if (v.campaign_id !== c.campaignId)
      throw new AppError(400, 'A closure moves only to a visit of the same campaign', field('Another campaign'));
    if (visitId === c.visitId) throw new AppError(400, 'The closure already belongs to that visit', field('The same visit'));
    const [redo] = await em.query(`SELECT id FROM closure WHERE redo_of_id = $1 AND NOT deleted LIMIT 1`, [id]);
    if (c.redoOfId || redo) {
      throw new AppError(409, 'This closure and its redo belong to one visit: a closure in a redo pair cannot be moved alone');
    }
    const changes = new ChangeBuffer();
    const outcome = await writeRecord(
      em,
      user,
      { entity: 'closure', id, baseRev: Number(c.rev), op: 'upsert', fields: { visitId, collarId: v.collar_id } },
      changes,
      { move: true },
    );
    if (outcome.status === 'applied' || outcome.status === 'merged') await changes.flush(em);
    return outcome;
  });
}
