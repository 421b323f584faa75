import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Stored fluxes of existing sites were computed by engine 1.0 (slope at the end of the settle time,
 * the chamber footprint as soil area, the newest profile of any chamber, no air-temperature
 * fallback). One recompute request per site brings every stored result to the current rules; the
 * job queue picks the requests up once a server runs. Reviewed closures keep their decision and
 * show the change as "recomputed since review". A fresh database has no site, so nothing is asked.
 */
export class RecomputeAfterEngineUpdate1764703600000 implements MigrationInterface {
  name = 'RecomputeAfterEngineUpdate1764703600000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      WITH asked AS (
        INSERT INTO job_outbox (id, name, data, dedupe_key)
        SELECT gen_random_uuid(), 'closure-recompute',
               jsonb_build_object('siteId', s.id, 'reason', 'flux engine updated: slope at closure, collar area, each closure''s own chamber'),
               'closure-recompute:' || s.id || ':*:*'
          FROM site s
         WHERE NOT s.deleted AND EXISTS (SELECT 1 FROM closure c WHERE c.site_id = s.id AND NOT c.deleted)
        ON CONFLICT (dedupe_key) DO NOTHING
        RETURNING id, (data->>'siteId')::uuid AS site_id)
      INSERT INTO job_progress (id, name, site_id) SELECT id, 'closure-recompute', site_id FROM asked`);
  }

  async down(): Promise<void> {
    // Nothing to undo: a recompute only brings stored results up to the rules in force.
  }
}
