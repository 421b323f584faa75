import { ChangeDetectionStrategy, Component, computed, effect, input, output, untracked } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { EXCLUSION_REASONS, type PointExclusion } from '../../../../shared/model/point-exclusion';

/** A change of the points left out of a fit: sent to the Bench routes, answered with the recomputed closure. */
export type PointsChange = { exclude: number[]; reason: string } | { restore: number[] };

const OTHER = 'other';

/** Runs of consecutive sample numbers with one reason: "45–48 (Spike)". */
export function exclusionGroups(list: readonly PointExclusion[]): { from: number; to: number; reason: string; indices: number[] }[] {
  const groups: { from: number; to: number; reason: string; indices: number[] }[] = [];
  for (const e of [...list].sort((a, b) => a.index - b.index)) {
    const last = groups[groups.length - 1];
    if (last && last.to === e.index - 1 && last.reason === e.reason) {
      last.to = e.index;
      last.indices.push(e.index);
    } else groups.push({ from: e.index, to: e.index, reason: e.reason, indices: [e.index] });
  }
  return groups;
}

/** The review history's words for a list of excluded points. */
export function exclusionText(v: unknown): string {
  if (!Array.isArray(v) || !v.length) return 'none';
  return exclusionGroups(v as PointExclusion[])
    .map((g) => `${g.from === g.to ? g.from : `${g.from}–${g.to}`} (${g.reason})`)
    .join(', ');
}

/**
 * Points the lab leaves out of the closure's fit (a spike, single bad samples): a time range
 * (or one point tapped on the chart) and a reason, and the list of what is left out with a
 * "Put back" for each run. The server recomputes the flux at once; the series itself is kept.
 */
@Component({
  selector: 'fw-point-exclusions',
  imports: [MatButtonModule, MatFormFieldModule, MatInputModule, MatSelectModule, ReactiveFormsModule],
  template: `
    <h3>Points left out of the fit</h3>
    @if (groups().length) {
      <ul class="excluded" data-testid="excluded-points">
        @for (g of groups(); track g.from) {
          <li><span>Samples {{ g.from === g.to ? g.from : g.from + '–' + g.to }} (t {{ timeOf(g.from) }}@if (g.to !== g.from) {–{{ timeOf(g.to) }}} s): {{ g.reason }}</span>
            <button matButton type="button" [disabled]="busy()" (click)="pointsChange.emit({ restore: g.indices })">Put back</button></li>
        }
      </ul>
    } @else { <p>None: every sample in the window is fitted.</p> }
    <form class="decide" aria-label="Leave points out" [formGroup]="form" (ngSubmit)="leaveOut()">
      <mat-form-field subscriptSizing="dynamic">
        <mat-label>From (s)</mat-label>
        <input matInput type="number" formControlName="fromS" data-testid="exclude-from" />
      </mat-form-field>
      <mat-form-field subscriptSizing="dynamic">
        <mat-label>To (s)</mat-label>
        <input matInput type="number" formControlName="toS" data-testid="exclude-to" />
      </mat-form-field>
      <mat-form-field subscriptSizing="dynamic">
        <mat-label>Reason</mat-label>
        <mat-select formControlName="reason" data-testid="exclude-reason">
          @for (r of reasons; track r) { <mat-option [value]="r">{{ r }}</mat-option> }
          <mat-option value="other">Other (type it)</mat-option>
        </mat-select>
      </mat-form-field>
      @if (value().reason === 'other') {
        <mat-form-field subscriptSizing="dynamic">
          <mat-label>Reason in words</mat-label>
          <input matInput formControlName="note" maxlength="300" data-testid="exclude-note" />
        </mat-form-field>
      }
      <button matButton="outlined" type="submit" [disabled]="busy() || !picked().length || !reasonText()">
        Leave out {{ picked().length }} {{ picked().length === 1 ? 'point' : 'points' }}</button>
    </form>
    <p class="hint">Tap a point on the chart to pick it; left-out points are drawn as open red rings.</p>
  `,
  styles: [
    `.excluded { padding-left: 20px; margin: 4px 0; } .excluded li { display: flex; flex-wrap: wrap; align-items: center; gap: 0 8px; }
    .hint { font-size: 0.85rem; opacity: 0.8; margin-top: 0; }`,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PointExclusions {
  readonly tS = input.required<(number | null)[]>();
  readonly exclusions = input.required<PointExclusion[]>();
  readonly busy = input(false);
  readonly pointsChange = output<PointsChange>();
  protected readonly reasons = EXCLUSION_REASONS;
  protected readonly form = new FormGroup({
    fromS: new FormControl<number | null>(null),
    toS: new FormControl<number | null>(null),
    reason: new FormControl<string>(EXCLUSION_REASONS[0], { nonNullable: true, validators: Validators.required }),
    note: new FormControl<string>('', { nonNullable: true }),
  });
  protected readonly value = toSignal(this.form.valueChanges, { initialValue: this.form.getRawValue() });
  protected readonly groups = computed(() => exclusionGroups(this.exclusions()));
  /** Samples in the chosen time range that are not left out already. */
  protected readonly picked = computed(() => {
    const { fromS, toS } = this.value();
    if (typeof fromS !== 'number' || Number.isNaN(fromS)) return [];
    const to = typeof toS === 'number' && !Number.isNaN(toS) ? toS : fromS;
    const [lo, hi] = fromS <= to ? [fromS, to] : [to, fromS];
    const left = new Set(this.exclusions().map((e) => e.index));
    return this.tS().flatMap((t, i) => (t !== null && t >= lo && t <= hi && !left.has(i) ? [i] : []));
  });
  protected readonly reasonText = computed(() => {
    const v = this.value();
    return (v.reason === OTHER ? (v.note ?? '') : (v.reason ?? '')).trim();
  });

  constructor() {
    // A new closure (or a stored change) starts with an empty range.
    effect(() => {
      this.exclusions();
      untracked(() => this.form.patchValue({ fromS: null, toS: null }));
    });
  }

  /** A point tapped on the chart: the range becomes that one sample. */
  pick(index: number): void {
    const t = this.tS()[index];
    if (t !== null && t !== undefined) this.form.patchValue({ fromS: t, toS: t });
  }

  protected timeOf(i: number): string {
    const t = this.tS()[i];
    return t === null || t === undefined ? '?' : String(t);
  }

  protected leaveOut(): void {
    const indices = this.picked(),
      reason = this.reasonText();
    if (indices.length && reason) this.pointsChange.emit({ exclude: indices, reason });
  }
}
