import type { Express } from 'express';
import request from 'supertest';
import { createApp } from '../../server/core/app';
import { loadConfig, type ServerConfig } from '../../server/core/config';
import { createDataSource } from '../../server/core/data-source';
import type { RouteRegistry } from '../../server/core/route-registry';
import type { DataSource } from 'typeorm';

export const DEMO_PASSWORD = 'fluxwalk-demo';
export const demoEmail = (role: 'crew' | 'lead' | 'lab' | 'admin') => `${role}@fluxwalk.example`;

export interface TestApp {
  app: Express;
  ds: DataSource;
  registry: RouteRegistry;
  close(): Promise<void>;
}

/** The real app on the test database (reset once per run by global setup), never listening on a fixed port. */
export async function startTestApp(overrides: Partial<ServerConfig> = {}): Promise<TestApp> {
  const url = overrides.databaseUrl ?? process.env['TEST_DATABASE_URL'];
  if (!url) throw new Error('TEST_DATABASE_URL is not set');
  const ds = createDataSource(url, { poolSize: 4 });
  await ds.initialize();
  const { app, registry } = createApp(ds, loadConfig({ databaseUrl: url, staticDir: null, sessionSecret: 'test-secret', ...overrides }));
  // Let response-finish work (the rate limiter's decrement) settle before the pool closes.
  return {
    app,
    ds,
    registry,
    close: async () => {
      await new Promise((r) => setTimeout(r, 100));
      await ds.destroy();
    },
  };
}

export type Agent = ReturnType<typeof request.agent>;

/** A signed-in client: a cookie jar plus the CSRF token fetched after sign-in, as the app does. */
export interface Session {
  agent: Agent;
  login: request.Response;
  csrf: string;
  get(path: string): request.Test;
  post(path: string, body?: unknown): request.Test;
  put(path: string, body?: unknown): request.Test;
  patch(path: string, body?: unknown): request.Test;
  delete(path: string, body?: unknown): request.Test;
}

export async function signIn(app: Express, email: string, password = DEMO_PASSWORD): Promise<Session> {
  const agent = request.agent(app);
  await agent.get('/api/auth/csrf');
  const login = await agent.post('/api/auth/login').send({ email, password });
  const csrf: string = (await agent.get('/api/auth/csrf')).body.token;
  const withToken = (t: request.Test, body?: unknown) =>
    body === undefined ? t.set('X-CSRF-Token', csrf) : t.set('X-CSRF-Token', csrf).send(body as object);
  return {
    agent,
    login,
    csrf,
    get: (p) => agent.get(p),
    post: (p, b) => withToken(agent.post(p), b),
    put: (p, b) => withToken(agent.put(p), b),
    patch: (p, b) => withToken(agent.patch(p), b),
    delete: (p, b) => withToken(agent.delete(p), b),
  };
}
