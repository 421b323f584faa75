import { ChangeDetectionStrategy, Component, inject, input, output, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { chamberProfileFields } from '../../../../shared/model/site-layout';
import { serverMessage } from '../../core/api/api-error';
import { issuesByField } from './record-fields';
import type { StoredRecord } from '../../../../shared/model/stored-record';
import { formValue } from '../../core/forms/form-value';
import { SetupApi } from './setup-api';

const versionFields = chamberProfileFields.pick({ validFrom: true, chamberVolumeCm3: true, loopVolumeCm3: true, settleS: true });

/**
 * A new chamber-profile version valid from a day (a change of chamber or tubing). Before it is
 * added, the server counts the closures whose flux it would recompute.
 */
@Component({
  selector: 'fw-profile-version',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, MatSelectModule],
  template: `
    <form class="version" [formGroup]="form" (ngSubmit)="add()" aria-labelledby="version-heading">
      <h3 id="version-heading">New version of a chamber profile</h3>
      <mat-form-field>
        <mat-label>Version after</mat-label>
        <mat-select formControlName="baseId">
          @for (p of profiles(); track p.id) {
            <mat-option [value]="p.id">{{ p.name }} · from {{ p.validFrom }}</mat-option>
          }
        </mat-select>
      </mat-form-field>
      @for (f of fields; track f.key) {
        <mat-form-field>
          <mat-label>{{ f.label }}</mat-label>
          @if (f.key === 'validFrom') {
            <input matInput type="date" formControlName="validFrom" />
          } @else {
            <input matInput type="number" step="any" [formControlName]="f.key" />
          }
          @if (errors()[f.key]) { <mat-hint class="problem">{{ errors()[f.key] }}</mat-hint> }
        </mat-form-field>
      }
      <div class="actions">
        <button mat-stroked-button type="button" (click)="previewCount()" [disabled]="!value().baseId">Count closures to recompute</button>
        <button mat-flat-button type="submit" [disabled]="!value().baseId">Add version</button>
      </div>
      @if (preview(); as p) {
        <p data-testid="recompute-preview">
          {{ p.closures }} closure{{ p.closures === 1 ? '' : 's' }} from {{ value().validFrom }}{{ p.until ? ' until ' + p.until : '' }} would be recomputed{{ p.lockedKept ? '; ' + p.lockedKept + ' in locked campaigns keep their flux' : '' }}.
        </p>
      }
      <p role="status">{{ message() }}</p>
    </form>
  `,
  styles: `.version { display: flex; flex-wrap: wrap; gap: .5rem 1rem; align-items: center; margin-block: 1.5rem; }
    h3, .actions, p { flex-basis: 100%; } .actions { display: flex; gap: .75rem; } .problem { color: var(--mat-sys-error); }`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProfileVersion {
  private readonly api = inject(SetupApi);
  readonly siteId = input.required<string>();
  readonly profiles = input<StoredRecord<'chamberProfile'>[]>([]);
  readonly added = output<void>();

  protected readonly fields = [
    { key: 'validFrom', label: 'Valid from' },
    { key: 'chamberVolumeCm3', label: 'Chamber volume (cm³)' },
    { key: 'loopVolumeCm3', label: 'Loop volume (cm³)' },
    { key: 'settleS', label: 'Default settle time (s)' },
  ] as const;
  /** The profile the version follows, the day it holds from and what changed; an empty number keeps that profile's value. */
  protected readonly form = new FormGroup({
    baseId: new FormControl<string | null>(null),
    validFrom: new FormControl('', { nonNullable: true }),
    chamberVolumeCm3: new FormControl<number | null>(null),
    loopVolumeCm3: new FormControl<number | null>(null),
    settleS: new FormControl<number | null>(null),
  });
  protected readonly value = formValue(this.form);
  protected readonly errors = signal<Partial<Record<string, string>>>({});
  protected readonly preview = signal<{ closures: number; lockedKept: number; until: string | null } | null>(null);
  protected readonly message = signal('');

  constructor() {
    // A count made for other values would mislead: any change drops it.
    this.form.valueChanges.pipe(takeUntilDestroyed()).subscribe(() => this.preview.set(null));
  }

  private values() {
    const { baseId, validFrom, chamberVolumeCm3, loopVolumeCm3, settleS } = this.form.getRawValue();
    const base = this.profiles().find((p) => p.id === baseId);
    const v = {
      validFrom,
      chamberVolumeCm3: chamberVolumeCm3 ?? base?.chamberVolumeCm3,
      loopVolumeCm3: loopVolumeCm3 ?? base?.loopVolumeCm3,
      settleS: settleS ?? base?.settleS,
    };
    const check = versionFields.safeParse(v);
    if (!check.success) {
      this.errors.set(issuesByField(check.error.issues));
      return null;
    }
    this.errors.set({});
    return v;
  }

  protected async previewCount(): Promise<void> {
    const v = this.values();
    if (!v) return;
    try {
      this.preview.set(await this.api.recomputePreview(this.siteId(), v.validFrom));
    } catch (err) {
      this.message.set(serverMessage(err, 'Could not count the closures'));
    }
  }

  protected async add(): Promise<void> {
    const v = this.values();
    const id = this.form.controls.baseId.value;
    if (!v || !id) return;
    try {
      const res = await this.api.addProfileVersion(id, v);
      this.message.set(`Version from ${res.record.validFrom} added; ${res.recomputed} closure(s) recomputed.`);
      this.added.emit();
    } catch (err) {
      this.message.set(serverMessage(err, 'The version was not added'));
    }
  }
}
