import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Finished results exports (a zipped data package per export job), kept in PostgreSQL so any
 * server process can hand one out; the job id is the export id, so a retried job overwrites its own file.
 */
export class ResultExports1764676800000 implements MigrationInterface {
  name = 'ResultExports1764676800000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE TABLE result_export (
      id uuid PRIMARY KEY,
      site_id uuid NOT NULL REFERENCES site(id),
      created_by uuid NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      file_name text NOT NULL,
      size_bytes bigint NOT NULL,
      sha256 text NOT NULL,
      bytes bytea NOT NULL)`);
    await q.query(`CREATE INDEX result_export_site_idx ON result_export (site_id, created_at DESC)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE result_export`);
  }
}
