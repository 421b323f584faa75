import type { MigrationInterface, QueryRunner } from 'typeorm';

const SYNCED = `
  id uuid PRIMARY KEY,
  rev bigint NOT NULL DEFAULT 1,
  updated_at timestamptz NOT NULL DEFAULT now(),
  updated_by uuid NULL,
  deleted boolean NOT NULL DEFAULT false,
  site_id uuid NOT NULL REFERENCES site(id)`;

/** The campaign model, the change log that sync pull and the audit trail read, and the sync ledger. */
export class FieldData1764651600000 implements MigrationInterface {
  name = 'FieldData1764651600000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      ALTER TABLE site
        ADD COLUMN latitude double precision NULL,
        ADD COLUMN longitude double precision NULL,
        ADD COLUMN default_profile_id uuid NULL,
        ADD COLUMN safety_note text NOT NULL DEFAULT '',
        ADD COLUMN moisture_calibration jsonb NOT NULL DEFAULT '{"kind":"topp"}',
        ADD COLUMN temp_depth_cm double precision NOT NULL DEFAULT 5,
        ADD COLUMN settling_days_hard double precision NOT NULL DEFAULT 1,
        ADD COLUMN settling_days_warn double precision NOT NULL DEFAULT 7,
        ADD COLUMN offset_spread_pct double precision NOT NULL DEFAULT 3,
        ADD COLUMN offset_move_cm double precision NOT NULL DEFAULT 1,
        ADD COLUMN leak_slope_umol_mol_s double precision NOT NULL DEFAULT 0.05,
        ADD COLUMN ambient_margin_ppm double precision NOT NULL DEFAULT 100,
        ADD COLUMN digest_local_time text NOT NULL DEFAULT '18:00',
        ADD COLUMN tile_url text NULL,
        ADD COLUMN tile_attribution text NULL`);
    await q.query(`CREATE TABLE block (${SYNCED}, code text NOT NULL, name text NOT NULL DEFAULT '')`);
    await q.query(`CREATE TABLE treatment (${SYNCED}, code text NOT NULL, name text NOT NULL DEFAULT '',
      level text NOT NULL CHECK (level IN ('plot','collar')), description text NOT NULL DEFAULT '')`);
    await q.query(`CREATE TABLE plot (${SYNCED}, code text NOT NULL, block_id uuid NULL REFERENCES block(id),
      treatment_id uuid NULL REFERENCES treatment(id), outline jsonb NULL)`);
    await q.query(`CREATE TABLE collar (${SYNCED}, code text NOT NULL, plot_id uuid NOT NULL REFERENCES plot(id),
      treatment_id uuid NULL REFERENCES treatment(id), latitude double precision NULL, longitude double precision NULL,
      accuracy_m double precision NULL, shape text NOT NULL DEFAULT 'round', diameter_cm double precision NULL,
      side_a_cm double precision NULL, side_b_cm double precision NULL, area_cm2 double precision NULL,
      height_cm double precision NULL, insertion_cm double precision NULL, installed_on date NULL,
      notes text NOT NULL DEFAULT '', status text NOT NULL DEFAULT 'active' CHECK (status IN ('active','damaged','retired')),
      status_reason text NULL)`);
    await q.query(`CREATE UNIQUE INDEX collar_code_per_site ON collar (site_id, code) WHERE NOT deleted`);
    await q.query(`CREATE INDEX collar_plot_idx ON collar (plot_id)`);
    await q.query(`CREATE TABLE collar_event (${SYNCED}, collar_id uuid NOT NULL REFERENCES collar(id), kind text NOT NULL,
      date date NOT NULL, note text NOT NULL DEFAULT '', replaced_by_id uuid NULL REFERENCES collar(id))`);
    await q.query(`CREATE INDEX collar_event_collar_idx ON collar_event (collar_id, date)`);
    await q.query(`CREATE TABLE chamber_profile (${SYNCED}, name text NOT NULL, valid_from date NOT NULL,
      chamber_volume_cm3 double precision NOT NULL, loop_volume_cm3 double precision NOT NULL, settle_s double precision NOT NULL,
      closure_length_s double precision NOT NULL, footprint_area_cm2 double precision NULL)`);
    await q.query(`CREATE TABLE analyzer (${SYNCED}, name text NOT NULL, serial text NOT NULL DEFAULT '',
      range_min_ppm double precision NOT NULL, range_max_ppm double precision NOT NULL, precision_ppm double precision NOT NULL,
      calibration_interval_days double precision NOT NULL DEFAULT 365)`);
    await q.query(`CREATE TABLE analyzer_check (${SYNCED}, analyzer_id uuid NULL REFERENCES analyzer(id), kind text NOT NULL,
      at timestamptz NOT NULL, skipped boolean NOT NULL DEFAULT false, skip_reason text NULL, passed boolean NULL,
      co2_ppm double precision NULL, slope_umol_mol_s double precision NULL, clock_offset_s double precision NULL,
      span_gas_ppm double precision NULL, drift_ppm double precision NULL, note text NOT NULL DEFAULT '')`);
    await q.query(`CREATE TABLE route (${SYNCED}, name text NOT NULL, collar_ids uuid[] NOT NULL DEFAULT '{}')`);
    await q.query(`CREATE TABLE campaign (${SYNCED}, name text NOT NULL, starts_on date NOT NULL, ends_on date NOT NULL,
      rounds integer NOT NULL, due_offset boolean NOT NULL, due_closures integer NOT NULL, due_probes boolean NOT NULL,
      routes jsonb NOT NULL DEFAULT '[]', round_windows jsonb NOT NULL DEFAULT '[]', locked boolean NOT NULL DEFAULT false)`);
    await q.query(`CREATE TABLE visit (${SYNCED}, campaign_id uuid NOT NULL REFERENCES campaign(id), round integer NOT NULL,
      collar_id uuid NOT NULL REFERENCES collar(id), crew_id uuid NULL, arrived_at timestamptz NOT NULL,
      conditions jsonb NOT NULL, skipped boolean NOT NULL DEFAULT false, skip_reason text NULL)`);
    await q.query(`CREATE INDEX visit_progress_idx ON visit (campaign_id, collar_id, round) WHERE NOT deleted`);
    const reading = `visit_id uuid NOT NULL REFERENCES visit(id), collar_id uuid NOT NULL REFERENCES collar(id),
      campaign_id uuid NOT NULL REFERENCES campaign(id)`;
    await q.query(`CREATE TABLE offset_set (${SYNCED}, ${reading}, taken_at timestamptz NOT NULL,
      readings_cm double precision[] NOT NULL, mean_cm double precision NOT NULL, sd_cm double precision NOT NULL,
      supersedes_id uuid NULL REFERENCES offset_set(id))`);
    await q.query(`CREATE INDEX offset_set_visit_idx ON offset_set (visit_id) WHERE NOT deleted`);
    await q.query(`CREATE INDEX offset_set_collar_idx ON offset_set (collar_id, taken_at)`);
    await q.query(`CREATE TABLE probe_reading (${SYNCED}, ${reading}, taken_at timestamptz NOT NULL,
      soil_temps jsonb NOT NULL DEFAULT '[]', moisture_raw double precision NULL, moisture_kind text NULL,
      rod_length_cm double precision NULL, vwc_pct double precision NULL, probe_id text NOT NULL DEFAULT '')`);
    await q.query(`CREATE INDEX probe_reading_visit_idx ON probe_reading (visit_id) WHERE NOT deleted`);
    await q.query(`CREATE TABLE closure (${SYNCED}, ${reading}, profile_id uuid NULL REFERENCES chamber_profile(id),
      analyzer_id uuid NULL REFERENCES analyzer(id), started_at timestamptz NOT NULL, ended_at timestamptz NULL,
      settle_s double precision NOT NULL, series jsonb NOT NULL, chamber_on_at timestamptz NULL, chamber_off_at timestamptz NULL,
      source_attachment_id uuid NULL, redo_of_id uuid NULL,
      review_state text NOT NULL DEFAULT 'unreviewed' CHECK (review_state IN ('unreviewed','accepted','rejected')),
      review_reason text NULL, review_settle_s double precision NULL, review_window_end_s double precision NULL,
      review_model text NULL, results jsonb NULL, flags text[] NOT NULL DEFAULT '{}', flux_umol_m2_s double precision NULL)`);
    await q.query(`CREATE INDEX closure_visit_idx ON closure (visit_id) WHERE NOT deleted AND review_state <> 'rejected'`);
    await q.query(`CREATE INDEX closure_collar_idx ON closure (collar_id, started_at)`);
    await q.query(`CREATE TABLE attachment (${SYNCED}, owner_entity text NOT NULL, owner_id uuid NOT NULL,
      file_name text NOT NULL DEFAULT '', media_type text NOT NULL, size_bytes bigint NOT NULL, sha256 text NOT NULL,
      object_key text NULL)`);
    await q.query(`CREATE TABLE temperature_log (${SYNCED}, plot_id uuid NOT NULL REFERENCES plot(id),
      depth_cm double precision NOT NULL, source text NOT NULL DEFAULT '', series jsonb NOT NULL)`);
    // The change sequence: seq is assigned under an advisory lock held to commit, so seq order is commit order.
    await q.query(`CREATE TABLE change_log (
      seq bigint PRIMARY KEY, entity text NOT NULL, record_id uuid NOT NULL, rev bigint NOT NULL, site_id uuid NOT NULL,
      fields text[] NOT NULL, deleted boolean NOT NULL DEFAULT false, user_id uuid NULL, device_id uuid NULL,
      at timestamptz NOT NULL DEFAULT now())`);
    await q.query(`CREATE SEQUENCE change_seq OWNED BY change_log.seq`);
    await q.query(`CREATE INDEX change_log_record_idx ON change_log (entity, record_id, rev)`);
    await q.query(`CREATE INDEX change_log_site_seq_idx ON change_log (site_id, seq)`);
    await q.query(`CREATE TABLE sync_op (
      op_id uuid PRIMARY KEY, device_id uuid NOT NULL, user_id uuid NOT NULL, entity text NOT NULL, record_id uuid NOT NULL,
      status text NOT NULL, response jsonb NOT NULL, at timestamptz NOT NULL DEFAULT now())`);
    await q.query(`CREATE TABLE device (
      id uuid PRIMARY KEY, user_id uuid NOT NULL REFERENCES app_user(id), last_push_at timestamptz NULL,
      last_pull_at timestamptz NULL, outbox_size integer NULL, pull_cursor bigint NULL, site_ids uuid[] NOT NULL DEFAULT '{}',
      user_agent text NULL)`);
    await q.query(`CREATE TABLE sync_horizon (id boolean PRIMARY KEY DEFAULT true CHECK (id), min_seq bigint NOT NULL DEFAULT 0)`);
    await q.query(`INSERT INTO sync_horizon DEFAULT VALUES`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE sync_horizon, device, sync_op, change_log, temperature_log, attachment, closure, probe_reading,
      offset_set, visit, campaign, route, analyzer_check, analyzer, chamber_profile, collar_event, collar, plot, treatment, block`);
  }
}
