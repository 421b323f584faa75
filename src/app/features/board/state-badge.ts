import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { ProgressState } from './board-api';

/**
 * A state as a shape and a word, never colour alone: ○ due (open ring), ◐ partial (half-filled
 * ring), ■ complete (filled square), ◇ skipped (open diamond with a bar). Colours are our own,
 * picked apart in lightness as well as hue so they stay distinct for colour-blind viewers and in
 * greyscale; each has ≥ 4.5:1 contrast on white for the label text.
 */
export const STATE_COLOURS: Record<ProgressState, string> = {
  due: '#8a4b00',
  partial: '#4b3fb5',
  complete: '#00695c',
  skipped: '#5c5c5c',
};

export const STATE_LABELS: Record<ProgressState, string> = { due: 'due', partial: 'partial', complete: 'complete', skipped: 'skipped' };

/** SVG path of each state's shape in a 16 × 16 box (shared by the table and the map markers). */
export const STATE_SHAPES: Record<ProgressState, string> = {
  due: '<circle cx="8" cy="8" r="5.5" fill="none" stroke-width="2.2"/>',
  partial: '<circle cx="8" cy="8" r="5.5" fill="none" stroke-width="2.2"/><path d="M8 2.5a5.5 5.5 0 0 0 0 11z" stroke="none"/>',
  complete: '<rect x="2.5" y="2.5" width="11" height="11" stroke="none"/>',
  skipped: '<path d="M8 1.5 14.5 8 8 14.5 1.5 8z" fill="none" stroke-width="2"/><path d="M4.5 11.5 11.5 4.5" stroke-width="2"/>',
};

/** The same shapes as text glyphs for the table. */
export const STATE_GLYPHS: Record<ProgressState, string> = { due: '○', partial: '◐', complete: '■', skipped: '◇' };

export function shapeSvg(state: ProgressState, size = 16): string {
  const c = STATE_COLOURS[state];
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${size}" height="${size}" viewBox="0 0 16 16" fill="${c}" stroke="${c}" aria-hidden="true">${STATE_SHAPES[state]}</svg>`;
}

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
  protected readonly label = () => STATE_LABELS[this.state()];
  protected readonly glyph = () => STATE_GLYPHS[this.state()];
}
