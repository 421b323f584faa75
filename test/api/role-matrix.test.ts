import { randomUUID } from 'node:crypto';
import { ROLES, type Role } from '../../shared/auth/roles';
import { PUBLIC_ROUTES } from '../../server/core/route-registry';
import { demoEmail, signIn, startTestApp, type Session, type TestApp } from '../support/test-app';

const ROLE_DENIED = 'Your role does not allow this';

/** Walks every registered route × every role: no route without a rule, and every rule enforced. */
describe('role matrix over the route registry', () => {
  let t: TestApp;
  const sessions = new Map<Role, Session>();
  beforeAll(async () => {
    t = await startTestApp();
    for (const role of ROLES) sessions.set(role, await signIn(t.app, demoEmail(role)));
  });
  afterAll(() => t.close());

  it('when the registry is read, then every route is public by the allowlist or names its roles', () => {
    expect(t.registry.routes.length).toBeGreaterThan(5);
    for (const r of t.registry.routes) {
      const key = `${r.method.toUpperCase()} ${r.path}`;
      if (r.access === 'public') expect(PUBLIC_ROUTES).toContain(key);
      else expect(r.access.length).toBeGreaterThan(0);
    }
  });

  it('when each role calls each protected route, then exactly the roles not listed get 403', async () => {
    const problems: string[] = [];
    for (const route of t.registry.routes.filter((r) => r.access !== 'public')) {
      const path = route.path.replace(/:[A-Za-z]+/g, () => randomUUID());
      for (const role of ROLES) {
        let s = sessions.get(role)!;
        if ((await s.get('/api/auth/me')).status !== 200) {
          s = await signIn(t.app, demoEmail(role)); // a logout route ended the last session
          sessions.set(role, s);
        }
        const res = await s[route.method](path, route.method === 'get' ? undefined : {});
        const denied = res.status === 403 && res.body?.error?.message === ROLE_DENIED;
        const allowed = (route.access as readonly Role[]).includes(role);
        if (allowed && (denied || res.status === 401)) problems.push(`${role} refused on ${route.method} ${route.path}: ${res.status}`);
        if (!allowed && !denied) problems.push(`${role} not refused on ${route.method} ${route.path}: ${res.status}`);
      }
    }
    expect(problems).toEqual([]);
  });

  it('when signed out, then every protected route answers 401', async () => {
    const { default: request } = await import('supertest');
    for (const route of t.registry.routes.filter((r) => r.access !== 'public' && r.method === 'get')) {
      const res = await request(t.app).get(route.path.replace(/:[A-Za-z]+/g, () => randomUUID()));
      expect([route.path, res.status]).toEqual([route.path, 401]);
    }
  });
});
