import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, ElementRef, computed, input, output, signal, viewChildren } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { offsetStats } from '../../../../shared/model/derived';
import { checkOffsets, outlierPositions, type OffsetContext } from './offset-check';

export const MIN_POSITIONS = 3;
export const MAX_POSITIONS = 8;
export const DEFAULT_POSITIONS = 4;

/** "2,4" and "2.4" both read as 2.4 cm (gloved thumbs on a phone keypad hit either). */
export function parseCm(text: string): number | null {
  const t = text.trim().replace(',', '.');
  if (!t) return null;
  const v = Number(t);
  return Number.isFinite(v) ? v : null;
}

/**
 * One offset set: 3–8 rim heights read around the collar, the previous set's value beside each
 * position, live mean and SD, and the tolerance warnings. Enter moves to the next position, so a
 * whole set goes in on the numeric keypad without touching anything else.
 */
@Component({
  selector: 'fw-offset-form',
  imports: [DecimalPipe, MatButtonModule, MatFormFieldModule, MatInputModule],
  templateUrl: './offset-form.html',
  styles: `
    .positions { display: grid; grid-template-columns: 1fr 1fr; gap: 12px 12px; }
    .positions mat-form-field { width: 100%; }
    .outlier { outline: 3px dashed var(--mat-sys-error); outline-offset: 2px; border-radius: 4px; }
    .stats { display: flex; flex-wrap: wrap; gap: 4px 16px; font-size: 1.1rem; margin: 0 0 8px; }
    .stats dt { font-weight: 600; } .stats div { display: flex; gap: 6px; } .stats dd { margin: 0; }
    .warning { border: 2px solid var(--mat-sys-error); padding: 8px 12px; border-radius: 8px; margin: 8px 0; font-weight: 600; }
    .warning::before { content: '⚠ '; }
    .row { display: flex; flex-wrap: wrap; gap: 8px; align-items: center; }
    button { min-height: 48px; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OffsetForm {
  readonly context = input.required<Omit<OffsetContext, 'lastMeanCm'>>();
  readonly previous = input<readonly number[] | null>(null);
  readonly saved = input<readonly number[] | null>(null);
  readonly busy = input(false);
  readonly save = output<number[]>();

  protected readonly texts = signal<string[]>(Array(DEFAULT_POSITIONS).fill(''));
  protected readonly problem = signal('');
  private readonly boxes = viewChildren<ElementRef<HTMLInputElement>>('reading');

  protected readonly values = computed(() => this.texts().map(parseCm));
  protected readonly check = computed(() => {
    const prev = this.previous();
    const lastMeanCm = prev?.length ? offsetStats(prev).meanCm : null;
    return checkOffsets(this.values().filter((v): v is number => v !== null), { ...this.context(), lastMeanCm });
  });
  protected readonly outliers = computed(() => outlierPositions(this.values(), this.check()));
  protected readonly MIN = MIN_POSITIONS;
  protected readonly MAX = MAX_POSITIONS;

  protected setText(i: number, text: string): void {
    this.texts.update((t) => t.map((x, j) => (j === i ? text : x)));
  }

  protected nextOnEnter(i: number, event: Event): void {
    event.preventDefault();
    const boxes = this.boxes();
    if (i + 1 < boxes.length) boxes[i + 1].nativeElement.focus();
    else this.submit();
  }

  protected addPosition(): void {
    if (this.texts().length < MAX_POSITIONS) this.texts.update((t) => [...t, '']);
  }

  protected removePosition(): void {
    if (this.texts().length > MIN_POSITIONS) this.texts.update((t) => t.slice(0, -1));
  }

  protected previousAt(i: number): number | null {
    return this.previous()?.[i] ?? null;
  }

  submit(): void {
    const values = this.values();
    const missing = values.flatMap((v, i) => (v === null ? [i + 1] : []));
    if (missing.length) {
      this.problem.set(`Read position${missing.length > 1 ? 's' : ''} ${missing.join(', ')} first (cm, e.g. 2.4).`);
      return;
    }
    const bad = values.find((v) => v! < 0 || v! > 30);
    if (bad !== undefined) {
      this.problem.set('Offsets are rim heights between 0 and 30 cm.');
      return;
    }
    this.problem.set('');
    this.save.emit(values as number[]);
  }

  /** After a save the form starts empty again: a second set at this visit is a correction. */
  clear(): void {
    this.texts.set(Array(this.texts().length).fill(''));
  }
}
