import { progressCountsText, progressStateHeading } from '../../shared/model/progress-state';
import { formatSiteTime } from '../../shared/time/site-time';
import type { Digest } from '../../shared/board/board-wire';
import { renderHtml, renderText, type MailBlock } from './mail-html';
import type { OutgoingMail } from './mailer';

/** The digest as a mail: per campaign and route the collars still due, then anomalies and silent devices. */
export function digestMail(d: Digest, to: string, displayName: string, boardLink: string | null): OutgoingMail {
  const subject = `Daily digest: ${d.site.name}, ${d.localDate}`;
  const blocks: MailBlock[] = [
    { kind: 'para', text: `Hello ${displayName}, here is where ${d.site.name} stands on ${d.localDate} (${d.site.timezone}).` },
  ];
  if (!d.campaigns.length) blocks.push({ kind: 'para', text: 'No open campaign: nothing is due.' });
  for (const c of d.campaigns) {
    blocks.push({ kind: 'heading', text: `${c.name} (${c.startsOn} to ${c.endsOn})` });
    for (const r of c.routes) {
      const counts = { due: r.due.length, partial: r.partial.length, complete: r.complete, skipped: r.skipped };
      blocks.push({ kind: 'para', text: `${r.routeName}: ${progressCountsText(counts)}.` });
      const items: string[] = [];
      if (r.due.length) items.push(`${progressStateHeading('due')} (${r.due.length}): ${r.due.join(', ')}`);
      for (const p of r.partial) items.push(`${progressStateHeading('partial')} ${p.code}: still needs ${p.missing.join(', ')}`);
      if (items.length) blocks.push({ kind: 'list', items });
    }
  }
  blocks.push({ kind: 'heading', text: `Worth a look (${d.anomalies.total}, ${d.anomalies.problems} to act on)` });
  if (d.anomalies.total) {
    blocks.push({
      kind: 'list',
      items: d.anomalies.items.map(
        (a) => `${a.severity === 'problem' ? 'Act: ' : ''}${a.collarCode ? `${a.collarCode}: ` : ''}${a.message}`,
      ),
    });
    if (d.anomalies.total > d.anomalies.items.length)
      blocks.push({ kind: 'para', text: `… and ${d.anomalies.total - d.anomalies.items.length} more on the Board.` });
  } else {
    blocks.push({ kind: 'para', text: 'Nothing unusual found.' });
  }
  blocks.push({ kind: 'heading', text: `Devices silent for a day or more (${d.silentDevices.length})` });
  blocks.push(
    d.silentDevices.length
      ? {
          kind: 'list',
          items: d.silentDevices.map(
            (s) =>
              `${s.displayName} (${s.email}): ${s.lastSeenAt ? `last heard ${formatSiteTime(s.lastSeenAt, d.site.timezone)}` : 'never synced'}${s.outboxSize ? `, ${s.outboxSize} not yet synced` : ''}`,
          ),
        }
      : { kind: 'para', text: 'Every device has synced within the last day.' },
  );
  if (boardLink) blocks.push({ kind: 'link', text: 'Open the Board', href: boardLink });
  blocks.push({ kind: 'para', text: 'You get this mail as a lead of the site. The time it comes is set in Setup (digest time).' });
  return { to, subject, text: renderText(blocks), html: renderHtml(subject, blocks) };
}
