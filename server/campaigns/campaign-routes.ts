import type { DataSource } from 'typeorm';
import { z } from 'zod';
import { ALL_ROLES, type RouteRegistry } from '../core/route-registry';
import { parse } from '../core/validate';
import { campaignProgress } from './campaign-progress';

const progressParams = z.object({ id: z.string().uuid('Campaign ids are UUIDs') });
const progressQuery = z.object({ round: z.coerce.number().int().min(1, 'Rounds count from 1').optional() });

export function registerCampaignRoutes(r: RouteRegistry, ds: DataSource): void {
  r.add('get', '/api/campaigns/:id/progress', ALL_ROLES, (req) => {
    const { id } = parse(progressParams, req.params);
    const { round } = parse(progressQuery, req.query);
    return campaignProgress(ds, req.user!, id, round ?? null);
  });
}
