import type { ClientRateLimitInfo, Options, Store } from 'express-rate-limit';
import type { DataSource } from 'typeorm';

/**
 * express-rate-limit store kept in PostgreSQL (table rate_limit_hit), so several server
 * processes count the same failures. One statement per hit: the window restarts when it expired.
 */
export class PostgresRateLimitStore implements Store {
  private windowMs = 60_000;
  localKeys = false;

  constructor(
    private readonly ds: DataSource,
    readonly prefix: string,
  ) {}

  init(options: Options): void {
    this.windowMs = options.windowMs;
  }

  async get(key: string): Promise<ClientRateLimitInfo | undefined> {
    const rows: { hits: number; reset_at: Date }[] = await this.ds.query(
      `SELECT hits, reset_at FROM rate_limit_hit WHERE key = $1 AND reset_at > now()`,
      [this.prefix + key],
    );
    return rows[0] ? { totalHits: rows[0].hits, resetTime: rows[0].reset_at } : undefined;
  }

  async increment(key: string): Promise<ClientRateLimitInfo> {
    const rows: { hits: number; reset_at: Date }[] = await this.ds.query(
      `INSERT INTO rate_limit_hit (key, hits, reset_at)
       VALUES ($1, 1, now() + make_interval(secs => $2::double precision / 1000))
       ON CONFLICT (key) DO UPDATE SET
         hits = CASE WHEN rate_limit_hit.reset_at <= now() THEN 1 ELSE rate_limit_hit.hits + 1 END,
         reset_at = CASE WHEN rate_limit_hit.reset_at <= now() THEN EXCLUDED.reset_at ELSE rate_limit_hit.reset_at END
       RETURNING hits, reset_at`,
      [this.prefix + key, this.windowMs],
    );
    return { totalHits: rows[0].hits, resetTime: rows[0].reset_at };
  }

  async decrement(key: string): Promise<void> {
    await this.ds.query(`UPDATE rate_limit_hit SET hits = greatest(hits - 1, 0) WHERE key = $1`, [this.prefix + key]);
  }

  async resetKey(key: string): Promise<void> {
    await this.ds.query(`DELETE FROM rate_limit_hit WHERE key = $1`, [this.prefix + key]);
  }
}
