import type { EntityManager, QueryRunner } from 'typeorm';
import { dollarQuoted } from '../core/sql-literal';

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
    await em.query(INSERT_SQL, this.take());
  }

  /**
   * Writes the entries and commits the query runner's open transaction in one message: the lock, the
   * INSERT and the COMMIT as one multi-statement text (values in one dollar-quoted JSON constant, which
   * needs no escaping pass over it), so
   * PostgreSQL runs them back to back and the lock that orders every writer is held for PostgreSQL's
   * own work only, never while this process's event loop serves other requests (flush() then the
   * COMMIT held it across three round trips through it). The transaction has ended when this returns
   * or throws; the caller must not commit or roll it back again.
   */
  async commit(qr: QueryRunner): Promise<void> {
    if (!this.entries.length) return qr.commitTransaction();
    const client = (await qr.connect()) as PgClient;
    const rows = this.entries.map((x, i) => ({
      e: x.entity,
      r: x.recordId,
      v: x.rev,
      s: x.siteId,
      f: x.fields,
      d: x.deleted,
      u: x.userId,
      dv: x.deviceId,
      i,
    }));
    this.entries = [];
    try {
      await client.query(
        `SELECT pg_advisory_xact_lock(${CHANGE_SEQ_LOCK});
         INSERT INTO change_log (seq, entity, record_id, rev, site_id, fields, deleted, user_id, device_id)
         SELECT nextval('change_seq'), e, r, v, s, f, d, u, dv
           FROM json_to_recordset(${dollarQuoted(JSON.stringify(rows))}::json)
             AS t(e text, r uuid, v bigint, s uuid, f text[], d boolean, u uuid, dv uuid, i int)
          ORDER BY i;
         COMMIT`,
      );
    } catch (err) {
      // A failed statement skips the rest of the text: the transaction is still open, aborted.
      await qr.rollbackTransaction().catch(() => undefined);
      throw err;
    }
    // TypeORM's bookkeeping: the COMMIT above ended the transaction it opened.
    Object.assign(qr, { isTransactionActive: false, transactionDepth: 0 });
  }

  private take(): unknown[] {
    const rows = this.entries;
    this.entries = [];
    return [
      rows.map((x) => x.entity),
      rows.map((x) => x.recordId),
      rows.map((x) => x.rev),
      rows.map((x) => x.siteId),
      rows.map((x) => x.fields.join(',')),
      rows.map((x) => x.deleted),
      rows.map((x) => x.userId),
      rows.map((x) => x.deviceId),
    ];
  }
}

/** The node-postgres connection TypeORM's PostgreSQL query runner holds. */
interface PgClient {
  query(sql: string): Promise<unknown>;
}

const INSERT_SQL = `INSERT INTO change_log (seq, entity, record_id, rev, site_id, fields, deleted, user_id, device_id)
       SELECT nextval('change_seq'), e, r, v, s, string_to_array(f, ','), d, u, dv
         FROM unnest($1::text[], $2::uuid[], $3::bigint[], $4::uuid[], $5::text[], $6::boolean[], $7::uuid[], $8::uuid[])
           WITH ORDINALITY AS t(e, r, v, s, f, d, u, dv, ord)
        ORDER BY ord`;
