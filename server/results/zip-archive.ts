/**
 * Writes the results archive with yazl (deflate on Node's zlib, ZIP64 when an entry or the
 * archive passes 4 GiB). Each entry is read to its end before `add` returns, so code that counts
 * rows while a table streams in can use the counts for the entries that follow.
 */
import { once } from 'node:events';
import { Readable } from 'node:stream';
import { finished } from 'node:stream/promises';
import { ZipFile } from 'yazl';

type Content = string | Buffer | Iterable<string | Buffer> | AsyncIterable<string | Buffer>;

export class ZipWriter {
  private readonly zip = new ZipFile();
  private readonly output: Promise<Buffer>;

  constructor(private readonly at = new Date()) {
    const parts: Buffer[] = [];
    this.zip.outputStream.on('data', (b: Buffer) => parts.push(b));
    this.output = once(this.zip.outputStream, 'end').then(() => Buffer.concat(parts));
    // A failed entry must reject finish() rather than leave an unhandled rejection behind.
    this.output.catch(() => undefined);
  }

  /** Adds one file from text or bytes, or from chunks produced one after another. */
  async add(name: string, content: Content): Promise<void> {
    if (typeof content === 'string' || Buffer.isBuffer(content)) {
      this.zip.addBuffer(typeof content === 'string' ? Buffer.from(content, 'utf8') : content, name, { mtime: this.at });
      return;
    }
    const stream = Readable.from(gathered(content), { objectMode: false });
    this.zip.addReadStream(stream, name, { mtime: this.at });
    await finished(stream);
  }

  /** The whole archive: entries, central directory and end record. */
  async finish(): Promise<Buffer> {
    this.zip.end();
    return this.output;
  }
}

/** Small chunks (one CSV row each) are gathered into ~256 kB writes: far fewer trips through the stream. */
async function* gathered(chunks: Iterable<string | Buffer> | AsyncIterable<string | Buffer>): AsyncGenerator<Buffer> {
  let pending: Buffer[] = [];
  let bytes = 0;
  for await (const c of chunks) {
    const b = typeof c === 'string' ? Buffer.from(c, 'utf8') : c;
    pending.push(b);
    bytes += b.length;
    if (bytes >= 262_144) {
      yield Buffer.concat(pending);
      pending = [];
      bytes = 0;
    }
  }
  if (bytes) yield Buffer.concat(pending);
}
