import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { FormSubmit } from '../../core/forms/form-submit';
import { AccountApi } from './account-api';
import { MIN_PASSWORD_LENGTH, PASSWORD_HINT, describeAccountError } from './password-hint';

/** Change the signed-in user's password; other devices are signed out, this one stays. */
@Component({
  selector: 'fw-change-password',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatInputModule],
  template: `
    <section class="page" aria-labelledby="change-title">
      <h2 id="change-title">Change your password</h2>
      <form [formGroup]="form" (ngSubmit)="changePassword()" novalidate>
        <mat-form-field appearance="outline">
          <mat-label>Current password</mat-label>
          <input matInput type="password" name="currentPassword" formControlName="currentPassword" autocomplete="current-password" required />
        </mat-form-field>
        <mat-form-field appearance="outline" subscriptSizing="dynamic">
          <mat-label>New password</mat-label>
          <input matInput type="password" name="newPassword" formControlName="newPassword" autocomplete="new-password" required />
          <mat-hint>{{ hint }}</mat-hint>
          @if (form.controls.newPassword.invalid) { <mat-error>{{ hint }}</mat-error> }
        </mat-form-field>
        <p class="problem" role="alert">{{ submit.problem() }}</p>
        <p class="done" role="status">{{ done() }}</p>
        <button mat-flat-button type="submit" [disabled]="submit.busy()">Change password</button>
      </form>
    </section>
  `,
  styles: `
    .page { max-width: 440px; padding: 16px; }
    form { display: flex; flex-direction: column; gap: 4px; }
    .problem { color: var(--mat-sys-error); font-weight: 600; margin: 0; }
    .done { color: var(--mat-sys-primary); font-weight: 600; margin: 0; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ChangePassword {
  private readonly api = inject(AccountApi);
  protected readonly hint = PASSWORD_HINT;
  protected readonly form = inject(FormBuilder).nonNullable.group({
    currentPassword: ['', Validators.required],
    newPassword: ['', [Validators.required, Validators.minLength(MIN_PASSWORD_LENGTH)]],
  });
  protected readonly done = signal('');
  protected readonly submit = new FormSubmit(this.form, (err) => describeAccountError(err, 'The password was not changed.'));

  protected async changePassword(): Promise<void> {
    await this.submit.run(async () => {
      this.done.set('');
      const { currentPassword, newPassword } = this.form.getRawValue();
      await this.api.changePassword(currentPassword, newPassword);
      this.form.reset();
      this.done.set('Password changed. Your other devices were signed out; this one stays signed in.');
    });
  }
}
