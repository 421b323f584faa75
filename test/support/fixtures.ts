import { randomUUID } from 'node:crypto';
import type { Session } from './test-app';

export const DEMO_SITE_ID = '0f3c2a9e-5b1d-4c7e-9a2f-6d8e1b4c7a10';

/** A fresh site with a block, a plot, a collar and an open campaign, made through the API by the admin and lead. */
export async function makeSiteWithCollar(admin: Session, lead: Session, leadId: string) {
  const site = (await admin.post('/api/sites', { name: `Test site ${randomUUID().slice(0, 8)}`, timezone: 'UTC', elevationM: 300 })).body
    .record;
  await admin.patch(`/api/users/${leadId}`, { siteIds: [...(await lead.get('/api/auth/me')).body.user.siteIds, site.id] });
  const block = (await admin.post('/api/blocks', { siteId: site.id, code: 'B1' })).body.record;
  const treatment = (await admin.post('/api/treatments', { siteId: site.id, code: 'CTRL', level: 'plot' })).body.record;
  const plot = (await admin.post('/api/plots', { siteId: site.id, code: 'P1', blockId: block.id, treatmentId: treatment.id })).body.record;
  const collar = (await lead.post('/api/collars', { siteId: site.id, code: 'C1', plotId: plot.id, diameterCm: 20 })).body.record;
  const campaign = (
    await lead.post('/api/campaigns', { siteId: site.id, name: 'T', startsOn: '2026-06-01', endsOn: '2026-06-02', rounds: 1 })
  ).body.record;
  return { site, block, treatment, plot, collar, campaign };
}
