import { ChangeDetectionStrategy, Component, DestroyRef, ElementRef, inject, signal, viewChild } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { Router } from '@angular/router';
import { collarIdFromTag } from '../../../../shared/model/collar-tag';
import { CameraFrames, type Frame } from './camera-frames';
import { decodeQr } from './qr-decode';

/**
 * Opens a collar from its tag: the rear camera scans until a QR code reads, or a photo of the tag
 * is decoded. The tag holds `<origin>/walk/collars/<id>`; only the id at the end counts.
 */
@Component({
  selector: 'fw-qr-scan',
  imports: [MatButtonModule],
  template: `
    <div class="row">
      @if (!scanning()) {
        <button mat-stroked-button type="button" (click)="startScan()" [disabled]="!camera.available">Scan a tag</button>
      } @else {
        <button mat-stroked-button type="button" (click)="stopScan()">Stop scanning</button>
      }
      <label class="file-button">
        <input type="file" accept="image/*" capture="environment" class="fw-visually-hidden" aria-label="Read a photo of the tag" (change)="readPhoto($event)" />
        <span aria-hidden="true">Read a photo of the tag</span>
      </label>
    </div>
    <video #video [hidden]="!scanning()" playsinline aria-label="Camera view for scanning a tag"></video>
    <p role="status" data-testid="qr-status">{{ status() }}</p>
  `,
  styles: `
    .row { display: flex; flex-wrap: wrap; gap: 8px; }
    button { min-height: 48px; }
    .file-button { display: inline-flex; align-items: center; min-height: 48px; padding: 0 16px; border: 1px solid var(--mat-sys-outline); border-radius: 24px; cursor: pointer; font-weight: 600; }
    .file-button:focus-within { outline: 3px solid var(--mat-sys-primary); outline-offset: 2px; }
    video { width: 100%; max-height: 50vh; border-radius: 8px; margin-top: 8px; }
    p:empty { display: none; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class QrScan {
  protected readonly camera = inject(CameraFrames);
  private readonly router = inject(Router);
  private readonly video = viewChild.required<ElementRef<HTMLVideoElement>>('video');
  protected readonly scanning = signal(false);
  protected readonly status = signal('');
  private timer: ReturnType<typeof setTimeout> | null = null;

  constructor() {
    inject(DestroyRef).onDestroy(() => this.stopScan());
  }

  async startScan(): Promise<void> {
    this.status.set('Point the camera at the collar tag…');
    try {
      await this.camera.start(this.video().nativeElement);
    } catch {
      this.status.set('The camera is not available: type the code or read a photo of the tag.');
      return;
    }
    this.scanning.set(true);
    this.tick();
  }

  stopScan(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    if (this.scanning()) this.camera.stop();
    this.scanning.set(false);
  }

  private tick(): void {
    this.timer = setTimeout(async () => {
      if (!this.scanning()) return;
      const frame = await this.camera.grab().catch(() => null);
      if (frame && (await this.openFrame(frame, false))) return;
      this.tick();
    }, 250);
  }

  protected async readPhoto(event: Event): Promise<void> {
    const input = event.target as HTMLInputElement;
    const file = input.files?.[0];
    input.value = '';
    if (!file) return;
    try {
      await this.openFrame(await this.camera.fromFile(file), true);
    } catch {
      this.status.set('That photo could not be read.');
    }
  }

  /** Decodes one frame; opens the collar when it holds a collar tag. True when it opened one. */
  async openFrame(frame: Frame, reportMiss: boolean): Promise<boolean> {
    const text = await decodeQr(frame.pixels, frame.source);
    if (text === null) {
      if (reportMiss) this.status.set('No QR code found in that photo.');
      return false;
    }
    const id = collarIdFromTag(text);
    if (!id) {
      this.status.set('That QR code is not a Fluxwalk collar tag.');
      return false;
    }
    this.stopScan();
    this.status.set('Tag read: opening the collar.');
    await this.router.navigateByUrl(`/walk/visit/${id}`);
    return true;
  }
}
