import { Injectable } from '@angular/core';
import type { Pixels } from './qr-decode';

export interface Frame {
  pixels: Pixels;
  source?: ImageBitmapSource;
}

/** Where QR frames come from: the rear camera, or a photo of the tag when there is no camera. */
@Injectable({ providedIn: 'root' })
export class CameraFrames {
  private stream: MediaStream | null = null;
  private video: HTMLVideoElement | null = null;
  private canvas: HTMLCanvasElement | null = null;

  get available(): boolean {
    return typeof navigator !== 'undefined' && !!navigator.mediaDevices?.getUserMedia;
  }

  async start(video: HTMLVideoElement): Promise<void> {
    this.stream = await navigator.mediaDevices.getUserMedia({ video: { facingMode: 'environment' }, audio: false });
    video.srcObject = this.stream;
    video.muted = true;
    await video.play();
    this.video = video;
  }

  /** The current video frame, or null before the camera delivers one. */
  async grab(): Promise<Frame | null> {
    const v = this.video;
    if (!v || !v.videoWidth) return null;
    return { pixels: this.draw(v, v.videoWidth, v.videoHeight), source: v };
  }

  /** A still photo of a tag (file input), decoded through the same path. */
  async fromFile(file: Blob): Promise<Frame> {
    const bitmap = await createImageBitmap(file);
    return { pixels: this.draw(bitmap, bitmap.width, bitmap.height), source: bitmap };
  }

  stop(): void {
    this.stream?.getTracks().forEach((t) => t.stop());
    this.stream = null;
    if (this.video) this.video.srcObject = null;
    this.video = null;
  }

  private draw(img: CanvasImageSource, w: number, h: number): Pixels {
    // Large frames are scaled down: QR finding is quadratic-ish in pixels and a tag fills the view.
    const scale = Math.min(1, 800 / Math.max(w, h));
    const cw = Math.round(w * scale);
    const ch = Math.round(h * scale);
    this.canvas ??= document.createElement('canvas');
    this.canvas.width = cw;
    this.canvas.height = ch;
    const ctx = this.canvas.getContext('2d', { willReadFrequently: true })!;
    ctx.drawImage(img, 0, 0, cw, ch);
    const data = ctx.getImageData(0, 0, cw, ch);
    return { data: data.data, width: cw, height: ch };
  }
}
