/**
 * A small ZIP writer and reader (PKWARE APPNOTE 6.3.x: local headers, central directory, end
 * record; method 8 = raw DEFLATE, RFC 1951) on Node's own zlib, so no archive package is needed.
 * Entries are deflated as they stream in, so a season's raw series never sits in memory twice.
 * No ZIP64: an entry or archive past 4 GiB is refused rather than written wrong.
 */
import { once } from 'node:events';
import { crc32, createDeflateRaw, inflateRawSync } from 'node:zlib';

interface Written { name: Buffer; crc: number; size: number; csize: number; offset: number; time: number; date: number }

const MAX32 = 0xffffffff;

function dosDateTime(d: Date): { time: number; date: number } {
  return {
    time: (d.getUTCHours() << 11) | (d.getUTCMinutes() << 5) | Math.floor(d.getUTCSeconds() / 2),
    date: ((d.getUTCFullYear() - 1980) << 9) | ((d.getUTCMonth() + 1) << 5) | d.getUTCDate(),
  };
}

export class ZipWriter {
  private readonly parts: Buffer[] = [];
  private readonly entries: Written[] = [];
  private offset = 0;
  private readonly stamp: { time: number; date: number };

  constructor(at = new Date()) {
    this.stamp = dosDateTime(at);
  }

  /** Adds one file from text or bytes, or from chunks produced one after another. */
  async add(name: string, content: string | Buffer | Iterable<string | Buffer> | AsyncIterable<string | Buffer>): Promise<void> {
    const chunks = typeof content === 'string' || Buffer.isBuffer(content) ? [content] : content;
    const deflate = createDeflateRaw({ level: 6 });
    const out: Buffer[] = [];
    deflate.on('data', (b: Buffer) => out.push(b));
    const ended = once(deflate, 'end');
    let crc = 0;
    let size = 0;
    // Small chunks (one CSV row each) are gathered into ~256 kB writes: far fewer trips through the stream.
    let pending: Buffer[] = [];
    let pendingBytes = 0;
    const flush = async () => {
      const b = Buffer.concat(pending);
      pending = [];
      pendingBytes = 0;
      crc = crc32(b, crc);
      size += b.length;
      if (!deflate.write(b)) await once(deflate, 'drain');
    };
    for await (const c of chunks as AsyncIterable<string | Buffer>) {
      const b = typeof c === 'string' ? Buffer.from(c, 'utf8') : c;
      pending.push(b);
      pendingBytes += b.length;
      if (pendingBytes >= 262_144) await flush();
    }
    await flush();
    deflate.end();
    await ended;
    const data = Buffer.concat(out);
    if (size > MAX32 || this.offset + data.length > MAX32) throw new Error(`${name} is too large for a ZIP without ZIP64`);
    const nameBuf = Buffer.from(name, 'utf8');
    const header = Buffer.alloc(30);
    header.writeUInt32LE(0x04034b50, 0);
    header.writeUInt16LE(20, 4); // version needed: 2.0 (deflate)
    header.writeUInt16LE(0x0800, 6); // names are UTF-8
    header.writeUInt16LE(8, 8);
    header.writeUInt16LE(this.stamp.time, 10);
    header.writeUInt16LE(this.stamp.date, 12);
    header.writeUInt32LE(crc >>> 0, 14);
    header.writeUInt32LE(data.length, 18);
    header.writeUInt32LE(size, 22);
    header.writeUInt16LE(nameBuf.length, 26);
    header.writeUInt16LE(0, 28);
    this.entries.push({ name: nameBuf, crc: crc >>> 0, size, csize: data.length, offset: this.offset, ...this.stamp });
    this.parts.push(header, nameBuf, data);
    this.offset += header.length + nameBuf.length + data.length;
  }

  /** The whole archive: entries, central directory and end record. */
  finish(): Buffer {
    const central: Buffer[] = [];
    let cdSize = 0;
    for (const e of this.entries) {
      const h = Buffer.alloc(46);
      h.writeUInt32LE(0x02014b50, 0);
      h.writeUInt16LE(20, 4);
      h.writeUInt16LE(20, 6);
      h.writeUInt16LE(0x0800, 8);
      h.writeUInt16LE(8, 10);
      h.writeUInt16LE(e.time, 12);
      h.writeUInt16LE(e.date, 14);
      h.writeUInt32LE(e.crc, 16);
      h.writeUInt32LE(e.csize, 20);
      h.writeUInt32LE(e.size, 24);
      h.writeUInt16LE(e.name.length, 28);
      h.writeUInt32LE(e.offset, 42);
      central.push(h, e.name);
      cdSize += h.length + e.name.length;
    }
    const end = Buffer.alloc(22);
    end.writeUInt32LE(0x06054b50, 0);
    end.writeUInt16LE(this.entries.length, 8);
    end.writeUInt16LE(this.entries.length, 10);
    end.writeUInt32LE(cdSize, 12);
    end.writeUInt32LE(this.offset, 16);
    return Buffer.concat([...this.parts, ...central, end]);
  }
}

/** Reads every entry of a ZIP (stored or deflated), checking each CRC-32. */
export function readZip(zip: Buffer): Map<string, Buffer> {
  let eocd = -1;
  for (let i = zip.length - 22; i >= Math.max(0, zip.length - 22 - 0xffff); i--) {
    if (zip.readUInt32LE(i) === 0x06054b50) { eocd = i; break; }
  }
  if (eocd < 0) throw new Error('not a ZIP archive: no end record');
  const count = zip.readUInt16LE(eocd + 10);
  let p = zip.readUInt32LE(eocd + 16);
  const files = new Map<string, Buffer>();
  for (let n = 0; n < count; n++) {
    if (zip.readUInt32LE(p) !== 0x02014b50) throw new Error('broken central directory');
    const method = zip.readUInt16LE(p + 10);
    const crc = zip.readUInt32LE(p + 16);
    const csize = zip.readUInt32LE(p + 20);
    const nameLen = zip.readUInt16LE(p + 28);
    const extraLen = zip.readUInt16LE(p + 30);
    const commentLen = zip.readUInt16LE(p + 32);
    const local = zip.readUInt32LE(p + 42);
    const name = zip.subarray(p + 46, p + 46 + nameLen).toString('utf8');
    const start = local + 30 + zip.readUInt16LE(local + 26) + zip.readUInt16LE(local + 28);
    const raw = zip.subarray(start, start + csize);
    const data = method === 8 ? inflateRawSync(raw) : method === 0 ? Buffer.from(raw) : null;
    if (!data) throw new Error(`${name}: compression method ${method} is not supported`);
    if ((crc32(data) >>> 0) !== crc) throw new Error(`${name}: CRC-32 mismatch`);
    files.set(name, data);
    p += 46 + nameLen + extraLen + commentLen;
  }
  return files;
}
