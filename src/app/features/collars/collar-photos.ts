import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, input } from '@angular/core';
import { liveSignal } from '../../core/db/live-query-signal';

/** A photo's attachment record as shown, with its bytes when they are on this device. */
interface KeptPhoto {
  id: string;
  fileName: string;
  sizeBytes: number;
  blob: Blob | null;
}

/**
 * The collar's photos as kept on this device (their bytes wait in the blobs table until the
 * upload), with the attachment record's size and whether the record is synced.
 */
@Component({
  selector: 'fw-collar-photos',
  template: `
    <ul class="photos" data-testid="collar-photos">
      @for (p of shown(); track p.id) {
        <li [attr.data-testid]="'collar-photo'">
          @if (p.url) { <img [src]="p.url" [alt]="'Photo ' + p.fileName" width="120" /> }
          <span>{{ p.fileName }}, {{ p.kb }} kB@if (!p.onDevice) { (not on this device) }</span>
        </li>
      } @empty { <li>No photos.</li> }
    </ul>
  `,
  styles: `.photos { list-style: none; padding: 0; display: grid; gap: 8px; } li { display: flex; gap: 8px; align-items: center; }`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CollarPhotos {
  readonly collarId = input.required<string>();
  private readonly urls: string[] = [];
  private readonly rows = liveSignal(
    () => this.collarId(),
    async (db, id) => {
      const atts = (await db.records('attachment').where('ownerId').equals(id).toArray()).filter(
        (a) => !a.deleted && a.mediaType.startsWith('image/'),
      );
      const blobs = await db.blobs.bulkGet(atts.map((a) => a.id));
      return atts.map((a, i) => ({
        id: a.id,
        fileName: a.fileName,
        sizeBytes: a.sizeBytes,
        blob: blobs[i]?.blob ?? null,
      }));
    },
    [] as KeptPhoto[],
  );
  protected readonly shown = computed(() =>
    this.rows().map((r) => {
      const url = r.blob ? URL.createObjectURL(r.blob) : null;
      if (url) this.urls.push(url);
      return { id: r.id, fileName: r.fileName, kb: Math.round(r.sizeBytes / 1024), url, onDevice: !!r.blob };
    }),
  );

  constructor() {
    inject(DestroyRef).onDestroy(() => this.urls.forEach((u) => URL.revokeObjectURL(u)));
  }
}
