import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { SiteChoice } from '../../core/auth/site-choice';
import { collarList } from './collar-query';

/** The site's collars on this device, findable by code. */
@Component({
  selector: 'fw-collar-list',
  imports: [ReactiveFormsModule, MatFormFieldModule, MatInputModule, RouterLink],
  template: `
    <h1>Collars</h1>
    <mat-form-field appearance="outline">
      <mat-label>Find by code</mat-label>
      <input matInput [formControl]="filter" />
    </mat-form-field>
    @if (rows(); as list) {
      @if (list.length) {
        <ul class="list">
          @for (c of shown(); track c.id) {
            <li><a [routerLink]="['/collars', c.id]">{{ c.code }}</a> <span class="status">{{ c.status }}</span></li>
          }
        </ul>
      } @else {
        <p>No collars on this device yet: they arrive with the first sync.</p>
      }
    } @else {
      <p role="status">Loading…</p>
    }
  `,
  styles: `
    h1 { font: var(--mat-sys-headline-small); }
    .list { list-style: none; padding: 0; display: grid; grid-template-columns: repeat(auto-fill, minmax(140px, 1fr)); gap: 8px; }
    .list a { font-weight: 700; font-size: 1.1rem; display: inline-block; min-height: 44px; line-height: 44px; }
    .status { color: var(--mat-sys-on-surface-variant); margin-left: 4px; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CollarList {
  private readonly site = inject(SiteChoice).current;
  protected readonly filter = new FormControl('', { nonNullable: true });
  private readonly filterText = toSignal(this.filter.valueChanges, { initialValue: this.filter.value });
  protected readonly rows = collarList(() => this.site()?.id ?? null);
  protected readonly shown = computed(() => {
    const f = this.filterText().trim().toLowerCase();
    return (this.rows() ?? []).filter((c) => !f || c.code.toLowerCase().includes(f));
  });
}
