import { appOrigin } from '../core/config';

/** Where mail goes and what links in it point at, from the environment (read once per app). */
export interface MailConfig {
  /** Null when SMTP_HOST is unset: sending then fails with a clear message instead of guessing a server. */
  host: string | null;
  port: number;
  user: string | null;
  pass: string | null;
  from: string;
  /** Origin for links in mail: the server's one link origin (server/core/config.ts appOrigin). */
  appOrigin: string;
}

export function loadMailConfig(env: NodeJS.ProcessEnv = process.env): MailConfig {
  const port = Number(env['SMTP_PORT'] || 587);
  if (!Number.isInteger(port) || port <= 0) throw new Error(`SMTP_PORT must be a port number, got "${env['SMTP_PORT']}"`);
  return {
    host: env['SMTP_HOST'] || null,
    port,
    user: env['SMTP_USER'] || null,
    pass: env['SMTP_PASS'] || null,
    from: env['MAIL_FROM'] || 'Fluxwalk <fluxwalk@localhost>',
    appOrigin: appOrigin(env),
  };
}
