import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';
import type { LoggerPiece, PieceMatch } from '../../../../shared/logger';
import { counted } from '../../../../shared/text/counted';
import { siteTimeParts } from '../../../../shared/time/site-time';
import type { RoundVisit } from './import-plan';

const STATUS_WORDS: Record<PieceMatch['status'], string> = {
  matched: 'matched',
  unmatched: 'no tap or visit fits',
  ambiguous: 'more than one tap or visit fits',
};
const HOW_WORDS: Record<NonNullable<PieceMatch['how']>, string> = {
  tap: 'by its chamber tap',
  arrival: 'by the arrival time',
  order: 'by the order of the taps',
};

/**
 * One piece of a logger file as a card (lines, start on the site's clock, samples, how it matched)
 * with the place it goes: a tapped closure, a new closure at a visit, or left out. A card reads at
 * 390 px where a table's last column would be cut.
 */
@Component({
  selector: 'fw-piece-card',
  imports: [MatFormFieldModule, MatSelectModule],
  template: `
    <article class="piece" [class]="match().status" [attr.data-piece]="match().pieceKey">
      <p class="what"><strong>Lines {{ piece().firstLine }}–{{ piece().lastLine }}</strong> · {{ start() }} · {{ samples() }}</p>
      <p class="how">{{ statusWords[match().status] }}{{ match().how ? ' ' + howWords[match().how!] : '' }}</p>
      <mat-form-field appearance="outline" subscriptSizing="dynamic">
        <mat-label>Assign lines {{ piece().firstLine }}–{{ piece().lastLine }} to</mat-label>
        <mat-select [value]="value()" (selectionChange)="chosen.emit($event.value)" [attr.data-testid]="'assign-' + match().pieceKey">
          <mat-option value="none">leave out (kept in the file)</mat-option>
          @for (v of visits(); track v.visit.id) {
            @for (c of v.waiting; track c.id) { <mat-option [value]="'closure:' + v.visit.id + ':' + c.id">{{ v.collarCode }} · tap {{ clock(c.chamberOnAt) }}</mat-option> }
            <mat-option [value]="'new:' + v.visit.id">{{ v.collarCode }} · new closure</mat-option>
          }
        </mat-select>
      </mat-form-field>
    </article>`,
  styles: `
    .piece { border: 1px solid var(--mat-sys-outline-variant, #ccc); border-radius: 8px; padding: 8px 12px; margin: 8px 0; }
    .piece.unmatched, .piece.ambiguous { background: var(--mat-sys-error-container, #fff3e0); }
    p { margin: 0 0 4px; overflow-wrap: anywhere; }
    mat-form-field { width: 100%; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PieceCard {
  readonly piece = input.required<LoggerPiece>();
  readonly match = input.required<PieceMatch>();
  readonly visits = input.required<readonly RoundVisit[]>();
  /** The select's value: 'none', 'new:<visit>', 'closure:<visit>:<closure>', or '' while unchosen. */
  readonly value = input.required<string>();
  readonly timeZone = input('UTC');
  readonly chosen = output<string>();
  protected readonly statusWords = STATUS_WORDS;
  protected readonly howWords = HOW_WORDS;
  protected readonly samples = computed(() => counted(this.piece().samples.length, 'sample'));
  protected readonly start = computed(() => {
    const ms = this.match().correctedStartMs;
    return ms === null ? 'no clock in the file' : `starts ${this.clock(new Date(ms).toISOString())}`;
  });

  /** Wall time on the site's clock. */
  protected clock(at: string): string {
    const ms = Date.parse(at);
    return Number.isFinite(ms) ? siteTimeParts(ms, this.timeZone(), true).time : '—';
  }
}
