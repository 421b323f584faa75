import type { EntityManager } from 'typeorm';

export interface ChangeEntry {
  entity: string;
  recordId: string;
  rev: number;
  siteId: string;
  fields: string[];
  deleted: boolean;
  userId: string | null;
  deviceId: string | null;
}

/** Arbitrary constant naming the advisory lock that orders the change sequence. */
const CHANGE_SEQ_LOCK = 72_011;

/**
 * Collects the change-log rows of one transaction and writes them at its end. The advisory
 * lock is held until commit, so sequence numbers are handed out in commit order: a pull that
 * read up to seq n can never later miss a row with a smaller seq (failure mode 3 in CONVENTIONS).
 * Taking the lock only at the end keeps the serialised part of a large push short.
 */
export class ChangeBuffer {
  private entries: ChangeEntry[] = [];

  add(entry: ChangeEntry): void {
    this.entries.push(entry);
  }

  /** Marks the current length so a rolled-back savepoint can drop its entries. */
  mark(): number {
    return this.entries.length;
  }

  rollbackTo(mark: number): void {
    this.entries.length = mark;
  }

  get size(): number {
    return this.entries.length;
  }

  async flush(em: EntityManager): Promise<void> {
    if (!this.entries.length) return;
    await em.query('SELECT pg_advisory_xact_lock($1)', [CHANGE_SEQ_LOCK]);
    const rows = this.entries;
    this.entries = [];
    await em.query(
      `INSERT INTO change_log (seq, entity, record_id, rev, site_id, fields, deleted, user_id, device_id)
       SELECT nextval('change_seq'), e, r, v, s, string_to_array(f, ','), d, u, dv
         FROM unnest($1::text[], $2::uuid[], $3::bigint[], $4::uuid[], $5::text[], $6::boolean[], $7::uuid[], $8::uuid[])
           WITH ORDINALITY AS t(e, r, v, s, f, d, u, dv, ord)
        ORDER BY ord`,
      [
        rows.map((x) => x.entity),
        rows.map((x) => x.recordId),
        rows.map((x) => x.rev),
        rows.map((x) => x.siteId),
        rows.map((x) => x.fields.join(',')),
        rows.map((x) => x.deleted),
        rows.map((x) => x.userId),
        rows.map((x) => x.deviceId),
      ],
    );
  }
}
