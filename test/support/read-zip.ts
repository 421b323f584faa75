import { crc32 } from 'node:zlib';
import { fromBuffer, type Entry, type ZipFile } from 'yauzl';

/** Reads every entry of a ZIP with yauzl (an independent reader), checking each entry's CRC-32, which yauzl leaves to its caller. */
export async function readZip(zip: Buffer): Promise<Map<string, Buffer>> {
  const file = await new Promise<ZipFile>((resolve, reject) =>
    fromBuffer(zip, { lazyEntries: true, validateEntrySizes: true }, (err, z) => (err ? reject(err) : resolve(z))),
  );
  const files = new Map<string, Buffer>();
  await new Promise<void>((resolve, reject) => {
    file.on('error', reject);
    file.on('end', () => resolve());
    file.on('entry', (entry: Entry) => {
      file.openReadStream(entry, (err, stream) => {
        if (err) return reject(err);
        const parts: Buffer[] = [];
        stream.on('data', (b: Buffer) => parts.push(b));
        stream.on('error', reject);
        stream.on('end', () => {
          const data = Buffer.concat(parts);
          if (crc32(data) >>> 0 !== entry.crc32) return reject(new Error(`${entry.fileName}: CRC-32 mismatch`));
          files.set(entry.fileName, data);
          file.readEntry();
        });
      });
    });
    file.readEntry();
  });
  return files;
}
