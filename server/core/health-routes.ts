import type { DataSource } from 'typeorm';
import type { RouteRegistry } from './route-registry';

export function registerHealthRoute(r: RouteRegistry, ds: DataSource): void {
  r.add('get', '/api/health', 'public', async (_req, res) => {
    try {
      await Promise.race([ds.query('SELECT 1'), new Promise((_, reject) => setTimeout(() => reject(new Error('timeout')), 3000))]);
      return { status: 'ok', db: 'ok' };
    } catch {
      res.status(503);
      return { status: 'degraded', db: 'down' };
    }
  });
}
