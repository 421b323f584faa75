import { ChangeDetectionStrategy, Component, input, output, signal } from '@angular/core';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatChipsModule } from '@angular/material/chips';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';

/** Reasons crews give most; a tap fills the box, which can still be edited. */
export const COMMON_SKIP_REASONS = [
  'Standing water over the rim',
  'Collar damaged or missing',
  'Plot not reachable',
  'Out of time for this round',
] as const;

/**
 * Skipping a collar: asked for a reason (the lead sees it on the Board), never a silent gap.
 * The skip is only emitted once a reason is given.
 */
@Component({
  selector: 'fw-skip-form',
  imports: [MatButtonModule, MatChipsModule, MatFormFieldModule, MatInputModule, ReactiveFormsModule],
  template: `
    @if (!open()) {
      <button mat-stroked-button type="button" (click)="open.set(true)" data-testid="skip-start">Skip this collar…</button>
    } @else {
      <form (submit)="$event.preventDefault(); confirm()" aria-labelledby="skip-title">
        <h3 id="skip-title" class="sub">Why is this collar skipped?</h3>
        <mat-chip-listbox aria-label="Common reasons" (change)="pick($event.value)">
          @for (r of reasons; track r) { <mat-chip-option [value]="r">{{ r }}</mat-chip-option> }
        </mat-chip-listbox>
        <mat-form-field appearance="outline" class="wide">
          <mat-label>Reason</mat-label>
          <textarea matInput rows="2" maxlength="500" data-testid="skip-reason" [formControl]="reason"></textarea>
        </mat-form-field>
        @if (problem()) { <p class="warning" role="alert">{{ problem() }}</p> }
        <div class="row">
          <button mat-flat-button type="submit" [disabled]="busy()">Skip collar</button>
          <button mat-button type="button" (click)="cancel()">Cancel</button>
        </div>
      </form>
    }
  `,
  styles: `
    .wide { width: 100%; } .row { display: flex; gap: 8px; } button { min-height: 48px; }
    .warning { border: 2px solid var(--mat-sys-error); padding: 8px 12px; border-radius: 8px; font-weight: 600; }
    mat-chip-listbox { display: block; margin-bottom: 8px; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SkipForm {
  readonly busy = input(false);
  readonly skip = output<string>();
  protected readonly reasons = COMMON_SKIP_REASONS;
  protected readonly open = signal(false);
  protected readonly reason = new FormControl('', { nonNullable: true });
  protected readonly problem = signal('');

  protected pick(value: string | null | undefined): void {
    if (value) this.reason.setValue(value);
  }

  protected confirm(): void {
    const r = this.reason.value.trim();
    if (!r) {
      this.problem.set('Say why, e.g. "standing water over the rim": the lead sees it on the Board.');
      return;
    }
    this.problem.set('');
    this.skip.emit(r);
    this.open.set(false);
  }

  protected cancel(): void {
    this.open.set(false);
    this.problem.set('');
  }
}
