import type { DataSource } from 'typeorm';

/** The queue schema version the installed pg-boss creates and migrates to. */
// eslint-disable-next-line @typescript-eslint/no-require-imports
export const SUPPORTED_QUEUE_VERSION: number = (require('pg-boss/version.json') as { schema: number }).schema;

/**
 * A database first served by a newer pg-boss holds a queue schema this one cannot read (pg-boss
 * migrates forwards only and does not refuse a newer schema). Its unfinished jobs go back into the
 * outbox under their own ids, so they run again through the installed queue (every handler is
 * idempotent), and the old schema is renamed, not dropped, so its history stays readable.
 * Returns how many jobs were carried over; 0 when the schema is absent or current.
 */
export async function retireNewerQueueSchema(ds: DataSource, schema: string): Promise<number> {
  return ds.transaction(async (em) => {
    const [table]: { present: boolean }[] = await em.query(`SELECT to_regclass($1) IS NOT NULL AS present`, [`${schema}.version`]);
    if (!table.present) return 0;
    const [row]: { version: number }[] = await em.query(`SELECT version FROM "${schema}".version LIMIT 1`);
    if (!row || row.version <= SUPPORTED_QUEUE_VERSION) return 0;
    const carried: unknown[] = await em.query(
      `INSERT INTO job_outbox (id, name, data)
       SELECT j.id, j.name, COALESCE(j.data, '{}'::jsonb) FROM "${schema}".job j
        WHERE j.state IN ('created', 'retry', 'active') AND j.name NOT LIKE '\\_\\_%'
       ON CONFLICT (id) DO NOTHING RETURNING id`,
    );
    const retired = `${schema}_v${row.version}_retired_${Date.now()}`;
    await em.query(`ALTER SCHEMA "${schema}" RENAME TO "${retired}"`);
    console.warn(
      `[jobs] queue schema "${schema}" was version ${row.version} (this pg-boss knows ${SUPPORTED_QUEUE_VERSION}): ` +
        `renamed to "${retired}", ${carried.length} unfinished job(s) queued again`,
    );
    return carried.length;
  });
}
