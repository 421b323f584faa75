import type { PendingWrite } from '../records/write-guards';
import { rejected, type WriteOutcome } from '../records/write-outcome';

/**
 * A collar's own treatment must be one applied to single collars (e.g. trenched vs untrenched):
 * a whole-plot treatment comes from the collar's plot, and setting it on a collar as well would
 * count the collar twice in the design. Checked whenever a write sets the collar's treatment.
 */
export async function guardCollarTreatment(w: PendingWrite<'collar'>): Promise<WriteOutcome | null> {
  const treatmentId = w.next.treatmentId;
  if (w.action === 'delete' || !w.changed.includes('treatmentId') || !treatmentId) return null;
  const [t]: { code: string; level: string }[] = await w.em.query(`SELECT code, level FROM treatment WHERE id = $1`, [treatmentId]);
  if (!t || t.level === 'collar') return null; // a missing treatment is the reference check's to report
  return rejected(400, 'Some fields are not valid', [
    {
      path: 'treatmentId',
      message: `Treatment ${t.code} is applied to whole plots; a collar takes only a treatment applied to single collars`,
    },
  ]);
}
