import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatRadioModule } from '@angular/material/radio';
import { MatSelectModule } from '@angular/material/select';
import { ActivatedRoute, Router, RouterLink } from '@angular/router';
import { plannedCode, readCollarTag, shortTagId, type CollarTag } from '../../../../shared/model/collar-tag';
import { collarAreaCm2 } from '../../../../shared/model/derived';
import { siteToday } from '../../../../shared/time/site-time';
import { DeviceDb } from '../../core/db/device-db';
import { SiteChoice } from '../../core/auth/site-choice';
import { liveSignal } from '../../core/db/live-query-signal';
import { LocalWrites } from '../../core/sync/local-writes';
import { averageFixes, Gps, type Fix } from './gps';
import { parseCm } from './offset-form';
import { PhotoWrites, resizePhoto } from './photo-writes';
import { QrScan } from './qr-scan';
import { validated } from '../../core/db/validated';
import { formValue } from '../../core/forms/form-value';

interface Photo {
  blob: Blob;
  url: string;
  name: string;
  width: number;
  height: number;
}

/**
 * Installing a collar in the field: code (typed, or from a blank tag scanned here, whose id the
 * collar then takes so the tag opens it), plot, a position averaged over several GPS fixes, shape
 * and size (area computed), height and insertion depth, photos resized on the device. Saved as
 * the collar, its "installed" event and the photos' attachment records, all on the device first.
 */
