/**
 * A collar's state in a round, as one table for every screen that shows it (Walk's route list and
 * map, the Board's table and map): a shape and a word, never colour alone. ○ due (open ring),
 * ◐ partial (half-filled ring), ■ complete (filled square), ◇ skipped (open diamond with a bar).
 * Colours are picked apart in lightness as well as hue so they stay distinct for colour-blind
 * viewers and in greyscale; each has ≥ 4.5:1 contrast on white for the label text.
 */
import { PROGRESS_STATE_WORDS, PROGRESS_STATES, type ProgressState } from '../../../../shared/model/progress-state';

// The states and their words live in shared/ (the server's digest, mail and CSV use them too).
export type CollarState = ProgressState;
export const COLLAR_STATES: readonly CollarState[] = PROGRESS_STATES;
export const STATE_WORDS: Readonly<Record<CollarState, string>> = PROGRESS_STATE_WORDS;

/** The shapes as text glyphs (lists, tables, the map's legend). */
export const STATE_GLYPHS: Record<CollarState, string> = { due: '○', partial: '◐', complete: '■', skipped: '◇' };

export const STATE_COLOURS: Record<CollarState, string> = {
  due: '#8a4b00',
  partial: '#4b3fb5',
  complete: '#00695c',
  skipped: '#5c5c5c',
};

/** SVG path of each state's shape in a 16 × 16 box. */
export const STATE_SHAPES: Record<CollarState, string> = {
  due: '<circle cx="8" cy="8" r="5.5" fill="none" stroke-width="2.2"/>',
  partial: '<circle cx="8" cy="8" r="5.5" fill="none" stroke-width="2.2"/><path d="M8 2.5a5.5 5.5 0 0 0 0 11z" stroke="none"/>',
  complete: '<rect x="2.5" y="2.5" width="11" height="11" stroke="none"/>',
  skipped: '<path d="M8 1.5 14.5 8 8 14.5 1.5 8z" fill="none" stroke-width="2"/><path d="M4.5 11.5 11.5 4.5" stroke-width="2"/>',
};

/** The state's shape as an SVG string (fixed markup from the table above, never record text). */
export function shapeSvg(state: CollarState, size = 16): string {
  const c = STATE_COLOURS[state];
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${size}" height="${size}" viewBox="0 0 16 16" fill="${c}" stroke="${c}" aria-hidden="true">${STATE_SHAPES[state]}</svg>`;
}

/** The legend line: "○ due · ◐ partial · ■ complete · ◇ skipped". */
export const STATE_LEGEND = COLLAR_STATES.map((s) => `${STATE_GLYPHS[s]} ${STATE_WORDS[s]}`).join(' · ');
