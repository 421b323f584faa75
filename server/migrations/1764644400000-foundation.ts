import type { MigrationInterface, QueryRunner } from 'typeorm';

/** Users, sites and membership, PostgreSQL-held sessions and the sign-in failure counters. */
export class Foundation1764644400000 implements MigrationInterface {
  name = 'Foundation1764644400000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE app_user (
        id uuid PRIMARY KEY,
        email text NOT NULL UNIQUE CHECK (email = lower(email)),
        display_name text NOT NULL,
        password_hash text NOT NULL,
        roles text[] NOT NULL CHECK (roles <@ ARRAY['crew','lead','lab','admin']::text[] AND cardinality(roles) > 0),
        disabled boolean NOT NULL DEFAULT false,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`
      CREATE TABLE site (
        id uuid PRIMARY KEY,
        rev bigint NOT NULL DEFAULT 1,
        updated_at timestamptz NOT NULL DEFAULT now(),
        updated_by uuid NULL,
        deleted boolean NOT NULL DEFAULT false,
        name text NOT NULL,
        timezone text NOT NULL DEFAULT 'UTC',
        elevation_m double precision NULL
      )`);
    await q.query(`
      CREATE TABLE site_member (
        site_id uuid NOT NULL REFERENCES site(id),
        user_id uuid NOT NULL REFERENCES app_user(id),
        created_at timestamptz NOT NULL DEFAULT now(),
        PRIMARY KEY (site_id, user_id)
      )`);
    await q.query(`CREATE INDEX site_member_user_idx ON site_member (user_id)`);
    // The table connect-pg-simple expects (its own table.sql), created here rather than at run time.
    await q.query(`
      CREATE TABLE session (
        sid varchar NOT NULL PRIMARY KEY,
        sess json NOT NULL,
        expire timestamp(6) NOT NULL
      )`);
    await q.query(`CREATE INDEX session_expire_idx ON session (expire)`);
    await q.query(`
      CREATE TABLE rate_limit_hit (
        key text PRIMARY KEY,
        hits integer NOT NULL,
        reset_at timestamptz NOT NULL
      )`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE rate_limit_hit, session, site_member, site, app_user`);
  }
}
