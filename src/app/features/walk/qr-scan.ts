import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  ElementRef,
  computed,
  inject,
  input,
  output,
  signal,
  viewChild,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { readCollarTag, type CollarTag } from '../../../../shared/model/collar-tag';
import { CameraFrames, type Frame } from './camera-frames';
import { decodeQr } from './qr-decode';
import { TagOpener } from './tag-opener';

/**
 * Reads a collar tag: the rear camera scans until a QR code reads, or a photo of the tag is
 * decoded. The tag holds `<origin>/walk/collars/<id>` (and a planned code on blank tags); only
 * the id at the end counts. To open, the tag's collar opens (or installing one with it); to
 * adopt, the tag is handed to the install screen as `tagRead`.
 */
@Component({
  selector: 'fw-qr-scan',
  imports: [MatButtonModule],
  template: `
    <div class="row">
      @if (!scanning()) {
        <button mat-stroked-button type="button" (click)="startScan()" [disabled]="!camera.available">{{ words().scan }}</button>
      } @else {
        <button mat-stroked-button type="button" (click)="stopScan()">Stop scanning</button>
      }
      <label class="file-button">
        <input type="file" accept="image/*" capture="environment" class="fw-visually-hidden" [attr.aria-label]="words().photo" (change)="readPhoto($event)" />
        <span aria-hidden="true">{{ words().photo }}</span>
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
  private readonly opener = inject(TagOpener);
  /** open: go to the tag's collar; adopt: hand the tag to the host (a new collar takes it). */
  readonly purpose = input<'open' | 'adopt'>('open');
  readonly tagRead = output<CollarTag>();
  protected readonly words = computed(() =>
    this.purpose() === 'adopt'
      ? { scan: 'Scan the new tag', photo: 'Read a photo of the new tag' }
      : { scan: 'Scan a tag', photo: 'Read a photo of the tag' },
  );
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

  /** Decodes one frame; acts on it when it holds a collar tag. True when it did. */
  async openFrame(frame: Frame, reportMiss: boolean): Promise<boolean> {
    const text = await decodeQr(frame.pixels, frame.source);
    if (text === null) {
      if (reportMiss) this.status.set('No QR code found in that photo.');
      return false;
    }
    const tag = readCollarTag(text);
    if (!tag) {
      this.status.set('That QR code is not a Fluxwalk collar tag.');
      return false;
    }
    this.stopScan();
    if (this.purpose() === 'adopt') {
      this.status.set('Tag read.');
      this.tagRead.emit(tag);
      return true;
    }
    this.status.set('Tag read: opening the collar.');
    await this.opener.open(tag);
    return true;
  }
}