@Component({
  selector: 'fw-install-page',
  imports: [
    DecimalPipe,
    MatButtonModule,
    MatFormFieldModule,
    MatInputModule,
    MatRadioModule,
    MatSelectModule,
    QrScan,
    ReactiveFormsModule,
    RouterLink,
  ],
  templateUrl: './install-page.html',
  styleUrl: './walk.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InstallPage {
  private readonly site = inject(SiteChoice).current;
  private readonly gps = inject(Gps);
  private readonly writes = inject(LocalWrites);
  private readonly photos$ = inject(PhotoWrites);
  private readonly router = inject(Router);
  private readonly deviceDb = inject(DeviceDb);
  protected readonly plots = liveSignal(
    () => this.site()?.id ?? null,
    async (db, siteId) =>
      siteId
        ? (await db.records('plot').where('siteId').equals(siteId).toArray()).sort((a, b) =>
            a.code.localeCompare(b.code, undefined, { numeric: true }),
          )
        : [],
    [],
  );

  /** Today at the site (not on the phone). */
  private readonly siteDay = computed(() => siteToday(this.site()?.timezone ?? 'UTC'));
  protected readonly form = new FormGroup({
    code: new FormControl('', { nonNullable: true }),
    plotId: new FormControl<string | null>(null),
    /** The site's today until the crew picks another day. */
    installedOn: new FormControl(this.siteDay(), { nonNullable: true }),
    shape: new FormControl<'round' | 'rectangular'>('round', { nonNullable: true }),
    diameter: new FormControl('', { nonNullable: true }),
    sideA: new FormControl('', { nonNullable: true }),
    sideB: new FormControl('', { nonNullable: true }),
    height: new FormControl('', { nonNullable: true }),
    insertion: new FormControl('', { nonNullable: true }),
    note: new FormControl('', { nonNullable: true }),
  });
  protected readonly value = formValue(this.form);
  protected readonly fixes = signal<Fix[]>([]);
  protected readonly photos = signal<Photo[]>([]);
  /** The printed tag this collar takes (its id becomes the collar's id). */
  protected readonly tag = signal<CollarTag | null>(null);
  protected readonly tagNote = signal('');
  protected readonly shortTag = computed(() => {
    const t = this.tag();
    return t ? shortTagId(t.id) : '';
  });
  protected readonly busy = signal(false);
  protected readonly problem = signal('');
  protected readonly currentFix = this.gps.fix;
  protected readonly gpsError = this.gps.error;

  protected readonly position = computed(() => averageFixes(this.fixes()));
  protected readonly areaCm2 = computed(() => {
    const v = this.value();
    return collarAreaCm2({
      shape: v.shape,
      diameterCm: parseCm(v.diameter),
      sideACm: parseCm(v.sideA),
      sideBCm: parseCm(v.sideB),
    });
  });

  constructor() {
    const stop = this.gps.watch();
    const destroy = inject(DestroyRef);
    destroy.onDestroy(stop);
    destroy.onDestroy(() => this.photos().forEach((p) => URL.revokeObjectURL(p.url)));
    // Another site chosen meanwhile: its today (the site's calendar, not the phone's).
    toObservable(this.siteDay)
      .pipe(takeUntilDestroyed())
      .subscribe((day) => this.form.controls.installedOn.setValue(day));
    // Arriving from a scanned tag no collar on this device has (see TagOpener).
    const q = inject(ActivatedRoute).snapshot.queryParamMap;
    const fromLink = readCollarTag(q.get('tag') ?? '');
    if (fromLink) {
      void this.adoptTag({ id: fromLink.id, code: plannedCode(q.get('code')) }).then((ok) => {
        if (ok)
          this.tagNote.set(
            'No collar on this device has this tag yet. If it is already on a collar, sync first; otherwise install the new collar here.',
          );
      });
    }
  }

  /** Takes a scanned tag for the new collar, unless a collar on this device already has it. */
  protected async adoptTag(tag: CollarTag): Promise<boolean> {
    const siteId = this.site()?.id ?? null;
    const { owner, codeUser } = await this.deviceDb.run(async (db) => {
      const table = db.records('collar');
      const sameCode =
        tag.code && siteId
          ? await table
              .where('siteId')
              .equals(siteId)
              .filter((c) => !c.deleted && c.code === tag.code)
              .first()
          : undefined;
      return { owner: await table.get(tag.id), codeUser: sameCode };
    });
    if (owner) {
      // A deleted collar keeps its id (its history syncs as a tombstone): its tag cannot be reused.
      this.tagNote.set(
        owner.deleted
          ? `This tag belonged to collar ${owner.code}, since deleted: use a new tag.`
          : `This tag is already on collar ${owner.code}: use a new tag.`,
      );
      return false;
    }
    this.tag.set(tag);
    this.tagNote.set('');
    if (tag.code) this.form.controls.code.setValue(tag.code);
    if (codeUser) this.tagNote.set(`Code ${tag.code} from the tag is already used at this site by another collar: type another code.`);
    return true;
  }

  protected forgetTag(): void {
    this.tag.set(null);
    this.tagNote.set('');
  }

  protected addFix(): void {
    const f = this.currentFix();
    if (!f) {
      this.problem.set(this.gpsError() || 'No position yet: wait for the GPS.');
      return;
    }
    this.problem.set('');
    this.fixes.update((list) => [...list, { ...f, at: Date.now() }]);
  }

  protected clearFixes(): void {
    this.fixes.set([]);
  }

  protected async addPhotos(event: Event): Promise<void> {
    const input = event.target as HTMLInputElement;
    const files = Array.from(input.files ?? []);
    input.value = '';
    for (const file of files) {
      try {
        const r = await resizePhoto(file);
        const base = file.name.replace(/\.[^.]+$/, '') || 'photo';
        this.photos.update((p) => [
          ...p,
          { blob: r.blob, url: URL.createObjectURL(r.blob), name: `${base}.jpg`, width: r.width, height: r.height },
        ]);
      } catch {
        this.problem.set(`${file.name} is not an image this device can read.`);
      }
    }
  }

  protected removePhoto(i: number): void {
    const p = this.photos()[i];
    URL.revokeObjectURL(p.url);
    this.photos.update((list) => list.filter((_, j) => j !== i));
  }

  protected async save(): Promise<void> {
    const siteId = this.site()?.id;
    if (!siteId) return this.problem.set('No site chosen.');
    const pos = this.position();
    const f = this.form.getRawValue();
    const code = f.code.trim();
    this.busy.set(true);
    this.problem.set('');
    try {
      const clash = await this.deviceDb.run((db) =>
        db
          .records('collar')
          .where('siteId')
          .equals(siteId)
          .filter((c) => !c.deleted && c.code.toLowerCase() === code.toLowerCase())
          .first(),
      );
      if (clash) throw new Error(`Collar code ${code} is already used at this site: choose another code.`);
      const collar = validated('collar', {
        siteId,
        code,
        plotId: f.plotId,
        shape: f.shape,
        diameterCm: f.shape === 'round' ? parseCm(f.diameter) : null,
        sideACm: f.shape === 'rectangular' ? parseCm(f.sideA) : null,
        sideBCm: f.shape === 'rectangular' ? parseCm(f.sideB) : null,
        heightCm: parseCm(f.height),
        insertionCm: parseCm(f.insertion),
        latitude: pos?.latitude ?? null,
        longitude: pos?.longitude ?? null,
        accuracyM: pos ? Math.round(pos.accuracyM * 10) / 10 : null,
        installedOn: f.installedOn,
        notes: f.note.trim(),
      });
      const rec = await this.writes.create('collar', collar, { id: this.tag()?.id });
      await this.writes.create(
        'collarEvent',
        validated('collarEvent', { siteId, collarId: rec.id, kind: 'installed', date: f.installedOn, note: f.note.trim() }),
      );
      for (const p of this.photos()) await this.photos$.keep({ siteId, ownerEntity: 'collar', ownerId: rec.id }, p.blob, p.name);
      await this.router.navigate(['/collars', rec.id]);
    } catch (err) {
      this.problem.set(err instanceof Error ? err.message : 'Could not save on this device');
    } finally {
      this.busy.set(false);
    }
  }
}
