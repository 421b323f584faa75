import { appOrigin } from '../core/config';
import { serverEnv } from '../core/server-env';

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
  const e = serverEnv(env);
  return { host: e.SMTP_HOST, port: e.SMTP_PORT, user: e.SMTP_USER, pass: e.SMTP_PASS, from: e.MAIL_FROM, appOrigin: appOrigin(e) };
}
