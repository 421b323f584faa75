// The visit screen hosts the closure panel, whose logger reader starts a module Web Worker via
// import.meta (not loadable under CommonJS jest); nothing here reads logger files.
jest.mock('../closures/logger-reader', () => ({ readLoggerFile: jest.fn() }));
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { Router, provideRouter, withComponentInputBinding } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { readFileSync } from 'node:fs';
import path from 'node:path';

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
import type { CollarTag } from '../../../../shared/model/collar-tag';
import { signedInDevice, TEST_SITE } from '../../core/db/testing/signed-in-device';
import { until } from '../../core/db/testing/until';
import { CameraFrames, type Frame } from './camera-frames';
import { QrScan } from './qr-scan';
import { WALK_ROUTES } from './walk-routes';

// Made by tools/make-walk-qr-fixtures.js with the `qrcode` package, as the tag sheet encodes a tag.
const FIXTURES = path.resolve(__dirname, '../../../../test/fixtures/walk');
const TAG_COLLAR_ID = '3b9d6c1e-2f4a-4e8b-9c7d-5a1b2c3d4e5f';
const BLANK_TAG_ID = '9e8d7c6b-5a49-4382-a716-0f1e2d3c4b5a';

function fixtureFrame(name: string): Frame {
  const png = PNG.sync.read(readFileSync(path.join(FIXTURES, name)));
  return {
    pixels: { data: new Uint8ClampedArray(png.data.buffer, png.data.byteOffset, png.data.length), width: png.width, height: png.height },
  };
}

/** A camera that shows one still frame (the fixture) instead of a video stream. */
class StillCamera {
  started = 0;
  stopped = 0;
  constructor(private readonly frame: Frame) {}
  get available() {
    return true;
  }
  async start() {
    this.started++;
  }
  async grab() {
    return this.frame;
  }
  async fromFile() {
    return this.frame;
  }
  stop() {
    this.stopped++;
  }
}

describe('QR open path', () => {
  afterEach(() => localStorage.clear());

  /** The scanner on a device where `onDevice` collars exist, its camera showing `fixture`. */
  async function scan(fixture: string, opts: { purpose?: 'open' | 'adopt'; onDevice?: string[] } = {}) {
    const camera = new StillCamera(fixtureFrame(fixture));
    const { db } = await signedInDevice([provideRouter([]), { provide: CameraFrames, useValue: camera }]);
    for (const id of opts.onDevice ?? []) await db.records('collar').put({ id, rev: 1, siteId: TEST_SITE, code: 'W-01', deleted: false });
    const router = TestBed.inject(Router);
    const opened: unknown[][] = [];
    jest.spyOn(router, 'navigate').mockImplementation(async (...args) => {
      opened.push(args);
      return true;
    });
    const fixtureRef = TestBed.createComponent(QrScan);
    if (opts.purpose) fixtureRef.componentRef.setInput('purpose', opts.purpose);
    const read: CollarTag[] = [];
    fixtureRef.componentInstance.tagRead.subscribe((t) => read.push(t));
    const loader = TestbedHarnessEnvironment.loader(fixtureRef);
    // BarcodeDetector does not exist here (as in Firefox and older Safari): the jsQR fallback decodes.
    expect((globalThis as { BarcodeDetector?: unknown }).BarcodeDetector).toBeUndefined();
    await (await loader.getHarness(MatButtonHarness.with({ text: opts.purpose === 'adopt' ? 'Scan the new tag' : 'Scan a tag' }))).click();
    const status = () => (fixtureRef.nativeElement as HTMLElement).querySelector('[data-testid="qr-status"]')?.textContent ?? '';
    return { camera, opened, read, status, fixtureRef };
  }

  it('when the camera sees the tag of a collar on the device, then the id is taken from the end of the address and its visit opens', async () => {
    const { camera, opened } = await scan('collar-tag-qr.png', { onDevice: [TAG_COLLAR_ID] });
    await until(() => opened.length > 0, 'the collar to open');
    expect(opened).toEqual([[['/walk/visit', TAG_COLLAR_ID], {}]]);
    expect(camera.stopped).toBe(1);
  });

  it('when the camera sees a blank tag no collar has, then the install screen opens with the tag and its planned code', async () => {
    const { opened } = await scan('blank-tag-qr.png', { onDevice: [TAG_COLLAR_ID] });
    await until(() => opened.length > 0, 'the install screen');
    expect(opened).toEqual([[['/walk/install'], { queryParams: { tag: BLANK_TAG_ID, code: 'N-07' } }]]);
  });

  it('when the install screen scans a blank tag, then the tag is handed over and nothing navigates', async () => {
    const { opened, read, status } = await scan('blank-tag-qr.png', { purpose: 'adopt' });
    await until(() => read.length > 0, 'the tag');
    expect(read).toEqual([{ id: BLANK_TAG_ID, code: 'N-07' }]);
    expect(opened).toEqual([]);
    expect(status()).toBe('Tag read.');
  });

  it('when the camera sees a QR code that is not a collar tag, then nothing opens and the crew is told', async () => {
    const { opened, status, fixtureRef } = await scan('not-a-tag-qr.png');
    await until(() => status().includes('not a Fluxwalk collar tag'), 'the message');
    expect(opened).toEqual([]);
    fixtureRef.destroy();
  });

  it("when a tag address is opened directly (phone camera app), then Walk goes on to that collar's visit, or to install for a blank tag", async () => {
    const { db } = await signedInDevice([provideRouter([{ path: 'walk', children: WALK_ROUTES }], withComponentInputBinding())]);
    await db.records('collar').put({ id: TAG_COLLAR_ID, rev: 1, siteId: TEST_SITE, code: 'W-01', deleted: false });
    const harness = await RouterTestingHarness.create();
    const router = TestBed.inject(Router);
    await harness.navigateByUrl(`/walk/collars/${TAG_COLLAR_ID.toUpperCase()}`);
    await until(() => router.url === `/walk/visit/${TAG_COLLAR_ID}`, 'the redirect to the visit');
    await harness.navigateByUrl(`/walk/collars/${BLANK_TAG_ID}?code=N-07`);
    await until(() => router.url.startsWith('/walk/install'), 'the redirect to install');
    expect(router.url).toBe(`/walk/install?tag=${BLANK_TAG_ID}&code=N-07`);
  });
});
