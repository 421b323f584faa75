import type { DataSource } from 'typeorm';
import { registerAccountRoutes } from '../accounts/account-routes';
import type { RouteRegistry } from '../core/route-registry';
import { registerDigestRoutes } from './digest-routes';
import { loadMailConfig } from './mail-config';
import { createMailer, type Mailer } from './mailer';

/** Everything that sends mail, sharing one mailer configured from the environment. */
export function registerMailRoutes(r: RouteRegistry, ds: DataSource, mailer: Mailer = createMailer(loadMailConfig())): void {
  registerAccountRoutes(r, ds, mailer);
  registerDigestRoutes(r, ds, mailer);
}
