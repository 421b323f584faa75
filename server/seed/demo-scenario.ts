import type { EntityManager } from 'typeorm';
import { ROLES } from '../../shared/auth/roles';
import { ENTITY_DEFS } from '../records/entity-registry';
import { ChangeBuffer, writeRecord, type Actor } from '../records/record-writer';
import { DEMO_SITE_ID } from './demo-accounts';
import { buildCurrentCampaign } from './demo-current';
import { buildLayout } from './demo-layout';
import { demoUserId, type DemoRole, type SeedWrite } from './demo-plan';
import { buildSeason } from './demo-season';
import { buildTemperatureLogs } from './demo-temperature-logs';

/** Every write of the invented scenario, in the order the people would have made them. */
export function buildDemoScenario(): SeedWrite[] {
  const layout = buildLayout();
  const season = buildSeason(layout);
  return [...layout.writes, ...season.writes, ...buildCurrentCampaign(layout), ...buildTemperatureLogs(layout)];
}

/**
 * Writes the scenario through the one record write path, so derived values, flux results and
 * the change log (what device sync pulls) are exactly what real use would have produced. Each
 * person writes as themself (updatedBy); the actor carries every role so the seed never depends
 * on the permission matrix. Any outcome other than `applied` throws: a half-seeded demo is
 * worse than none, and the caller's transaction rolls everything back.
 */
export async function seedDemoScenario(em: EntityManager, writes: readonly SeedWrite[] = buildDemoScenario()): Promise<number> {
  const actors = new Map<DemoRole, Actor>();
  const actor = (role: DemoRole): Actor => {
    let a = actors.get(role);
    if (!a) actors.set(role, (a = { id: demoUserId(role), roles: [...ROLES], siteIds: [DEMO_SITE_ID] }));
    return a;
  };
  const revs = new Map<string, number>();
  const changes = new ChangeBuffer();
  for (const w of writes) {
    const key = `${w.entity}:${w.id}`;
    const baseRev = w.kind === 'create' ? null : (revs.get(key) ?? (await currentRev(em, w)));
    const outcome = await writeRecord(em, actor(w.as), { entity: w.entity, id: w.id, baseRev, op: 'upsert', fields: w.fields }, changes);
    if (outcome.status !== 'applied' || outcome.rev === undefined) {
      const detail = JSON.stringify(outcome.error ?? outcome.conflict ?? outcome.status);
      throw new Error(`demo seed: ${w.kind} ${w.entity} ${w.id} was ${outcome.status}: ${detail}`);
    }
    revs.set(key, outcome.rev);
  }
  await changes.flush(em);
  return writes.length;
}

/** Records seeded outside the scenario (the site) are updated from their stored revision. */
async function currentRev(em: EntityManager, w: SeedWrite): Promise<number> {
  const rows: { rev: string }[] = await em.query(`SELECT rev FROM ${ENTITY_DEFS[w.entity].table} WHERE id = $1`, [w.id]);
  if (!rows.length) throw new Error(`demo seed: no ${w.entity} ${w.id} to update`);
  return Number(rows[0].rev);
}
