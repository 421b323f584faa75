import type { Digest } from './digest-content';
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
      blocks.push({ kind: 'para', text: `${r.routeName}: ${r.due.length} due, ${r.partial.length} partial, ${r.complete} complete, ${r.skipped} skipped.` });
      const items: string[] = [];
      if (r.due.length) items.push(`Due (${r.due.length}): ${r.due.join(', ')}`);
      for (const p of r.partial) items.push(`Partial ${p.code}: still needs ${p.missing.join(', ')}`);
      if (items.length) blocks.push({ kind: 'list', items });
    }
  }
  blocks.push({ kind: 'heading', text: `Worth a look (${d.anomalies.total}, ${d.anomalies.problems} to act on)` });
  if (d.anomalies.total) {
    blocks.push({ kind: 'list', items: d.anomalies.items.map((a) => `${a.severity === 'problem' ? 'Act: ' : ''}${a.collarCode ? `${a.collarCode}: ` : ''}${a.message}`) });
    if (d.anomalies.total > d.anomalies.items.length) blocks.push({ kind: 'para', text: `… and ${d.anomalies.total - d.anomalies.items.length} more on the Board.` });
  } else {
    blocks.push({ kind: 'para', text: 'Nothing unusual found.' });
  }
  blocks.push({ kind: 'heading', text: `Devices silent for a day or more (${d.silentDevices.length})` });
  blocks.push(d.silentDevices.length
    ? { kind: 'list', items: d.silentDevices.map((s) => `${s.displayName} (${s.email}): ${s.lastSeenAt ? `last heard ${s.lastSeenAt.slice(0, 16).replace('T', ' ')} UTC` : 'never synced'}${s.outboxSize ? `, ${s.outboxSize} not yet synced` : ''}`) }
    : { kind: 'para', text: 'Every device has synced within the last day.' });
  if (boardLink) blocks.push({ kind: 'link', text: 'Open the Board', href: boardLink });
  blocks.push({ kind: 'para', text: 'You get this mail as a lead of the site. The time it comes is set in Setup (digest time).' });
  return { to, subject, text: renderText(blocks), html: renderHtml(subject, blocks) };
}
