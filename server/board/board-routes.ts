import type { DataSource } from 'typeorm';
import { z } from 'zod';
import { ALL_ROLES, type RouteRegistry } from '../core/route-registry';
import { parse } from '../core/validate';
import { answer } from '../records/record-routes';
import { siteForActor } from '../setup/site-access';
import { findAnomalies } from './anomalies';
import { setCampaignLock } from './campaign-lock';
import { listDevices } from './devices';
import { progressCsv } from './progress-csv';
import { UTF8_BOM } from '../../shared/csv/csv-cell';
import { fieldMembers } from './site-members';

const campaignParams = z.object({ id: z.string().uuid('Campaign ids are UUIDs') });
const siteParams = z.object({ siteId: z.string().uuid('Site ids are UUIDs') });
const roundQuery = z.object({ round: z.coerce.number().int().min(1, 'Rounds count from 1').optional() });
const csvQuery = roundQuery.extend({ bom: z.enum(['0', '1'], { message: 'bom is 0 or 1' }).optional() });
const anomalyQuery = z.object({
  campaignId: z.string().uuid('Campaign ids are UUIDs').optional(),
  days: z.coerce.number().int().min(1).max(3650).optional(),
});

/** The Board's own routes: progress as CSV, anomalies, devices, and closing/reopening a campaign. */
export function registerBoardRoutes(r: RouteRegistry, ds: DataSource): void {
  r.add('get', '/api/campaigns/:id/progress.csv', ALL_ROLES, async (req, res) => {
    const { id } = parse(campaignParams, req.params);
    const { round, bom } = parse(csvQuery, req.query, 'Some CSV options are not valid');
    const csv = await progressCsv(ds, req.user!, id, round ?? null);
    res.setHeader('Content-Type', 'text/csv; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename="progress-${id.slice(0, 8)}${round ? `-round-${round}` : ''}.csv"`);
    // ?bom=1: a UTF-8 byte order mark so a spreadsheet reads the file as UTF-8.
    res.send(bom === '1' ? UTF8_BOM + csv : csv);
  });

  r.add('post', '/api/campaigns/:id/lock', ['lead'], async (req, res) => {
    const { id } = parse(campaignParams, req.params);
    return answer(res, await setCampaignLock(ds, req, id, true));
  });

  r.add('post', '/api/campaigns/:id/unlock', ['lead'], async (req, res) => {
    const { id } = parse(campaignParams, req.params);
    return answer(res, await setCampaignLock(ds, req, id, false));
  });

  r.add('get', '/api/sites/:siteId/anomalies', ['lead', 'lab', 'admin'], async (req) => {
    const { siteId } = parse(siteParams, req.params);
    const q = parse(anomalyQuery, req.query);
    await siteForActor(ds, req.user!, siteId);
    return findAnomalies(ds, siteId, { campaignId: q.campaignId ?? null, notVisitedDays: q.days });
  });

  r.add('get', '/api/sites/:siteId/devices', ['lead', 'admin'], async (req) => {
    const { siteId } = parse(siteParams, req.params);
    await siteForActor(ds, req.user!, siteId);
    return { items: await listDevices(ds, [siteId]) };
  });

  r.add('get', '/api/sites/:siteId/field-members', ['lead', 'admin'], async (req) => {
    const { siteId } = parse(siteParams, req.params);
    await siteForActor(ds, req.user!, siteId);
    return { items: await fieldMembers(ds, siteId) };
  });
}
