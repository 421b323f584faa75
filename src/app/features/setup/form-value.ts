import type { Signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import type { FormGroup } from '@angular/forms';
import { map } from 'rxjs';

/** A form's whole value as a signal (`getRawValue()`, so every field is typed as present), for views computed from it. */
export function formValue<F extends FormGroup>(form: F): Signal<ReturnType<F['getRawValue']>> {
  return toSignal(form.valueChanges.pipe(map(() => form.getRawValue() as ReturnType<F['getRawValue']>)), {
    initialValue: form.getRawValue() as ReturnType<F['getRawValue']>,
  });
}
