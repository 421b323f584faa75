import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';

export interface MoveTarget {
  visitId: string;
  round: number;
  collarId: string;
  collarCode: string;
}

/**
 * Moves the closure to another visit of its campaign when the crew tapped the wrong collar: the
 * server recomputes the flux with the target collar's area and offsets and keeps the move in the
 * review history. Visits of the closure's own round come first.
 */
@Component({
  selector: 'fw-closure-move',
  imports: [MatButtonModule, MatFormFieldModule, MatSelectModule, ReactiveFormsModule],
  template: `
    @if (targets().length) {
      <form class="decide" aria-label="Move to another visit" (submit)="$event.preventDefault(); send()">
        <mat-form-field subscriptSizing="dynamic">
          <mat-label>Wrong collar? Move to</mat-label>
          <mat-select [formControl]="visit" data-testid="move-target">
            @for (t of ordered(); track t.visitId) { <mat-option [value]="t.visitId">Collar {{ t.collarCode }}, round {{ t.round }}</mat-option> }
          </mat-select>
        </mat-form-field>
        <button matButton="outlined" type="submit" [disabled]="busy() || !chosen()">Move the closure</button>
      </form>
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ClosureMove {
  readonly targets = input.required<MoveTarget[]>();
  readonly round = input.required<number>();
  readonly busy = input(false);
  readonly move = output<string>();
  protected readonly visit = new FormControl<string | null>(null);
  protected readonly chosen = toSignal(this.visit.valueChanges, { initialValue: null });
  protected readonly ordered = computed(() => {
    const r = this.round();
    return [...this.targets()].sort(
      (a, b) => Number(b.round === r) - Number(a.round === r) || a.round - b.round || a.collarCode.localeCompare(b.collarCode),
    );
  });

  protected send(): void {
    const v = this.visit.value;
    if (v) {
      this.move.emit(v);
      this.visit.setValue(null);
    }
  }
}
