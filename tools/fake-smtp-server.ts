import { SMTPServer } from 'smtp-server';

/** One message as the fake SMTP server received it, with the parts a test or a person reads. */
export interface CapturedMail {
  id: number;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string;
  raw: string;
}

export interface FakeSmtp {
  host: string;
  port: number;
  messages(): CapturedMail[];
  /** Messages to one address (case-insensitive), oldest first. */
  messagesTo(address: string): CapturedMail[];
  /** Resolves with the first message to `address` after the `seen` already-known ones, or rejects after `timeoutMs`. */
  waitFor(address: string, opts?: { seen?: number; timeoutMs?: number }): Promise<CapturedMail>;
  clear(): void;
  close(): Promise<void>;
}

/**
 * A local SMTP server on loopback that accepts every message and keeps it in memory. Used
 * in-process by the tests and as a process of its own by `npm start` (tools/fake-smtp.ts).
 * No TLS (loopback only); any user name and password are accepted.
 */
export async function startFakeSmtp(opts: { port?: number; host?: string } = {}): Promise<FakeSmtp> {
  const host = opts.host ?? '127.0.0.1';
  const kept: CapturedMail[] = [];
  const waiters = new Set<() => void>();
  let nextId = 1;
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    banner: 'Fluxwalk fake SMTP (messages are kept, never delivered)',
    onAuth: (auth, _session, cb) => cb(null, { user: auth.username ?? 'anyone' }),
    onData: (stream, session, cb) => {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const raw = Buffer.concat(chunks).toString('utf8');
        const envelope = session.envelope;
        const from = envelope.mailFrom ? envelope.mailFrom.address : '';
        kept.push({
          id: nextId++,
          receivedAt: new Date().toISOString(),
          from,
          to: envelope.rcptTo.map((r) => r.address.toLowerCase()),
          ...parseMail(raw),
          raw,
        });
        for (const w of [...waiters]) w();
        cb();
      });
    },
  });
  const port = await new Promise<number>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port ?? 0, host, () => {
      const addr = server.server.address();
      resolve(typeof addr === 'object' && addr ? addr.port : 0);
    });
  });
  const messagesTo = (address: string) => kept.filter((m) => m.to.includes(address.toLowerCase()));
  return {
    host,
    port,
    messages: () => [...kept],
    messagesTo,
    waitFor(address, { seen = 0, timeoutMs = 15_000 } = {}) {
      return new Promise((resolve, reject) => {
        const check = () => {
          const list = messagesTo(address);
          if (list.length > seen) {
            waiters.delete(check);
            clearTimeout(timer);
            resolve(list[seen]);
          }
        };
        const timer = setTimeout(() => {
          waiters.delete(check);
          reject(new Error(`no mail to ${address} within ${timeoutMs} ms (have ${messagesTo(address).length}, wanted more than ${seen})`));
        }, timeoutMs);
        waiters.add(check);
        check();
      });
    },
    clear: () => {
      kept.length = 0;
    },
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

/**
 * Just enough MIME to read what our own mailer sends: headers (folded lines, RFC 2047 encoded
 * words), one level of multipart, quoted-printable and base64 bodies. Not a general parser.
 */
export function parseMail(raw: string): { subject: string; text: string; html: string } {
  const { headers, body } = splitHeaders(raw);
  const out = { subject: decodeWords(headers.get('subject') ?? ''), text: '', html: '' };
  const readPart = (h: Map<string, string>, b: string) => {
    const type = (h.get('content-type') ?? 'text/plain').toLowerCase();
    const boundary = /boundary="?([^";]+)"?/i.exec(h.get('content-type') ?? '')?.[1];
    if (type.startsWith('multipart/') && boundary) {
      for (const part of b.split(`--${boundary}`).slice(1)) {
        if (part.startsWith('--')) break;
        const p = splitHeaders(part.replace(/^\r?\n/, ''));
        readPart(p.headers, p.body);
      }
      return;
    }
    const decoded = decodeBody(b, (h.get('content-transfer-encoding') ?? '7bit').toLowerCase());
    if (type.startsWith('text/html')) out.html ||= decoded;
    else if (type.startsWith('text/plain')) out.text ||= decoded;
  };
  readPart(headers, body);
  return out;
}

function splitHeaders(raw: string): { headers: Map<string, string>; body: string } {
  const at = raw.search(/\r?\n\r?\n/);
  const head = at < 0 ? raw : raw.slice(0, at);
  const body = at < 0 ? '' : raw.slice(at).replace(/^\r?\n\r?\n/, '');
  const headers = new Map<string, string>();
  for (const line of head.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/)) {
    const i = line.indexOf(':');
    if (i > 0) headers.set(line.slice(0, i).trim().toLowerCase(), line.slice(i + 1).trim());
  }
  return { headers, body };
}

function decodeBody(body: string, encoding: string): string {
  if (encoding === 'base64') return Buffer.from(body.replace(/\s+/g, ''), 'base64').toString('utf8');
  if (encoding === 'quoted-printable') return decodeQuotedPrintable(body);
  return body;
}

function decodeQuotedPrintable(s: string): string {
  const soft = s.replace(/=\r?\n/g, '');
  const bytes: number[] = [];
  for (let i = 0; i < soft.length; i++) {
    if (soft[i] === '=' && /^[0-9A-F]{2}$/i.test(soft.slice(i + 1, i + 3))) {
      bytes.push(parseInt(soft.slice(i + 1, i + 3), 16));
      i += 2;
    } else {
      bytes.push(...Buffer.from(soft[i], 'utf8'));
    }
  }
  return Buffer.from(bytes).toString('utf8');
}

function decodeWords(s: string): string {
  return s
    .replace(/\?=\s+=\?/g, '?==?')
    .replace(/=\?([^?]+)\?([BQ])\?([^?]*)\?=/gi, (_m, _charset: string, enc: string, data: string) =>
      enc.toUpperCase() === 'B' ? Buffer.from(data, 'base64').toString('utf8') : decodeQuotedPrintable(data.replace(/_/g, ' ')),
    );
}
