/** Plain text and simple HTML from one outline, so the two parts of a mail always say the same. */
export type MailBlock =
  | { kind: 'heading'; text: string }
  | { kind: 'para'; text: string }
  | { kind: 'link'; text: string; href: string }
  | { kind: 'list'; items: string[] };

export const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

export function renderText(blocks: MailBlock[]): string {
  return (
    blocks
      .map((b) => {
        switch (b.kind) {
          case 'heading':
            return `${b.text}\n${'-'.repeat(Math.min(b.text.length, 60))}`;
          case 'para':
            return b.text;
          case 'link':
            return `${b.text}:\n${b.href}`;
          case 'list':
            return b.items.map((i) => `  - ${i}`).join('\n');
        }
      })
      .join('\n\n') + '\n'
  );
}

export function renderHtml(title: string, blocks: MailBlock[]): string {
  const body = blocks
    .map((b) => {
      switch (b.kind) {
        case 'heading':
          return `<h2 style="font-size:17px;margin:18px 0 6px">${escapeHtml(b.text)}</h2>`;
        case 'para':
          return `<p>${escapeHtml(b.text)}</p>`;
        case 'link':
          return `<p><a href="${escapeHtml(b.href)}">${escapeHtml(b.text)}</a></p>`;
        case 'list':
          return `<ul>${b.items.map((i) => `<li>${escapeHtml(i)}</li>`).join('')}</ul>`;
      }
    })
    .join('\n');
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>${escapeHtml(title)}</title></head>
<body style="font-family:sans-serif;font-size:15px;line-height:1.45;color:#1b1b1b;max-width:40em">
${body}
</body></html>`;
}
