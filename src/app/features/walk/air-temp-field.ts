import { ChangeDetectionStrategy, Component, forwardRef } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import {
  FormControl,
  NG_VALUE_ACCESSOR,
  ReactiveFormsModule,
  type AbstractControl,
  type ControlValueAccessor,
  type ValidationErrors,
} from '@angular/forms';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { visitConditionsSchema } from '../../../../shared/model/field-records';

const airTemp = visitConditionsSchema.shape.airTempC;

/** '' → null (not read); '12,5' or '12.5' → 12.5; anything else, or out of the schema's range → undefined. */
export function parseAirTemp(text: string): number | null | undefined {
  const t = text.trim().replace(',', '.');
  if (t === '') return null;
  if (!/^[-−]?\d+(\.\d+)?$/.test(t)) return undefined;
  const v = Number(t.replace('−', '-'));
  return airTemp.safeParse(v).success ? v : undefined;
}

const validAirTemp = (c: AbstractControl<string>): ValidationErrors | null =>
  parseAirTemp(c.value) === undefined ? { airTemp: true } : null;

/**
 * The air temperature at the collar, one of the visit conditions: the chamber air temperature of
 * closures whose analyzer file has none (shared/flux/chamber-air-temperature.ts). A form control of
 * its own (`formControlName="airTempC"`, a number or null): the text box keeps what the crew types
 * ("12,5") and hands the form only values that parse within the schema's range.
 */
@Component({
  selector: 'fw-air-temp-field',
  imports: [ReactiveFormsModule, MatFormFieldModule, MatInputModule],
  template: `
    <mat-form-field appearance="outline" subscriptSizing="dynamic">
      <mat-label>Air temperature (°C)</mat-label>
      <input matInput type="text" inputmode="decimal" autocomplete="off" data-testid="air-temp" [formControl]="control" (blur)="touched()" />
      <mat-hint>For closures whose analyzer file has no chamber temperature</mat-hint>
      <mat-error>Enter a temperature from −40 to 60 °C, e.g. 12,5</mat-error>
    </mat-form-field>
  `,
  // The field takes its row's width, and its two-line hint pushes what follows down instead of running over it.
  styles: `:host { display: block; } mat-form-field { width: 100%; }`,
  providers: [{ provide: NG_VALUE_ACCESSOR, useExisting: forwardRef(() => AirTempField), multi: true }],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AirTempField implements ControlValueAccessor {
  protected readonly control = new FormControl('', { nonNullable: true, validators: [validAirTemp] });
  private changed: (v: number | null) => void = () => undefined;
  protected touched: () => void = () => undefined;

  constructor() {
    this.control.valueChanges.pipe(takeUntilDestroyed()).subscribe((text) => {
      const v = parseAirTemp(text);
      if (v !== undefined) this.changed(v);
    });
  }

  /** A value from the form (the stored visit): shown unless the box already says it ("12,5" stays). */
  writeValue(v: number | null): void {
    if (parseAirTemp(this.control.value) !== v) this.control.setValue(v === null ? '' : String(v), { emitEvent: false });
  }

  registerOnChange(fn: (v: number | null) => void): void {
    this.changed = fn;
  }

  registerOnTouched(fn: () => void): void {
    this.touched = fn;
  }

  setDisabledState(disabled: boolean): void {
    if (disabled) this.control.disable({ emitEvent: false });
    else this.control.enable({ emitEvent: false });
  }
}
