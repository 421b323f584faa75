import { provideHttpClient } from '@angular/common/http';

// The visit screen hosts the closure panel, whose logger reader starts a module Web Worker via
// import.meta (not loadable under CommonJS jest); nothing here reads logger files.
jest.mock('../closures/logger-reader', () => ({ readLoggerFile: jest.fn() }));
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { Router, provideRouter, withComponentInputBinding } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { readFileSync } from 'node:fs';
import path from 'node:path';

/** The part of pngjs (installed with qrcode; it ships no types) that these tests use. */
interface PngImage { width: number; height: number; data: Buffer }
// eslint-disable-next-line @typescript-eslint/no-require-imports
const { PNG } = require('pngjs') as {
  PNG: (new (o: { width: number; height: number }) => PngImage) & { sync: { read(b: Buffer): PngImage; write(p: PngImage): Buffer } };
};
import { CameraFrames, type Frame } from './camera-frames';
import { QrScan } from './qr-scan';
import { WALK_ROUTES } from './walk-routes';

// Made by tools/make-walk-qr-fixtures.js with the `qrcode` package, as the tag sheet encodes a tag.
const FIXTURES = path.resolve(__dirname, '../../../../test/fixtures/walk');
const TAG_COLLAR_ID = '3b9d6c1e-2f4a-4e8b-9c7d-5a1b2c3d4e5f';

function fixtureFrame(name: string): Frame {
  const png = PNG.sync.read(readFileSync(path.join(FIXTURES, name)));
  return { pixels: { data: new Uint8ClampedArray(png.data.buffer, png.data.byteOffset, png.data.length), width: png.width, height: png.height } };
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

async function until(probe: () => boolean, what: string): Promise<void> {
  for (let i = 0; i < 400; i++) {
    TestBed.tick();
    if (probe()) return;
    await new Promise((r) => setTimeout(r, 10));
  }
  throw new Error(`timed out waiting for ${what}`);
}

describe('QR open path', () => {
  async function scan(fixture: string) {
    const camera = new StillCamera(fixtureFrame(fixture));
    TestBed.configureTestingModule({ imports: [QrScan], providers: [provideRouter([]), { provide: CameraFrames, useValue: camera }] });
    const router = TestBed.inject(Router);
    const opened: string[] = [];
    jest.spyOn(router, 'navigateByUrl').mockImplementation(async (url) => {
      opened.push(String(url));
      return true;
    });
    const fixtureRef = TestBed.createComponent(QrScan);
    const loader = TestbedHarnessEnvironment.loader(fixtureRef);
    // BarcodeDetector does not exist here (as in Firefox and older Safari): the jsQR fallback decodes.
    expect((globalThis as { BarcodeDetector?: unknown }).BarcodeDetector).toBeUndefined();
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Scan a tag' }))).click();
    const status = () => (fixtureRef.nativeElement as HTMLElement).querySelector('[data-testid="qr-status"]')?.textContent ?? '';
    return { camera, opened, status, fixtureRef };
  }

  it('when the camera sees a collar tag, then the collar id is taken from the end of the address and its visit opens', async () => {
    const { camera, opened } = await scan('collar-tag-qr.png');
    await until(() => opened.length > 0, 'the collar to open');
    expect(opened).toEqual([`/walk/visit/${TAG_COLLAR_ID}`]);
    expect(camera.stopped).toBe(1);
  });

  it('when the camera sees a QR code that is not a collar tag, then nothing opens and the crew is told', async () => {
    const { opened, status, fixtureRef } = await scan('not-a-tag-qr.png');
    await until(() => status().includes('not a Fluxwalk collar tag'), 'the message');
    expect(opened).toEqual([]);
    fixtureRef.destroy();
  });

  it('when a tag address is opened directly (phone camera app), then Walk goes on to that collar\'s visit', async () => {
    TestBed.configureTestingModule({ providers: [provideRouter([{ path: 'walk', children: WALK_ROUTES }], withComponentInputBinding()), provideHttpClient(), provideHttpClientTesting()] });
    const harness = await RouterTestingHarness.create();
    await harness.navigateByUrl(`/walk/collars/${TAG_COLLAR_ID.toUpperCase()}`);
    await until(() => TestBed.inject(Router).url === `/walk/visit/${TAG_COLLAR_ID}`, 'the redirect');
    expect(TestBed.inject(Router).url).toBe(`/walk/visit/${TAG_COLLAR_ID}`);
  });
});
