import { randomUUID } from 'node:crypto';
import type { Role } from '../../shared/auth/roles';
import { ENTITY_NAMES, ENTITY_PATHS, SYNC_ENTITIES, type EntityName } from '../../shared/model/entities';
import type { RegisteredRoute } from '../../server/core/route-registry';
import { createBody, type Wire, type World } from './site-world';

/** The kinds of foreign ids every route is called with. */
export const ID_KINDS = ['live', 'deleted', 'just-created'] as const;
export type IdKind = (typeof ID_KINDS)[number];

export interface Answer {
  status: number;
  text: string;
}
export type Send = (role: Role, method: RegisteredRoute['method'], path: string, body?: unknown) => Promise<Answer>;

export interface ExposureInput {
  routes: readonly RegisteredRoute[];
  roles: readonly Role[];
  /** Records at sites none of the callers belong to, one world per id kind. */
  foreign: Record<IdKind, World>;
  /** Whether the role's caller may read a site (shared/auth's rule): a world there is not foreign to that role. */
  reads: (role: Role, siteId: string) => boolean;
  /** Records at the callers' own site: bodies for creates over a foreign id. */
  home: World;
  send: Send;
}

export interface ExposureReport {
  problems: string[];
  /** route × role × id kind triples that were checked (roles that read every site have no foreign ids). */
  cases: number;
  requests: number;
  perRole: Record<string, number>;
  /** How many answers had each HTTP status (a route answered only 4xx/5xx was reached but refused). */
  statuses: Record<number, number>;
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/**
 * What of a foreign record must never appear in an answer: every id it holds (its own and the ids
 * of its neighbours), every text carrying the world's marker, long hex digests and coordinates.
 */
export function needlesOf(worlds: World[], markers: string[], own: World): Set<string> {
  const out = new Set<string>();
  let into = out;
  const walk = (v: unknown): void => {
    if (typeof v === 'string') {
      if (UUID.test(v) || /^[0-9a-f]{32,}$/.test(v) || markers.some((m) => v.includes(m))) into.add(v);
    } else if (typeof v === 'number') {
      if (/\.\d{6,}$/.test(String(v))) into.add(String(v));
    } else if (Array.isArray(v)) v.forEach(walk);
    else if (v && typeof v === 'object') Object.values(v).forEach(walk);
  };
  for (const w of worlds) for (const rec of Object.values(w)) walk(rec);
  // Values the caller's own records hold too (who last wrote them, e.g. an admin) are not the foreign site's.
  into = new Set<string>();
  for (const rec of Object.values(own)) walk(rec);
  for (const v of into) out.delete(v);
  return out;
}

/** The entity a path parameter names: `:collarId` → collar, `/api/collars/:id` → collar; null when the path does not say. */
export function paramEntity(path: string, param: string): EntityName | null {
  const named = param.replace(/Id$/, '');
  if (param !== 'id' && (ENTITY_NAMES as readonly string[]).includes(named)) return named as EntityName;
  const segments = path.split('/');
  const before = segments[segments.indexOf(`:${param}`) - 1];
  return (Object.entries(ENTITY_PATHS).find(([, p]) => p === before)?.[0] as EntityName | undefined) ?? null;
}

/** The entity whose collection a parameterless route is (`/api/collars`), if any. */
const collectionOf = (path: string): EntityName | null =>
  (Object.entries(ENTITY_PATHS).find(([, p]) => path === `/api/${p}`)?.[0] as EntityName | undefined) ?? null;

interface Probe {
  path: string;
  body?: unknown;
  sent: string[];
}

/** Every request one route gets for one id kind: foreign ids in the path, the query and the body. */
function probesFor(route: RegisteredRoute, w: World, home: World): Probe[] {
  const params = [...route.path.matchAll(/:([A-Za-z]+)/g)].map((m) => m[1]);
  const mapped = params.map((p) => paramEntity(route.path, p));
  const collection = params.length ? null : collectionOf(route.path);
  // A parameter the path does not explain is tried with every entity's id; a known one with its own.
  const targets: (EntityName | 'all')[] = mapped.some((m) => m === null)
    ? [...ENTITY_NAMES]
    : mapped.length
      ? [mapped[0]!]
      : collection
        ? [collection]
        : ['all'];
  const out: Probe[] = [];
  for (const target of targets) {
    const idOf = (e: EntityName) => w[e].id;
    const main = target === 'all' ? w.collar : w[target];
    let path = route.path;
    params.forEach((p, i) => {
      path = path.replace(`:${p}`, idOf(mapped[i] ?? (target === 'all' ? 'collar' : target)));
    });
    const refs: Record<string, string> =
      target === 'all' ? Object.fromEntries(ENTITY_NAMES.map((e) => [`${e}Id`, idOf(e)])) : { [`${target}Id`]: main.id, siteId: w.site.id };
    const sent = [
      ...new Set([main.id, ...Object.values(refs), ...params.map((_, i) => idOf(mapped[i] ?? (target === 'all' ? 'collar' : target)))]),
    ];
    if (route.method === 'get' || route.method === 'delete') {
      const q = new URLSearchParams({ id: main.id, ...refs, deviceId: randomUUID(), rev: '1' });
      out.push({ path: `${path}?${q}`, sent });
      continue;
    }
    out.push({ path, body: { id: main.id, rev: 1, ...refs }, sent });
    if (target !== 'all') {
      // A whole record of the caller's own site under the foreign id: a create over it, or a stale edit of it.
      out.push({ path, body: { ...createBody(home[target]), id: main.id, rev: 1 }, sent });
    }
    if (route.method === 'post' && route.path === '/api/sync/push') out.push(...syncProbes(w, home));
  }
  return out;
}

/** Every sync entity, every op a device can send, each naming a foreign id. */
function syncProbes(w: World, home: World): Probe[] {
  return SYNC_ENTITIES.map((e) => {
    const rec: Wire = w[e];
    const own = createBody(home[e]);
    const { siteId: _s, ...edit } = own;
    const op = (baseRev: number | null, kind: 'upsert' | 'delete', fields: Record<string, unknown>) => ({
      opId: randomUUID(),
      entity: e,
      id: rec.id,
      baseRev,
      op: kind,
      fields,
    });
    const ops = [
      op(null, 'upsert', own),
      op(1, 'upsert', {}),
      op(rec.rev, 'upsert', {}),
      op(1, 'upsert', edit),
      op(null, 'delete', {}),
      op(1, 'delete', {}),
    ];
    return { path: '/api/sync/push', body: { deviceId: randomUUID(), outboxSize: ops.length, ops }, sent: [rec.id] };
  });
}

/**
 * Calls every registered route as every role with ids of records at sites the caller does not
 * belong to (live, deleted, just created) and searches each answer for anything of those records.
 */
export async function checkExposure(input: ExposureInput, markers: string[]): Promise<ExposureReport> {
  const needles = needlesOf(Object.values(input.foreign), markers, input.home);
  const report: ExposureReport = { problems: [], cases: 0, requests: 0, perRole: {}, statuses: {} };
  for (const role of input.roles) {
    report.perRole[role] = 0;
    for (const kind of ID_KINDS) {
      const w = input.foreign[kind];
      if (input.reads(role, w.site.id)) continue; // this role reads that site: nothing there is foreign to it
      for (const route of input.routes) {
        report.cases++;
        report.perRole[role]++;
        for (const probe of probesFor(route, w, input.home)) {
          const res = await input.send(role, route.method, probe.path, probe.body);
          report.requests++;
          report.statuses[res.status] = (report.statuses[res.status] ?? 0) + 1;
          const found = [...needles].filter((n) => !probe.sent.includes(n) && res.text.includes(n));
          if (found.length) {
            report.problems.push(
              `${role} ${route.method.toUpperCase()} ${route.path} (${kind}) → ${res.status} shows ${found.slice(0, 3).join(', ')}`,
            );
          }
        }
      }
    }
  }
  return report;
}
