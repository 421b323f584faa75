import { randomUUID } from 'node:crypto';
import express from 'express';
import request from 'supertest';
import { readsSite, ROLES, type Role } from '../../shared/auth/roles';
import { RouteRegistry } from '../../server/core/route-registry';
import { errorMiddleware, notFound } from '../../server/core/errors';
import { checkExposure, ID_KINDS, type ExposureInput, type IdKind, type Send } from '../support/exposure-check';
import { startFakeS3 } from '../support/fake-s3';
import { buildWorld, deleteWorld, fileOf, makeUser, type World } from '../support/site-world';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

/**
 * Every registered route (the registry the role matrix walks) and every sync entity, called as
 * every role with ids of records at a site the caller does not belong to: no answer may show any
 * of those records' values. Built from the registry, so a new route is covered when it is added.
 */
describe("no route shows another site's records", () => {
  let t: TestApp;
  let admin: Session, lab: Session;
  const sessions = new Map<Role, Session>();
  const emails = new Map<Role, string>();
  const markers: string[] = [];
  let home: World;
  const foreign = {} as Record<IdKind, World>;
  const readable: Record<string, string[]> = {};

  const reads = (role: Role, siteId: string) => readsSite({ roles: [role], siteIds: readable[role] }, siteId);
  const marker = (p: string) => {
    const m = `${p}${randomUUID().slice(0, 8)}`;
    markers.push(m);
    return m;
  };

  let s3: Awaited<ReturnType<typeof startFakeS3>>;
  beforeAll(async () => {
    // With object storage, so the file routes answer bytes (the foreign files carry their world's marker).
    s3 = await startFakeS3();
    t = await startTestApp({ objectStorage: s3.config });
    admin = await signIn(t.app, demoEmail('admin'));
    lab = await signIn(t.app, demoEmail('lab'));
    const fl = await makeUser(admin, ['lead'], []);
    const foreignLead = await signIn(t.app, fl.email);
    const hl = await makeUser(admin, ['lead'], []);
    const homeLead = await signIn(t.app, hl.email);
    home = await buildWorld({ admin, lead: homeLead, lab }, hl.id, `hm${randomUUID().slice(0, 6)}`);
    const by = { admin, lead: foreignLead, lab };
    foreign.live = await buildWorld(by, fl.id, marker('lv'));
    // Live records have been edited since they were made.
    const edited = await foreignLead.patch(`/api/collars/${foreign.live.collar.id}`, { rev: 1, notes: `edited ${markers[0]}` });
    foreign.live.collar = edited.body.record;
    foreign.deleted = await deleteWorld(by, await buildWorld(by, fl.id, marker('dl')));
    foreign.deleted.site = (await admin.get(`/api/sites/${foreign.deleted.site.id}`)).body.record;
    foreign['just-created'] = await buildWorld(by, fl.id, marker('nw'));
    // The live world's file has reached the server (just-created records stay at rev 1).
    const put = await foreignLead.agent
      .put(`/api/attachments/${foreign.live.attachment.id}/content`)
      .set('X-CSRF-Token', foreignLead.csrf)
      .set('Content-Type', 'text/csv')
      .send(fileOf(markers[0]));
    expect(put.status).toBe(200);
    foreign.live.attachment = put.body.record;
    // Callers of every role; the site-scoped ones belong to the home site only.
    const crew = await makeUser(admin, ['crew'], [home.site.id]);
    emails.set('crew', crew.email).set('lead', hl.email).set('lab', demoEmail('lab')).set('admin', demoEmail('admin'));
    for (const role of ROLES) {
      const s = await signIn(t.app, emails.get(role)!);
      sessions.set(role, s);
      readable[role] = (await s.get('/api/auth/me')).body.user.siteIds;
    }
  });
  afterAll(async () => {
    await t.close();
    await s3.stop();
  });

  /** A request as the role's caller; a route that ended the session (sign-out) gets a fresh one. */
  const send: Send = async (role, method, path, body) => {
    const call = () => sessions.get(role)![method](path, method === 'get' ? undefined : (body ?? {}));
    let res = await call();
    if (res.status === 401) {
      sessions.set(role, await signIn(t.app, emails.get(role)!));
      res = await call();
    }
    return { status: res.status, text: res.text ?? JSON.stringify(res.body ?? '') };
  };

  it('when every route is called as every role with foreign live, deleted and just-created ids, then no answer shows them', async () => {
    const input: ExposureInput = { routes: t.registry.routes, roles: ROLES, foreign, reads, home, send };
    const report = await checkExposure(input, markers);
    const scoped = ROLES.filter((r) => ID_KINDS.every((k) => !reads(r, foreign[k].site.id)));
    // Lab and admin read every site (shared/auth), so no record is foreign to them; every other role is checked on every route.
    expect(scoped).toEqual(['crew', 'lead']);
    expect(report.cases).toBe(t.registry.routes.length * scoped.length * ID_KINDS.length);
    console.log(
      `exposure check: ${t.registry.routes.length} routes × ${scoped.length} site-scoped roles (${scoped.join(', ')}) × ` +
        `${ID_KINDS.length} id kinds = ${report.cases} cases, ${report.requests} requests; lab and admin read every site; ` +
        `answers by status ${JSON.stringify(report.statuses)}`,
    );
    expect(report.problems).toEqual([]);
  }, 600_000);

  it('when a route that answers any stored record is registered, then the check names it (and only it)', async () => {
    const app = express();
    app.use(express.json());
    const users = new Map<Role, { id: string; roles: Role[]; siteIds: string[] }>(
      ROLES.map((r) => [r, { id: randomUUID(), roles: [r], siteIds: readable[r] }]),
    );
    app.use((req, _res, next) => {
      (req as unknown as { user: unknown }).user = users.get(req.header('x-role') as Role);
      next();
    });
    const registry = new RouteRegistry(app);
    registry.add('get', '/api/leaky/collars/:id', ['crew', 'lead'], async (req) => ({
      record: (await t.ds.query(`SELECT code, notes FROM collar WHERE id = $1`, [req.params['id']]))[0] ?? null,
    }));
    registry.add('patch', '/api/careful/collars/:id', ['crew', 'lead'], () => {
      throw notFound('No collar');
    });
    app.use(errorMiddleware);
    const leakySend: Send = async (role, method, path, body) => {
      const agent = request(app);
      const res = await agent[method](path)
        .set('x-role', role)
        .send(body as object);
      return { status: res.status, text: res.text };
    };
    const report = await checkExposure({ routes: registry.routes, roles: ROLES, foreign, reads, home, send: leakySend }, markers);
    expect(report.problems.length).toBeGreaterThan(0);
    expect(report.problems.every((p) => p.includes('GET /api/leaky/collars/:id'))).toBe(true);
    expect(report.problems.some((p) => p.startsWith('crew GET /api/leaky/collars/:id (live)'))).toBe(true);
  });
});
