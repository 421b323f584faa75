import { Client } from 'pg';
import { isolatedDatabase } from '../support/isolated-database';

/**
 * The seed writes without the app (no routes are wired): the feature rules still apply because
 * they belong to the writer, so seeded lab decisions leave their review history like the Bench's.
 */
describe("seed and the writer's rules", () => {
  let db: Client;

  beforeAll(async () => {
    db = new Client({ connectionString: await isolatedDatabase('seedrules') });
    await db.connect();
  });
  afterAll(async () => db.end());

  it('when the demo is seeded, then every closure the lab decided on has its decision in the review history', async () => {
    const { rows } = await db.query(`
      SELECT c.id, c.review_state, count(h.id)::int AS decisions
        FROM closure c LEFT JOIN closure_review_history h ON h.closure_id = c.id AND h.kind = 'decision' AND h.field = 'reviewState'
       WHERE c.review_state <> 'unreviewed' AND NOT c.deleted GROUP BY c.id, c.review_state`);
    expect(rows.length).toBeGreaterThan(0);
    expect(rows.filter((r) => r.decisions === 0)).toEqual([]);
  });

  it('when the demo is seeded, then no recompute waits for the server: the seed computed every flux with the inputs it wrote', async () => {
    const { rows } = await db.query(`SELECT name, data FROM job_outbox`);
    expect(rows).toEqual([]);
  });
});
