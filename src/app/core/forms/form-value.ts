import type { Signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { map, type Observable } from 'rxjs';

/** A form's whole value as a signal (`getRawValue()`, so every field is typed as present), for views computed from it. */
export function formValue<V>(form: { valueChanges: Observable<unknown>; getRawValue(): V }): Signal<V> {
  return toSignal(form.valueChanges.pipe(map(() => form.getRawValue())), { initialValue: form.getRawValue() });
}
