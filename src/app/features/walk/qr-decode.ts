import jsQR from 'jsqr';

export interface Pixels {
  data: Uint8ClampedArray;
  width: number;
  height: number;
}

interface DetectorLike {
  detect(source: ImageBitmapSource): Promise<{ rawValue: string }[]>;
}
type DetectorCtor = new (opts: { formats: string[] }) => DetectorLike;

let detector: DetectorLike | null | undefined;

function nativeDetector(): DetectorLike | null {
  if (detector !== undefined) return detector;
  const Ctor = (globalThis as { BarcodeDetector?: DetectorCtor }).BarcodeDetector;
  try {
    detector = Ctor ? new Ctor({ formats: ['qr_code'] }) : null;
  } catch {
    detector = null;
  }
  return detector;
}

/**
 * Text of the QR code in a camera frame: the browser's BarcodeDetector where it exists (fast,
 * native), otherwise jsQR on the frame's pixels.
 */
export async function decodeQr(pixels: Pixels, source?: ImageBitmapSource): Promise<string | null> {
  const native = source ? nativeDetector() : null;
  if (native && source) {
    try {
      const found = await native.detect(source);
      if (found.length) return found[0].rawValue;
      return null;
    } catch {
      // fall through to the library
    }
  }
  const code = jsQR(pixels.data, pixels.width, pixels.height, { inversionAttempts: 'attemptBoth' });
  return code?.data ?? null;
}
