import { createHash, randomBytes, randomUUID } from 'node:crypto';
import { ENTITY_NAMES, ENTITY_PATHS, type EntityName } from '../../shared/model/entities';
import type { Session } from './test-app';

export type Wire = Record<string, unknown> & { id: string; rev: number };
/** One record of every entity at one site, keyed by entity name. */
export type World = Record<EntityName, Wire>;

export interface WorldMakers {
  admin: Session;
  /** A lead who is a member of the site (added by `addMember` when the site is new). */
  lead: Session;
  lab: Session;
}

/** A user made for one test file, signed in; `siteIds` are its memberships. */
export async function makeUser(admin: Session, roles: string[], siteIds: string[]): Promise<{ id: string; email: string }> {
  const email = `${roles.join('-')}-${randomUUID().slice(0, 8)}@fluxwalk.example`;
  const res = await admin.post('/api/users', { email, displayName: `Test ${roles.join('+')}`, password: 'fluxwalk-demo', roles, siteIds });
  if (res.status !== 201) throw new Error(`user not made: ${res.status} ${JSON.stringify(res.body)}`);
  return { id: res.body.user.id, email };
}

export async function addMember(admin: Session, userId: string, siteIds: string[]): Promise<void> {
  const users = (await admin.get('/api/users')).body.items as { id: string; siteIds: string[] }[];
  const now = users.find((u) => u.id === userId)?.siteIds ?? [];
  const res = await admin.patch(`/api/users/${userId}`, { siteIds: [...new Set([...now, ...siteIds])] });
  if (res.status !== 200) throw new Error(`membership not set: ${res.status}`);
}

const made = async (s: Session, entity: EntityName, body: Record<string, unknown>): Promise<Wire> => {
  const res = await s.post(`/api/${ENTITY_PATHS[entity]}`, body);
  if (res.status !== 201) throw new Error(`${entity} not made: ${res.status} ${JSON.stringify(res.body)}`);
  return res.body.record;
};

/**
 * One record of every entity at a new site, each carrying `marker` in a text field (codes, names,
 * notes) so a test can search any answer for it. `leadId` is made a member of the new site first.
 */
