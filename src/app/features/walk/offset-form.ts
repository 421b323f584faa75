import { DecimalPipe } from '@angular/common';
import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  ElementRef,
  computed,
  inject,
  input,
  output,
  signal,
  viewChild,
  viewChildren,
} from '@angular/core';
import { takeUntilDestroyed, toObservable, toSignal } from '@angular/core/rxjs-interop';
import { FormArray, FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { debounceTime } from 'rxjs';
import { offsetStats } from '../../../../shared/model/derived';
import { checkOffsets, outlierPositions, type OffsetContext } from './offset-check';

export const MIN_POSITIONS = 3;
export const MAX_POSITIONS = 8;
export const DEFAULT_POSITIONS = 4;
/** Quiet time after the last keystroke before a complete set is saved, ms. */
export const AUTOSAVE_MS = 900;
/** One ± step, cm: the resolution a rim height is read to with a ruler. */
export const STEP_CM = 0.1;

/** "2,4" and "2.4" both read as 2.4 cm (gloved thumbs on a phone keypad hit either). */
export function parseCm(text: string): number | null {
  const t = text.trim().replace(',', '.');
  if (!t) return null;
  const v = Number(t);
  return Number.isFinite(v) ? v : null;
}

const sameValues = (a: readonly number[] | null, b: readonly number[] | null) =>
  !!a && !!b && a.length === b.length && a.every((v, i) => v === b[i]);
const cmText = (v: number) => (Math.round(v * 100) / 100).toFixed(1).replace(/(\.\d)0$/, '$1');

/**
 * One offset set: 3–8 rim heights read around the collar. A set like the last one goes in with
 * one tap ("same as last") or a few ± 0.1 cm steps from it; typed values work as before (Enter
 * goes to the next position). A complete set saves itself after a short pause, the saved values
 * stay in the boxes, and the section folds to one line until the crew asks to change it.
 */
@Component({
  selector: 'fw-offset-form',
  imports: [DecimalPipe, MatButtonModule, MatFormFieldModule, MatInputModule, ReactiveFormsModule],
  templateUrl: './offset-form.html',
  styles: `
    // Rows 12 px apart: an outlined field's floating label rises above its box, over the hint or text above.
    .positions {
      display: grid;
      grid-template-columns: 1fr 1fr;
      gap: 12px 8px;
    }
    // A phone has room for one position a row between its two 48 px steps.
    @media (max-width: 599.98px) {
      .positions {
        grid-template-columns: 1fr;
      }
    }
    .position {
      display: flex;
      align-items: center;
      gap: 2px;
    }
    .position mat-form-field {
      flex: 1;
      min-width: 0;
      width: 0;
    }
    :host ::ng-deep .position .mat-mdc-form-field-infix {
      width: auto;
      min-width: 0;
    }
    :host ::ng-deep .position .mdc-notched-outline__notch {
      max-width: calc(100% - 24px) !important;
    }
    .position .step {
      flex: none;
      width: 48px;
      min-width: 48px;
      height: 48px;
      padding: 0;
      font-size: 1.3rem;
    }
    .outlier {
      outline: 3px dashed var(--mat-sys-error);
      outline-offset: 2px;
      border-radius: 4px;
    }
    .stats {
      display: flex;
      flex-wrap: wrap;
      gap: 4px 16px;
      font-size: 1.05rem;
      margin: 0 0 8px;
    }
    .stats dt {
      font-weight: 600;
    }
    .stats div {
      display: flex;
      gap: 6px;
    }
    .stats dd {
      margin: 0;
    }
    .warning {
      border: 2px solid var(--mat-sys-error);
      padding: 8px 12px;
      border-radius: 8px;
      margin: 8px 0;
      font-weight: 600;
    }
    .warning::before {
      content: '⚠ ';
    }
    .row {
      display: flex;
      flex-wrap: wrap;
      gap: 8px;
      align-items: center;
    }
    .summary {
      display: flex;
      align-items: center;
      justify-content: space-between;
      gap: 8px;
      margin: 0;
    }
    button {
      min-height: 48px;
    }
    .help {
      margin: 0 0 12px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OffsetForm {
  readonly context = input.required<Omit<OffsetContext, 'lastMeanCm'>>();
  readonly previous = input<readonly number[] | null>(null);
  readonly saved = input<readonly number[] | null>(null);
  readonly busy = input(false);
  readonly save = output<number[]>();

  protected readonly positions = new FormArray<FormControl<string>>(
    Array.from({ length: DEFAULT_POSITIONS }, () => new FormControl('', { nonNullable: true })),
  );
  private readonly texts = toSignal(this.positions.valueChanges, { initialValue: this.positions.getRawValue() });
  /** The size of one ± step at a position. */
  protected readonly stepCm = STEP_CM;
  protected readonly problem = signal('');
  /** The crew asked to change a saved set: the boxes stay open. */
  protected readonly editing = signal(false);
  private readonly boxes = viewChildren<ElementRef<HTMLInputElement>>('reading');
  private readonly positionsBlock = viewChild<ElementRef<HTMLElement>>('positionsBlock');

  protected readonly values = computed(() => this.texts().map(parseCm));
  protected readonly check = computed(() => {
    const prev = this.previous();
    const lastMeanCm = prev?.length ? offsetStats(prev).meanCm : null;
    return checkOffsets(
      this.values().filter((v): v is number => v !== null),
      { ...this.context(), lastMeanCm },
    );
  });
  protected readonly outliers = computed(() => outlierPositions(this.values(), this.check()));
  protected readonly collapsed = computed(() => !!this.saved()?.length && !this.editing());
  protected readonly savedText = computed(() => this.saved()?.map(cmText).join(' · ') ?? '');
  protected readonly previousText = computed(() => this.previous()?.map(cmText).join(' · ') ?? '');
  protected readonly MIN = MIN_POSITIONS;
  protected readonly MAX = MAX_POSITIONS;

  constructor() {
    // The saved set fills the boxes (on opening the visit again, and after each save).
    toObservable(this.saved)
      .pipe(takeUntilDestroyed())
      .subscribe((saved) => {
        if (saved?.length && !sameValues(saved, this.completeValues())) this.setValues(saved, false);
      });
    this.positions.valueChanges.pipe(debounceTime(AUTOSAVE_MS), takeUntilDestroyed(inject(DestroyRef))).subscribe(() => this.autosave());
  }

  private completeValues(): number[] | null {
    const v = this.values();
    return v.every((x) => x !== null) ? (v as number[]) : null;
  }

  private setValues(values: readonly number[], emit: boolean): void {
    while (this.positions.length < values.length) this.positions.push(new FormControl('', { nonNullable: true }), { emitEvent: false });
    while (this.positions.length > values.length && this.positions.length > MIN_POSITIONS)
      this.positions.removeAt(this.positions.length - 1, { emitEvent: false });
    this.positions.setValue(values.map(cmText), { emitEvent: emit });
    if (!emit) this.positions.updateValueAndValidity({ emitEvent: true });
  }

  /**
   * Once a box takes focus, the whole set comes into view together (above the visit's bottom bar), so
   * Enter moves between boxes without scrolling the page at each one.
   */
  protected showAllPositions(): void {
    this.positionsBlock()?.nativeElement.scrollIntoView({ block: 'nearest' });
  }

  protected nextOnEnter(i: number, event: Event): void {
    event.preventDefault();
    const boxes = this.boxes();
    if (i + 1 < boxes.length) boxes[i + 1].nativeElement.focus();
    else this.submit();
  }

  protected addPosition(): void {
    if (this.positions.length < MAX_POSITIONS) this.positions.push(new FormControl('', { nonNullable: true }));
  }

  protected removePosition(): void {
    if (this.positions.length > MIN_POSITIONS) this.positions.removeAt(this.positions.length - 1);
  }

  protected previousAt(i: number): number | null {
    return this.previous()?.[i] ?? null;
  }

  /** The last set again, saved at once (the rim has not moved). */
  sameAsLast(): void {
    const prev = this.previous();
    if (!prev?.length) return;
    this.setValues(prev, false);
    this.submit();
  }

  /** One ± 0.1 cm step at a position, starting from the last set's value when the box is empty. */
  step(i: number, delta: number): void {
    const control = this.positions.at(i);
    const base = parseCm(control.value) ?? this.previousAt(i) ?? 0;
    control.setValue(cmText(Math.max(0, Math.round((base + delta) * 10) / 10)));
  }

  protected change(): void {
    this.editing.set(true);
  }

  private autosave(): void {
    const values = this.completeValues();
    if (!values || sameValues(values, this.saved())) return;
    this.submit();
  }

  submit(): void {
    const values = this.values();
    const missing = values.flatMap((v, i) => (v === null ? [i + 1] : []));
    if (missing.length) {
      this.problem.set(`Read position${missing.length > 1 ? 's' : ''} ${missing.join(', ')} first (cm, e.g. 2.4).`);
      return;
    }
    if (values.some((v) => v! < 0 || v! > 30)) {
      this.problem.set('Offsets are rim heights between 0 and 30 cm.');
      return;
    }
    this.problem.set('');
    this.editing.set(false);
    if (!sameValues(values as number[], this.saved())) this.save.emit(values as number[]);
  }
}
