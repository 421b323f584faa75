import { signal, type Signal } from '@angular/core';
import type { AbstractControl } from '@angular/forms';

/**
 * The frame around a form's submit: one request at a time, an invalid form only shows its field
 * errors, and a failure becomes one sentence for the page. `problem` is '' when there is nothing
 * to say (templates test it for truth); it stays writable so other actions on the same page
 * (loading a list, withdrawing) report in the same place.
 */
export class FormSubmit {
  private readonly running = signal(false);
  readonly busy: Signal<boolean> = this.running.asReadonly();
  readonly problem = signal('');

  constructor(
    private readonly form: AbstractControl,
    private readonly describe: (err: unknown) => string,
  ) {}

  async run(work: () => Promise<void>): Promise<void> {
    if (this.running()) return;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.running.set(true);
    this.problem.set('');
    try {
      await work();
    } catch (err) {
      this.problem.set(this.describe(err));
    } finally {
      this.running.set(false);
    }
  }
}
