import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input, linkedSignal, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';
import { flagAdvice } from '../../../../shared/flux';
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
  imports: [DecimalPipe, MatButtonModule, MatFormFieldModule, MatSelectModule, SiteTimePipe],
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
      <form class="decide" aria-label="Chamber system" (submit)="$event.preventDefault(); correct()">
        <mat-form-field appearance="outline">
          <mat-label>Chamber profile</mat-label>
          <mat-select data-testid="system-profile" [value]="profileId()" (selectionChange)="profileId.set($event.value)">
            @for (p of s.profiles; track p.id) { <mat-option [value]="p.id">{{ p.name }} (from {{ p.validFrom }})</mat-option> }
          </mat-select>
        </mat-form-field>
        <mat-form-field appearance="outline">
          <mat-label>Analyzer</mat-label>
          <mat-select data-testid="system-analyzer" [value]="analyzerId()" (selectionChange)="analyzerId.set($event.value)">
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
  protected readonly profileId = linkedSignal<string | null>(() => this.c().profileId ?? null);
  protected readonly analyzerId = linkedSignal<string | null>(() => this.c().analyzerId ?? null);
  protected readonly changed = computed(
    () => this.profileId() !== (this.c().profileId ?? null) || this.analyzerId() !== (this.c().analyzerId ?? null),
  );
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
    const fields: Decision['fields'] = {};
    if (this.profileId() !== (this.c().profileId ?? null)) fields.profileId = this.profileId();
    if (this.analyzerId() !== (this.c().analyzerId ?? null)) fields.analyzerId = this.analyzerId();
    if (Object.keys(fields).length) this.decide.emit({ fields });
  }
}
