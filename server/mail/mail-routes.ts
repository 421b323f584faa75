import type { DataSource } from 'typeorm';
import { registerAccountRoutes } from '../accounts/account-routes';
import type { RouteRegistry } from '../core/route-registry';
import { registerDigestRoutes } from './digest-routes';
import type { Mailer } from './mailer';

/** Everything that sends mail, sharing one mailer (its links point at the server's appOrigin). */
export function registerMailRoutes(r: RouteRegistry, ds: DataSource, mailer: Mailer): void {
  registerAccountRoutes(r, ds, mailer);
  registerDigestRoutes(r, ds, mailer);
}