export async function buildWorld(m: WorldMakers, leadId: string, marker: string): Promise<World> {
  const w = {} as World;
  // Coordinates of this world only (7 decimals), so an answer that shows them is caught.
  const coord = (base: number) =>
    Number(`${base}.${String(randomBytes(4).readUInt32BE() % 1e6).padStart(6, '0')}${1 + (randomBytes(1)[0] % 9)}`);
  w.site = await made(m.admin, 'site', {
    name: `Site ${marker}`,
    timezone: 'UTC',
    elevationM: 321,
    latitude: coord(47),
    longitude: coord(8),
  });
  await addMember(m.admin, leadId, [w.site.id]);
  const siteId = w.site.id;
  w.block = await made(m.admin, 'block', { siteId, code: `B${marker}` });
  w.treatment = await made(m.admin, 'treatment', { siteId, code: `T${marker}`, level: 'plot' });
  w.plot = await made(m.admin, 'plot', { siteId, code: `P${marker}`, blockId: w.block.id, treatmentId: w.treatment.id });
  w.collar = await made(m.lead, 'collar', {
    siteId,
    code: `C${marker}`,
    plotId: w.plot.id,
    diameterCm: 20,
    notes: `notes ${marker}`,
    latitude: coord(46),
    longitude: coord(7),
  });
  w.collarEvent = await made(m.lead, 'collarEvent', {
    siteId,
    collarId: w.collar.id,
    kind: 'clipped',
    date: '2026-06-02',
    note: `event ${marker}`,
  });
  w.chamberProfile = await made(m.admin, 'chamberProfile', {
    siteId,
    name: `Profile ${marker}`,
    validFrom: '2026-01-01',
    chamberVolumeCm3: 4000,
    loopVolumeCm3: 100,
  });
  w.analyzer = await made(m.admin, 'analyzer', { siteId, name: `Analyzer ${marker}`, serial: `SN-${marker}` });
  w.analyzerCheck = await made(m.lead, 'analyzerCheck', {
    siteId,
    analyzerId: w.analyzer.id,
    kind: 'ambient',
    at: '2026-06-01T07:00:00Z',
    co2Ppm: 425,
    note: `check ${marker}`,
  });
  w.route = await made(m.lead, 'route', { siteId, name: `Route ${marker}`, collarIds: [w.collar.id] });
  w.campaign = await made(m.lead, 'campaign', {
    siteId,
    name: `Campaign ${marker}`,
    startsOn: '2026-06-01',
    endsOn: '2026-06-02',
    rounds: 1,
    routes: [{ routeId: w.route.id, crewIds: [] }],
  });
  w.visit = await made(m.lead, 'visit', {
    siteId,
    campaignId: w.campaign.id,
    round: 1,
    collarId: w.collar.id,
    arrivedAt: '2026-06-01T08:00:00Z',
    conditions: { other: `visit ${marker}` },
  });
  const at = { siteId, visitId: w.visit.id, collarId: w.collar.id, campaignId: w.campaign.id };
  w.offsetSet = await made(m.lead, 'offsetSet', { ...at, takenAt: '2026-06-01T08:01:00Z', readingsCm: [2.125, 2.375, 2.625] });
  w.probeReading = await made(m.lead, 'probeReading', {
    ...at,
    takenAt: '2026-06-01T08:02:00Z',
    takenById: leadId,
    moistureRaw: 21.75,
    moistureKind: 'permittivity',
    probeId: `probe ${marker}`,
  });
  const tS = Array.from({ length: 60 }, (_, i) => i);
  w.closure = await made(m.lead, 'closure', {
    ...at,
    startedAt: '2026-06-01T08:03:00Z',
    settleS: 20,
    series: { tS, co2Ppm: tS.map((s) => 420 + 0.75 * s), tempC: tS.map(() => 15), pressureKpa: tS.map(() => 98) },
  });
  const file = fileOf(marker);
  w.attachment = await made(m.lead, 'attachment', {
    siteId,
    ownerEntity: 'collar',
    ownerId: w.collar.id,
    mediaType: 'text/csv',
    sizeBytes: file.length,
    sha256: createHash('sha256').update(file).digest('hex'),
    fileName: `log-${marker}.csv`,
  });
  w.temperatureLog = await made(m.lab, 'temperatureLog', {
    siteId,
    plotId: w.plot.id,
    depthCm: 5,
    source: `logger ${marker}`,
    series: { t: ['2026-06-01T00:00:00Z'], tempC: [11.5] },
  });
  if (ENTITY_NAMES.some((e) => !w[e])) throw new Error('buildWorld misses an entity');
  return w;
}

/** The bytes of a world's logger file (its attachment): the marker is in them. */
export function fileOf(marker: string): Buffer {
  return Buffer.from(`t_s;co2_ppm\n# file ${marker}\n0;420\n1;421\n`, 'utf8');
}

/** Children before parents, so every delete names a record whose dependants are already gone. */
const DELETE_ORDER: EntityName[] = [
  'attachment',
  'temperatureLog',
  'closure',
  'probeReading',
  'offsetSet',
  'visit',
  'campaign',
  'route',
  'analyzerCheck',
  'analyzer',
  'chamberProfile',
  'collarEvent',
  'collar',
  'plot',
  'treatment',
  'block',
  'site',
];

/** Tombstones every record of the world (the writers' roles as in buildWorld) and returns the tombstones. */
export async function deleteWorld(m: WorldMakers, w: World): Promise<World> {
  const out = {} as World;
  const who = (e: EntityName) =>
    ['site', 'block', 'treatment', 'plot', 'chamberProfile', 'analyzer'].includes(e) ? m.admin : e === 'temperatureLog' ? m.lab : m.lead;
  for (const e of DELETE_ORDER) {
    const res = await who(e).delete(`/api/${ENTITY_PATHS[e]}/${w[e].id}?rev=${w[e].rev}`);
    if (res.status !== 200) throw new Error(`${e} not deleted: ${res.status} ${JSON.stringify(res.body)}`);
    out[e] = res.body.record;
  }
  return out;
}

/** A record's client fields (no metadata, no server-derived values): a body to create a copy of it. */
export function createBody(rec: Wire): Record<string, unknown> {
  const {
    id: _i,
    rev: _r,
    updatedAt: _u,
    updatedBy: _b,
    deleted: _d,
    results: _res,
    flags: _f,
    fluxUmolM2S: _x,
    areaCm2: _a,
    meanCm: _m,
    sdCm: _s,
    vwcPct: _v,
    objectKey: _o,
    ...rest
  } = rec;
  return rest;
}
