/// <reference lib="dom" />
// Callbacks passed to page.evaluate() run in the browser and use its DOM types.
import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { Page } from 'playwright-core';

/** The part of pngjs (installed with qrcode; it ships no types) that these tests use. */
interface PngImage {
  width: number;
  height: number;
  data: Buffer;
}
// eslint-disable-next-line @typescript-eslint/no-require-imports
const { PNG } = require('pngjs') as {
  PNG: (new (o: { width: number; height: number }) => PngImage) & { sync: { read(b: Buffer): PngImage; write(p: PngImage): Buffer } };
};

export const PHONE = { width: 390, height: 844 };

/**
 * Picks an option of a Material select by its label, as a person does: open, then choose. A Material
 * select does not open while it has no options, and its options may still be loading (a live query or
 * a request): open again until the option is there. A multiple select stays open after a choice.
 */
export async function choose(page: Page, label: string, option: string | RegExp, opts: { multiple?: boolean } = {}): Promise<void> {
  const listbox = page.getByRole('listbox');
  const wanted = page.getByRole('option', { name: option }).first();
  const deadline = Date.now() + 30_000;
  for (;;) {
    if (!(await listbox.isVisible())) await page.getByRole('combobox', { name: label }).click();
    try {
      await wanted.waitFor({ timeout: 3_000 });
      break;
    } catch (err) {
      if (Date.now() > deadline) throw err;
      if (await listbox.isVisible()) await page.keyboard.press('Escape');
    }
  }
  await wanted.click();
  if (!opts.multiple) await listbox.waitFor({ state: 'detached' });
}

/** The same with the keyboard only: focus, open with Space, arrow to the option, Enter. */
export async function chooseByKeyboard(page: Page, label: string, option: string): Promise<void> {
  const select = page.getByRole('combobox', { name: label });
  await select.focus();
  await page.keyboard.press('Space');
  const options = page.getByRole('option');
  await options.first().waitFor();
  const names = (await options.allInnerTexts()).map((t) => t.trim());
  const target = names.indexOf(option);
  if (target < 0) throw new Error(`no option "${option}" in ${names.join(', ')}`);
  const active = names.findIndex((_, i) => i === 0);
  for (let i = active; i < target; i++) await page.keyboard.press('ArrowDown');
  await page.keyboard.press('Enter');
  await page.getByRole('listbox').waitFor({ state: 'detached' });
}

/** A camera-sized test photo (gradient with a dark disc where the collar would be), as PNG bytes. */
export function testPhoto(width = 2000, height = 1500): Buffer {
  const png = new PNG({ width, height });
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const i = (y * width + x) * 4;
      const inRing = (x - width / 2) ** 2 + (y - height / 2) ** 2 < (height / 4) ** 2;
      png.data[i] = inRing ? 40 : Math.round((x / width) * 200);
      png.data[i + 1] = inRing ? 40 : Math.round((y / height) * 180) + 40;
      png.data[i + 2] = inRing ? 40 : 90;
      png.data[i + 3] = 255;
    }
  }
  return PNG.sync.write(png);
}

export interface DeviceBlob {
  size: number;
  type: string;
  sha256: string;
  attachment: Record<string, unknown> | null;
}

/** Reads a kept photo straight from the device's IndexedDB: the bytes, their SHA-256 and the attachment record. */
export async function deviceBlob(page: Page, userId: string, ownerId: string): Promise<DeviceBlob[]> {
  return page.evaluate(
    async ({ dbName, owner }) => {
      const db = await new Promise<IDBDatabase>((resolve, reject) => {
        const r = indexedDB.open(dbName);
        r.onsuccess = () => resolve(r.result);
        r.onerror = () => reject(r.error);
      });
      const all = <T>(store: string) =>
        new Promise<T[]>((resolve, reject) => {
          const r = db.transaction(store).objectStore(store).getAll();
          r.onsuccess = () => resolve(r.result as T[]);
          r.onerror = () => reject(r.error);
        });
      const atts = (await all<Record<string, unknown>>('attachment')).filter((a) => a['ownerId'] === owner);
      const blobs = await all<{ attachmentId: string; blob: Blob }>('blobs');
      const out = [];
      for (const a of atts) {
        const row = blobs.find((b) => b.attachmentId === a['id']);
        if (!row) {
          out.push({ size: 0, type: '', sha256: '', attachment: a });
          continue;
        }
        const digest = await crypto.subtle.digest('SHA-256', await row.blob.arrayBuffer());
        const hex = Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, '0')).join('');
        out.push({ size: row.blob.size, type: row.blob.type, sha256: hex, attachment: a });
      }
      db.close();
      return out;
    },
    { dbName: `fluxwalk-user-${userId}`, owner: ownerId },
  );
}

/** README screenshots at phone size, written only when asked (WALK_SCREENSHOTS=1), so normal runs leave the tree alone. */
export async function readmeShot(page: Page, name: string): Promise<void> {
  if (process.env['WALK_SCREENSHOTS'] !== '1') return;
  const dir = path.resolve(__dirname, '../../../docs/screenshots');
  mkdirSync(dir, { recursive: true });
  await page.screenshot({ path: path.join(dir, `${name}.png`) });
}
