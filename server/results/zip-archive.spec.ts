import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { readZip } from '../../test/support/read-zip';
import { ZipWriter } from './zip-archive';

describe('results archive writer', () => {
  it('when text, bytes and streamed chunks are written, then reading the archive gives them back byte for byte', async () => {
    const z = new ZipWriter(new Date(Date.UTC(2026, 9, 31, 12, 30, 14)));
    const bytes = Buffer.from([0, 1, 2, 250, 255]);
    await z.add('a.csv', 'x,y\n1,2\n');
    await z.add('dir/b.bin', bytes);
    async function* rows() {
      for (let i = 0; i < 20000; i++) yield `${i},µ${i * 2}\n`;
    }
    await z.add('series.csv', rows());
    const files = await readZip(await z.finish());
    expect([...files.keys()]).toEqual(['a.csv', 'dir/b.bin', 'series.csv']);
    expect(files.get('a.csv')!.toString()).toBe('x,y\n1,2\n');
    expect(files.get('dir/b.bin')).toEqual(bytes);
    const lines = files.get('series.csv')!.toString('utf8').split('\n');
    expect(lines[19999]).toBe('19999,µ39998');
  });

  it('when a streamed entry is added, then it has been read to its end before the next line runs (row counts are final)', async () => {
    const z = new ZipWriter();
    let counted = 0;
    async function* rows() {
      for (let i = 0; i < 5000; i++) {
        counted++;
        yield `${i}\n`;
      }
    }
    await z.add('t.csv', rows());
    expect(counted).toBe(5000);
    await z.add('counts.json', JSON.stringify({ counted }));
    expect((await readZip(await z.finish())).get('counts.json')!.toString()).toBe('{"counted":5000}');
  });

  it('when a streamed entry fails, then the archive is refused instead of written short', async () => {
    const z = new ZipWriter();
    async function* rows() {
      yield 'a\n';
      throw new Error('source went away');
    }
    await expect(z.add('t.csv', rows())).rejects.toThrow('source went away');
  });

  it('when the system unzip tool checks the archive, then every entry tests OK', async () => {
    // An independent reader: Info-ZIP's unzip (present on the test machines with the PostgreSQL tools).
    const z = new ZipWriter();
    await z.add('datapackage.json', '{"name":"x"}');
    await z.add('data/t.csv', 'a\n1\n');
    const dir = mkdtempSync(path.join(tmpdir(), 'fw-zip-'));
    const file = path.join(dir, 't.zip');
    writeFileSync(file, await z.finish());
    const out = execFileSync('unzip', ['-t', file]).toString();
    expect(out).toContain('No errors detected');
  });

  it('when a byte of an entry is damaged, then reading fails on the CRC instead of returning wrong data', async () => {
    const z = new ZipWriter();
    await z.add('a.txt', Buffer.alloc(64, 65));
    await z.add('b.txt', 'after');
    const zip = await z.finish();
    const broken = Buffer.from(zip);
    broken[30 + 'a.txt'.length + 1] ^= 0xff;
    await expect(readZip(broken)).rejects.toThrow();
  });
});
