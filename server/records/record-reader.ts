import type { DataSource } from 'typeorm';
import { z } from 'zod';
import { readsSite, seesAllSites, type SessionUser } from '../../shared/auth/roles';
import { ATTACHMENT_OWNERS } from '../../shared/model/field-records';
import { notFound } from '../core/errors';
import { parse } from '../core/validate';
import type { EntityDef } from './entity-registry';
import { toWire, toWireRecord } from './wire';
import { noRecordMessage } from './write-outcome';

/** Query parameters every list route understands; a filter applies only where the entity has that field. */
const listQuery = z.object({
  siteId: z.string().uuid().optional(),
  plotId: z.string().uuid().optional(),
  treatmentId: z.string().uuid().optional(),
  campaignId: z.string().uuid().optional(),
  collarId: z.string().uuid().optional(),
  visitId: z.string().uuid().optional(),
  analyzerId: z.string().uuid().optional(),
  round: z.coerce.number().int().min(1).optional(),
  status: z.string().max(40).optional(),
  reviewState: z.enum(['unreviewed', 'accepted', 'rejected']).optional(),
  kind: z.string().max(40).optional(),
  routeId: z.string().uuid().optional(),
  ownerEntity: z.enum(ATTACHMENT_OWNERS).optional(),
  ownerId: z.string().uuid().optional(),
  from: z
    .string()
    .datetime({ offset: true })
    .or(z.string().regex(/^\d{4}-\d{2}-\d{2}$/))
    .optional(),
  to: z
    .string()
    .datetime({ offset: true })
    .or(z.string().regex(/^\d{4}-\d{2}-\d{2}$/))
    .optional(),
  includeDeleted: z.enum(['true', 'false']).optional(),
  limit: z.coerce.number().int().min(1).max(1000).default(100),
  offset: z.coerce.number().int().min(0).default(0),
});

const FILTERS = [
  'siteId',
  'plotId',
  'treatmentId',
  'campaignId',
  'collarId',
  'visitId',
  'analyzerId',
  'round',
  'status',
  'reviewState',
  'kind',
  'ownerEntity',
  'ownerId',
] as const;

export async function listRecords(ds: DataSource, d: EntityDef, user: SessionUser, rawQuery: unknown) {
  const q = parse(listQuery, rawQuery, 'Some list filters are not valid');
  const meta = ds.getMetadata(d.target);
  const qb = ds.getRepository(d.target).createQueryBuilder('r');
  const siteColumn = d.name === 'site' ? 'r.id' : 'r.siteId';
  const readable = seesAllSites(user.roles) ? null : user.siteIds;
  if (readable)
    qb.andWhere(`${siteColumn} IN (:...readable)`, { readable: readable.length ? readable : ['00000000-0000-0000-0000-000000000000'] });
  for (const f of FILTERS) {
    const value = q[f];
    if (value === undefined) continue;
    const prop = f === 'siteId' && d.name === 'site' ? 'id' : f;
    if (!meta.findColumnWithPropertyName(prop)) continue;
    qb.andWhere(`r.${prop} = :${f}`, { [f]: value });
  }
  if (q.routeId && meta.findColumnWithPropertyName('collarId')) {
    qb.andWhere(`r.collarId IN (SELECT unnest(collar_ids) FROM route WHERE id = :routeId)`, { routeId: q.routeId });
  } else if (q.routeId && d.name === 'collar') {
    qb.andWhere(`r.id IN (SELECT unnest(collar_ids) FROM route WHERE id = :routeId)`, { routeId: q.routeId });
  }
  if (d.timeField && q.from) qb.andWhere(`r.${d.timeField} >= :from`, { from: q.from });
  if (d.timeField && q.to) qb.andWhere(`r.${d.timeField} <= :to`, { to: q.to });
  if (q.includeDeleted !== 'true') qb.andWhere('r.deleted = false');
  for (const [k, dir] of Object.entries(d.order)) qb.addOrderBy(`r.${k}`, dir);
  qb.addOrderBy('r.id', 'ASC').skip(q.offset).take(q.limit);
  const [rows, total] = await qb.getManyAndCount();
  return { items: rows.map(toWire), total, limit: q.limit, offset: q.offset };
}

/** One record the user may read; another site's record is "not found", not "forbidden", so ids do not leak. */
export async function getRecord(ds: DataSource, d: EntityDef, user: SessionUser, id: string) {
  parse(z.string().uuid('Ids are UUIDs'), id);
  const row = await ds.getRepository(d.target).findOneBy({ id });
  const record = row ? toWireRecord(row) : null;
  const siteId = record && (d.name === 'site' ? record.id : record.siteId);
  if (!record || !siteId || !readsSite(user, siteId)) throw notFound(noRecordMessage(d.name, id));
  return record;
}
