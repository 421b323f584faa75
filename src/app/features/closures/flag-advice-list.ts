import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { flagAdvice, type FlagAction } from '../../../../shared/flux';

const ACTION_LABEL: Record<FlagAction, string> = {
  redo: 'Redo now',
  'check-seal': 'Seal checked: redo now',
  wait: 'Analyzer at ambient: redo now',
  note: '',
  none: '',
};

/**
 * A closure's QC flags in words with what to do now, for a touch screen (no tooltips): the ones
 * to act on before leaving the collar first, and the redo offered right there. The words come
 * from the one flag table (shared/flux/flag-advice.ts) the Bench uses too. The redo is offered
 * only when the visit has no running closure (`canRedo`).
 */
@Component({
  selector: 'fw-flag-advice-list',
  imports: [MatButtonModule],
  template: `
    @if (items().length) {
      <ul class="advice">
        @for (a of items(); track a.code) {
          <li [class.act]="a.actNow" [attr.data-flag]="a.code">
            <strong>{{ a.words }}</strong> <span class="what">{{ a.advice }}</span>
          </li>
        }
      </ul>
      @if (canRedo() && redoLabel(); as label) {
        <button mat-stroked-button type="button" class="redo-now" data-testid="flag-redo" (click)="redo.emit()">{{ label }}</button>
      }
    } @else {
      <p class="ok">No flags: this closure looks good.</p>
    }
  `,
  styles: [
    `
    .advice { list-style: none; padding: 0; margin: 4px 0; display: grid; gap: 4px; }
    .advice li { background: #f5f5f5; border-left: 4px solid #9e9e9e; padding: 4px 8px; border-radius: 4px; }
    .advice li.act { background: #fdecea; border-left-color: #c62828; }
    .what { display: block; }
    .ok { background: #e8f5e9; padding: 4px 8px; border-radius: 4px; }
    .redo-now { width: 100%; min-height: 48px; margin: 4px 0; }
  `,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FlagAdviceList {
  readonly flags = input.required<readonly string[]>();
  /** False while a closure runs at the visit: the advice still reads "redo", but the button waits until the chamber is off. */
  readonly canRedo = input(true);
  readonly redo = output<void>();

  protected readonly items = computed(() =>
    this.flags()
      .map((code) => ({ code, ...flagAdvice(code) }))
      .sort((a, b) => Number(b.actNow) - Number(a.actNow)),
  );
  /** The first act-now flag that a redo answers names the button. */
  protected readonly redoLabel = computed(() => {
    const first = this.items().find((a) => a.actNow && ACTION_LABEL[a.action]);
    return first ? ACTION_LABEL[first.action] : null;
  });
}
