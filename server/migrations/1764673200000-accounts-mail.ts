import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Accounts and e-mail: single-use tokens for invitations and password resets (only a SHA-256 of
 * the token is stored, so a copy of the database opens no account), and the daily digest's runs
 * and deliveries. A scheduled run is unique per site and local date: however many server
 * processes notice that the digest time has come, only one insert wins and only one job is asked for.
 */
export class AccountsMail1764673200000 implements MigrationInterface {
  name = 'AccountsMail1764673200000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`CREATE TABLE account_token (
      id uuid PRIMARY KEY,
      kind text NOT NULL CHECK (kind IN ('invitation', 'reset')),
      token_hash text NOT NULL UNIQUE,
      email text NOT NULL CHECK (email = lower(email)),
      user_id uuid NULL REFERENCES app_user(id),
      roles text[] NULL,
      site_ids uuid[] NULL,
      created_by uuid NULL REFERENCES app_user(id),
      created_at timestamptz NOT NULL DEFAULT now(),
      expires_at timestamptz NOT NULL,
      used_at timestamptz NULL,
      revoked_at timestamptz NULL)`);
    await q.query(`CREATE INDEX account_token_open_idx ON account_token (kind, email) WHERE used_at IS NULL AND revoked_at IS NULL`);
    await q.query(`CREATE TABLE digest_run (
      id uuid PRIMARY KEY,
      site_id uuid NOT NULL REFERENCES site(id),
      local_date date NOT NULL,
      kind text NOT NULL CHECK (kind IN ('scheduled', 'manual')),
      requested_by uuid NULL REFERENCES app_user(id),
      job_id uuid NULL,
      created_at timestamptz NOT NULL DEFAULT now())`);
    await q.query(`CREATE UNIQUE INDEX digest_run_once_idx ON digest_run (site_id, local_date) WHERE kind = 'scheduled'`);
    await q.query(`CREATE TABLE digest_delivery (
      run_id uuid NOT NULL REFERENCES digest_run(id),
      user_id uuid NOT NULL REFERENCES app_user(id),
      email text NOT NULL,
      sent_at timestamptz NOT NULL DEFAULT now(),
      PRIMARY KEY (run_id, user_id))`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE digest_delivery, digest_run, account_token`);
  }
}
