import { writeFileSync } from 'node:fs';
import { createServer, type ServerResponse } from 'node:http';
import { startFakeSmtp, type CapturedMail, type FakeSmtp } from './fake-smtp-server';

/**
 * The development mail catcher started by tools/fake-smtp.sh (npm start, npm test): SMTP on
 * 127.0.0.1:--smtp-port keeps every message; a small inbox page on 127.0.0.1:--web-port shows
 * them (GET / as HTML, GET /messages.json for scripts). It exits when the --parent process does,
 * so the shell that started it needs no cleanup of its own.
 */
function arg(name: string, fallback: string): string {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 && process.argv[i + 1] ? process.argv[i + 1] : fallback;
}

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

function inboxPage(mails: CapturedMail[]): string {
  const rows = [...mails]
    .reverse()
    .map(
      (m) => `
    <article>
      <h2>${esc(m.subject || '(no subject)')}</h2>
      <p class="meta">#${m.id} · ${esc(m.receivedAt)} · from ${esc(m.from)} · to ${esc(m.to.join(', '))}</p>
      <pre>${esc(m.text || m.html)}</pre>
    </article>`,
    )
    .join('');
  // The HTML part of a mail is shown as text on purpose: the inbox must never run a message's markup.
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Fluxwalk development inbox</title>
<style>body{font:15px/1.4 system-ui,sans-serif;margin:1rem auto;max-width:60rem;padding:0 1rem}
article{border-top:1px solid #999;padding:.5rem 0}.meta{color:#444;font-size:.85rem}pre{white-space:pre-wrap}</style></head>
<body><h1>Development inbox</h1><p>${mails.length} message(s) caught by the fake SMTP server; nothing here left this machine.</p>${rows || '<p>No mail yet.</p>'}</body></html>`;
}

function serveInbox(smtp: FakeSmtp, port: number, host: string): Promise<void> {
  const send = (res: ServerResponse, type: string, body: string) => {
    res.writeHead(200, { 'Content-Type': `${type}; charset=utf-8`, 'Cache-Control': 'no-store' });
    res.end(body);
  };
  const web = createServer((req, res) => {
    if (req.url === '/messages.json') return send(res, 'application/json', JSON.stringify(smtp.messages()));
    if (req.url === '/' || req.url === '') return send(res, 'text/html', inboxPage(smtp.messages()));
    res.writeHead(404).end();
  });
  return new Promise((resolve, reject) => {
    web.once('error', reject);
    web.listen(port, host, () => resolve());
  });
}

async function main(): Promise<void> {
  const host = '127.0.0.1';
  const smtp = await startFakeSmtp({ host, port: Number(arg('smtp-port', '2525')) });
  const webPort = Number(arg('web-port', '8025'));
  await serveInbox(smtp, webPort, host);
  console.log(`[fake-smtp] SMTP on ${host}:${smtp.port}; inbox at http://${host}:${webPort}/`);
  const readyFile = arg('ready-file', '');
  if (readyFile) writeFileSync(readyFile, String(smtp.port));
  const parent = Number(arg('parent', '0'));
  if (parent > 0) {
    setInterval(() => {
      try {
        process.kill(parent, 0);
      } catch {
        process.exit(0);
      }
    }, 2000).unref();
  }
  const stop = () => void smtp.close().finally(() => process.exit(0));
  process.on('SIGTERM', stop);
  process.on('SIGINT', stop);
}

main().catch((err: Error) => {
  console.error(`[fake-smtp] could not start: ${err.message}`);
  process.exit(1);
});
