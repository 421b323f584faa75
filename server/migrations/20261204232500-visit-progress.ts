import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * What each live visit holds by the progress rule (shared/progress/visit-progress.ts): an offset
 * set, a probe reading (0/1) and its counted closures (live, with samples, not rejected, not redone
 * by a live closure), kept in visit_progress by statement triggers on visit, offset_set,
 * probe_reading and closure in the writing transaction. Campaign progress then reads one narrow row
 * per visit instead of aggregating every reading of the campaign on each ask.
 *
 * A trigger recounts the visits a statement touched rather than adding deltas (the redo and review
 * rules make deltas fragile). Two transactions writing at one visit would each count without the
 * other's rows, so the recount first locks the visits' rows (in id order) and counts in a statement
 * after the lock: under READ COMMITTED that statement sees what the other transaction committed.

 */
export class VisitProgress1796426700000 implements MigrationInterface {
  name = 'VisitProgress1796426700000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE visit_progress (
        visit_id uuid PRIMARY KEY,
        campaign_id uuid NOT NULL,
        collar_id uuid NOT NULL,
        round integer NOT NULL,
        skipped boolean NOT NULL,
        skip_reason text,
        arrived_at timestamptz NOT NULL,
        offsets smallint NOT NULL,
        probes smallint NOT NULL,
        closures smallint NOT NULL
      )`);
    await q.query(`CREATE INDEX visit_progress_campaign_idx ON visit_progress (campaign_id, round)`);
    // The recount reads only these (index-only): the closures that may count, and the live redos.
    await q.query(`CREATE INDEX closure_counted_visit_idx ON closure (visit_id) INCLUDE (id)
                     WHERE NOT deleted AND review_state <> 'rejected' AND jsonb_array_length(series->'tS') > 0`);
    await q.query(`CREATE INDEX closure_redo_visit_idx ON closure (visit_id, redo_of_id) WHERE NOT deleted AND redo_of_id IS NOT NULL`);
    // Set-based (joins, not a subquery per visit), so a bulk insert of many visits' records recounts in one pass.
    await q.query(`
      CREATE FUNCTION visit_progress_recount(ids uuid[]) RETURNS void LANGUAGE plpgsql AS $$
      BEGIN
        IF ids IS NULL OR cardinality(ids) = 0 THEN RETURN; END IF;
        INSERT INTO visit_progress (visit_id, campaign_id, collar_id, round, skipped, skip_reason, arrived_at, offsets, probes, closures)
        SELECT v.id, v.campaign_id, v.collar_id, v.round, v.skipped, v.skip_reason, v.arrived_at, 0, 0, 0
          FROM visit v WHERE v.id = ANY(ids) AND NOT v.deleted ORDER BY v.id
        ON CONFLICT (visit_id) DO NOTHING;
        PERFORM 1 FROM visit_progress WHERE visit_id = ANY(ids) ORDER BY visit_id FOR UPDATE;
        DELETE FROM visit_progress p WHERE p.visit_id = ANY(ids) AND NOT EXISTS (SELECT 1 FROM visit v WHERE v.id = p.visit_id AND NOT v.deleted);
        WITH o AS (SELECT DISTINCT visit_id FROM offset_set WHERE visit_id = ANY(ids) AND NOT deleted),
             r AS (SELECT DISTINCT visit_id FROM probe_reading WHERE visit_id = ANY(ids) AND NOT deleted),
             c AS (SELECT c.visit_id, count(*) AS n FROM closure c
                    WHERE c.visit_id = ANY(ids) AND NOT c.deleted AND c.review_state <> 'rejected' AND jsonb_array_length(c.series->'tS') > 0
                      AND NOT EXISTS (SELECT 1 FROM closure x WHERE x.visit_id = c.visit_id AND NOT x.deleted AND x.redo_of_id IS NOT NULL
                                        AND x.redo_of_id = c.id)
                    GROUP BY c.visit_id)
        UPDATE visit_progress p
           SET campaign_id = v.campaign_id, collar_id = v.collar_id, round = v.round, skipped = v.skipped,
               skip_reason = v.skip_reason, arrived_at = v.arrived_at,
               offsets = (o.visit_id IS NOT NULL)::int, probes = (r.visit_id IS NOT NULL)::int, closures = coalesce(c.n, 0)
          FROM visit v LEFT JOIN o ON o.visit_id = v.id LEFT JOIN r ON r.visit_id = v.id LEFT JOIN c ON c.visit_id = v.id
         WHERE p.visit_id = ANY(ids) AND v.id = p.visit_id;
      END $$`);
    await q.query(`
      CREATE FUNCTION visit_progress_from_visit() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        IF TG_OP = 'INSERT' THEN PERFORM visit_progress_recount(ARRAY(SELECT id FROM new_rows));
        ELSIF TG_OP = 'UPDATE' THEN PERFORM visit_progress_recount(ARRAY(SELECT id FROM new_rows UNION SELECT id FROM old_rows));
        ELSE PERFORM visit_progress_recount(ARRAY(SELECT id FROM old_rows));
        END IF;
        RETURN NULL;
      END $$`);
    await q.query(`
      CREATE FUNCTION visit_progress_from_record() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        IF TG_OP = 'INSERT' THEN PERFORM visit_progress_recount(ARRAY(SELECT DISTINCT visit_id FROM new_rows));
        ELSIF TG_OP = 'UPDATE' THEN PERFORM visit_progress_recount(ARRAY(SELECT visit_id FROM new_rows UNION SELECT visit_id FROM old_rows));
        ELSE PERFORM visit_progress_recount(ARRAY(SELECT DISTINCT visit_id FROM old_rows));
        END IF;
        RETURN NULL;
      END $$`);
    for (const [table, fn] of [
      ['visit', 'visit_progress_from_visit'],
      ['offset_set', 'visit_progress_from_record'],
      ['probe_reading', 'visit_progress_from_record'],
      ['closure', 'visit_progress_from_record'],
    ]) {
      await q.query(`CREATE TRIGGER ${table}_progress_ins AFTER INSERT ON ${table} REFERENCING NEW TABLE AS new_rows
                       FOR EACH STATEMENT EXECUTE FUNCTION ${fn}()`);
      await q.query(`CREATE TRIGGER ${table}_progress_upd AFTER UPDATE ON ${table} REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows
                       FOR EACH STATEMENT EXECUTE FUNCTION ${fn}()`);
      await q.query(`CREATE TRIGGER ${table}_progress_del AFTER DELETE ON ${table} REFERENCING OLD TABLE AS old_rows
                       FOR EACH STATEMENT EXECUTE FUNCTION ${fn}()`);
    }
    await q.query(`SELECT visit_progress_recount(ARRAY(SELECT id FROM visit WHERE NOT deleted))`);
  }

  async down(q: QueryRunner): Promise<void> {
    for (const table of ['visit', 'offset_set', 'probe_reading', 'closure']) {
      for (const t of ['ins', 'upd', 'del']) await q.query(`DROP TRIGGER ${table}_progress_${t} ON ${table}`);
    }
    await q.query(`DROP FUNCTION visit_progress_from_record(), visit_progress_from_visit(), visit_progress_recount(uuid[])`);
    await q.query(`DROP INDEX closure_counted_visit_idx, closure_redo_visit_idx`);
    await q.query(`DROP TABLE visit_progress`);
  }
}
