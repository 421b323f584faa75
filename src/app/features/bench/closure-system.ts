import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';
import { flagAdvice } from '../../../../shared/flux';
import { formValue } from '../../core/forms/form-value';
import { SiteTimePipe } from '../../core/time/site-time-pipe';
import type { ClosureDetail } from '../../../../shared/bench/review-wire';
import type { Decision } from './closure-view';

const PROFILE_SOURCE: Record<string, string> = {
  closure: 'the closure’s own chamber',
  'site-default': 'the site’s default chamber (the closure names none)',
  'only-chamber': 'the site’s only chamber (the closure names none)',
};

/**
 * Which chamber and analyzer a closure was made with, the ambient reading and chamber air
 * temperature it got and where from, its flags in words with advice (the one table in
 * shared/flux/flag-advice.ts), and the lab's correction of the chamber or analyzer (a PATCH
 * kept in the closure's history).
 */
@Component({
  selector: 'fw-closure-system',
  imports: [DecimalPipe, MatButtonModule, MatFormFieldModule, MatSelectModule, ReactiveFormsModule, SiteTimePipe],
  template: `
    @let r = c().results;
    <p data-testid="closure-system">Chamber “{{ r.profileName ?? '?' }}”@if (r.profileSource) { ({{ profileSource(r.profileSource) }}) }
      · analyzer {{ analyzerName() }}
      · ambient {{ r.ambientPpm === null ? 'none of this analyzer within 12 h' : (r.ambientPpm | number: '1.0-0') + ' µmol/mol' }}
      @if (r.ambientAt) { read {{ r.ambientAt | siteTime: detail().context.timezone }} }
      · chamber air temperature {{ airTemp() }}</p>
    @if (flags().length) {
      <ul class="flag-words" data-testid="flag-words">
        @for (f of flags(); track f) { <li><strong>{{ advice(f).words }}</strong> {{ advice(f).advice }} <code>{{ f }}</code></li> }
      </ul>
    }
    @if (systems(); as s) {
      <form class="decide" aria-label="Chamber system" [formGroup]="system" (ngSubmit)="correct()">
        <mat-form-field appearance="outline">
          <mat-label>Chamber profile</mat-label>
          <mat-select data-testid="system-profile" formControlName="profileId">
            @for (p of s.profiles; track p.id) { <mat-option [value]="p.id">{{ p.name }} (from {{ p.validFrom }})</mat-option> }
          </mat-select>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Analyzer</mat-label>
          <mat-select data-testid="system-analyzer" formControlName="analyzerId">
            @for (a of s.analyzers; track a.id) { <mat-option [value]="a.id">{{ a.name }}@if (a.serial) { ({{ a.serial }}) }</mat-option> }
          </mat-select>
        </mat-form-field>
        <button mat-stroked-button type="submit" [disabled]="busy() || !changed()">Correct the chamber system</button>
      </form>
    }
  `,
  // The Bench's own form styles do not reach inside this component: the fields wrap, each wide enough for its floating label.
  styles: [
    `.flag-words { margin: 4px 0; padding-left: 20px; } .flag-words code { color: #666; font-size: 0.85em; }
    .decide { display: flex; flex-wrap: wrap; gap: 8px 12px; align-items: center; margin: 8px 0; }
    .decide mat-form-field { flex: 1 1 200px; min-width: 180px; }`,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ClosureSystem {
  readonly detail = input.required<ClosureDetail>();
  readonly busy = input(false);
  readonly decide = output<Decision>();

  protected readonly c = computed(() => this.detail().closure);
  protected readonly flags = computed(() => this.c().flags ?? []);
  protected readonly systems = computed(() => this.detail().systems ?? null);
  /** The lab's correction: starts at what the closure names, again whenever another closure (or a newer copy) arrives. */
  protected readonly system = new FormGroup({
    profileId: new FormControl<string | null>(null),
    analyzerId: new FormControl<string | null>(null),
  });
  private readonly chosen = formValue(this.system);
  /** The fields the lab changed, against the closure as shown. */
  private readonly changes = computed(() => {
    const c = this.c();
    const v = this.chosen();
    const fields: Decision['fields'] = {};
    if (v.profileId !== (c.profileId ?? null)) fields.profileId = v.profileId;
    if (v.analyzerId !== (c.analyzerId ?? null)) fields.analyzerId = v.analyzerId;
    return fields;
  });
  protected readonly changed = computed(() => Object.keys(this.changes()).length > 0);

  constructor() {
    toObservable(this.c)
      .pipe(takeUntilDestroyed())
      .subscribe((c) => this.system.setValue({ profileId: c.profileId ?? null, analyzerId: c.analyzerId ?? null }));
  }

  protected readonly analyzerName = computed(() => {
    const id = this.c().analyzerId;
    return id ? (this.systems()?.analyzers.find((a) => a.id === id)?.name ?? 'unknown') : 'none named';
  });
  protected readonly airTemp = computed(() => {
    const r = this.c().results;
    switch (r.airTempSource) {
      case 'series':
        return 'from the analyzer file';
      case 'visit':
        return `${r.airTempC} °C noted at the visit (the file has none)`;
      case 'site-default':
        return `${r.airTempC} °C, the site’s default (neither the file nor the visit has one)`;
      default:
        return 'not known';
    }
  });

  protected advice(flag: string) {
    return flagAdvice(flag);
  }

  protected profileSource(s: string): string {
    return PROFILE_SOURCE[s] ?? s;
  }

  protected correct(): void {
    const fields = this.changes();
    if (Object.keys(fields).length) this.decide.emit({ fields });
  }
}
