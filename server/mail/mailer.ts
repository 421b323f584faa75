import nodemailer, { type Transporter } from 'nodemailer';
import { AppError } from '../core/errors';
import type { MailConfig } from './mail-config';

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html: string;
}

export interface Mailer {
  readonly config: MailConfig;
  send(mail: OutgoingMail): Promise<void>;
}

/**
 * nodemailer over SMTP. Port 465 speaks TLS from the start; other ports upgrade with STARTTLS
 * when the server offers it (a loopback fake does not). The transport is made on first use, so
 * an app without mail configured still starts and serves everything else.
 */
export function createMailer(config: MailConfig): Mailer {
  let transport: Transporter | null = null;
  return {
    config,
    async send(mail) {
      if (!config.host) throw new AppError(503, 'E-mail is not set up on this server (SMTP_HOST is missing); ask the administrator.');
      transport ??= nodemailer.createTransport({
        host: config.host,
        port: config.port,
        secure: config.port === 465,
        auth: config.user ? { user: config.user, pass: config.pass ?? '' } : undefined,
        connectionTimeout: 10_000,
        socketTimeout: 20_000,
      });
      await transport.sendMail({ from: config.from, to: mail.to, subject: mail.subject, text: mail.text, html: mail.html });
    },
  };
}
