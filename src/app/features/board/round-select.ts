import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';

/** The option that stands for every round. mat-select treats a null value as "nothing chosen" and shows a blank field, so it has a value of its own. */
const ALL_ROUNDS = 'all';

/** Round of a campaign, or all of them (null), shown by name in the field either way. */
@Component({
  selector: 'fw-round-select',
  imports: [MatFormFieldModule, MatSelectModule],
  template: `
    <mat-form-field subscriptSizing="dynamic">
      <mat-label>Round</mat-label>
      <mat-select [value]="value() ?? all" (valueChange)="chosen.emit($event === all ? null : +$event)" data-testid="round-select">
        <mat-option [value]="all">All rounds</mat-option>
        @for (n of list(); track n) { <mat-option [value]="n">Round {{ n }}</mat-option> }
      </mat-select>
    </mat-form-field>`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RoundSelect {
  /** How many rounds the campaign has. */
  readonly rounds = input.required<number>();
  readonly value = input<number | null>(null);
  readonly chosen = output<number | null>();
  protected readonly all = ALL_ROUNDS;
  protected readonly list = computed(() => Array.from({ length: this.rounds() }, (_, i) => i + 1));
}
