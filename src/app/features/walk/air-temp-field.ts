import { ChangeDetectionStrategy, Component, effect, input, output } from '@angular/core';
import { FormControl, ReactiveFormsModule, type AbstractControl, type ValidationErrors } from '@angular/forms';
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
 * closures whose analyzer file has none (shared/flux/chamber-air-temperature.ts).
 */
@Component({
  selector: 'fw-air-temp-field',
  imports: [ReactiveFormsModule, MatFormFieldModule, MatInputModule],
  template: `
    <mat-form-field appearance="outline" subscriptSizing="dynamic">
      <mat-label>Air temperature (°C)</mat-label>
      <input matInput type="text" inputmode="decimal" autocomplete="off" data-testid="air-temp" [formControl]="control" />
      <mat-hint>For closures whose analyzer file has no chamber temperature</mat-hint>
      <mat-error>Enter a temperature from −40 to 60 °C, e.g. 12,5</mat-error>
    </mat-form-field>
  `,
  // The field takes its row's width, and its two-line hint pushes what follows down instead of running over it.
  styles: `:host { display: block; } mat-form-field { width: 100%; }`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AirTempField {
  readonly value = input<number | null>(null);
  readonly valueChange = output<number | null>();
  protected readonly control = new FormControl('', { nonNullable: true, validators: [validAirTemp] });
  /** The last value this field sent up: coming back as the input, it must not overwrite what the crew is typing. */
  private sent: number | null | undefined = undefined;

  constructor() {
    // Show a value that arrives from outside (the stored visit), never an echo of the crew's typing.
    effect(() => {
      const v = this.value();
      if (v !== this.sent && parseAirTemp(this.control.value) !== v)
        this.control.setValue(v === null ? '' : String(v), { emitEvent: false });
    });
    this.control.valueChanges.subscribe((text) => {
      const v = parseAirTemp(text);
      if (v === undefined) return;
      this.sent = v;
      this.valueChange.emit(v);
    });
  }
}
