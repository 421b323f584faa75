import { renderHtml, renderText, type MailBlock } from '../mail/mail-html';
import type { OutgoingMail } from '../mail/mailer';
import { formatSiteTime } from '../../shared/time/site-time';

const ROLE_WORDS: Record<string, string> = {
  crew: 'crew (walks routes and records visits)',
  lead: 'crew lead (plans campaigns, follows progress)',
  lab: 'lab (reviews and publishes closures)',
  admin: 'administrator',
};

function mail(to: string, subject: string, blocks: MailBlock[]): OutgoingMail {
  return { to, subject, text: renderText(blocks), html: renderHtml(subject, blocks) };
}

export function invitationMail(p: {
  to: string;
  inviter: string;
  siteNames: string[];
  roles: string[];
  link: string;
  expiresAt: Date;
  /** The (first) invited site's zone, in which the expiry is written; UTC when no site is named. */
  timeZone: string | null;
}): OutgoingMail {
  const where = p.siteNames.length ? p.siteNames.join(', ') : 'Fluxwalk';
  return mail(p.to, `Invitation to ${where} on Fluxwalk`, [
    { kind: 'para', text: `Hello,` },
    { kind: 'para', text: `${p.inviter} has invited you to work on ${where} with Fluxwalk, the field app for the soil CO2 survey.` },
    { kind: 'para', text: 'Your role:' },
    { kind: 'list', items: p.roles.map((r) => ROLE_WORDS[r] ?? r) },
    { kind: 'link', text: 'Choose your name and password here', href: p.link },
    {
      kind: 'para',
      text: `The link works once and until ${formatSiteTime(p.expiresAt, p.timeZone ?? 'UTC')}. If you did not expect this invitation, ignore this mail; no account is made until the link is used.`,
    },
  ]);
}

export function resetMail(p: { to: string; displayName: string; link: string; minutes: number }): OutgoingMail {
  return mail(p.to, 'Reset your Fluxwalk password', [
    { kind: 'para', text: `Hello ${p.displayName},` },
    { kind: 'para', text: 'Someone (we hope you) asked to reset the password of your Fluxwalk account.' },
    { kind: 'link', text: 'Set a new password here', href: p.link },
    {
      kind: 'para',
      text: `The link works once, for ${p.minutes} minutes. Setting a new password signs you out on every device. If you did not ask for this, ignore this mail: your password stays as it is.`,
    },
  ]);
}
