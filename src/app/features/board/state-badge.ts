import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { ProgressState } from './board-api';
import { STATE_COLOURS, STATE_GLYPHS, STATE_WORDS } from '../../core/map/collar-states';

// The one table of state shapes, words and colours lives in core/map/collar-states.ts (Walk uses it too).
export { STATE_COLOURS, STATE_GLYPHS, STATE_SHAPES, STATE_WORDS as STATE_LABELS, shapeSvg } from '../../core/map/collar-states';

@Component({
  selector: 'fw-state-badge',
  template: `
    <span class="badge" [style.color]="colour()"><span class="shape" aria-hidden="true">{{ glyph() }}</span>{{ label() }}</span>
  `,
  styles: `
    .badge { display: inline-flex; align-items: center; gap: 4px; font-weight: 600; }
    .shape { font-size: 1.05em; line-height: 1; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StateBadge {
  readonly state = input.required<ProgressState>();
  protected readonly colour = () => STATE_COLOURS[this.state()];
  protected readonly label = () => STATE_WORDS[this.state()];
  protected readonly glyph = () => STATE_GLYPHS[this.state()];
}
