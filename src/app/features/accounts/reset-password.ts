import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { FormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { FormSubmit } from '../../core/forms/form-submit';
import { AccountApi } from './account-api';
import { MIN_PASSWORD_LENGTH, PASSWORD_HINT, describeAccountError } from './password-hint';

/** The page a reset mail links to: a new password, then sign in again everywhere. */
@Component({
  selector: 'fw-reset-password',
  imports: [ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatInputModule],
  template: `
    <main class="account-page">
      <section class="card" aria-labelledby="reset-title">
        <h1 id="reset-title">Set a new password</h1>
        @if (done()) {
          <p class="done" role="status">Your password is changed. Every device was signed out; sign in with the new password.</p>
          <p><a routerLink="/sign-in">Sign in</a></p>
        } @else {
          <form [formGroup]="form" (ngSubmit)="setPassword()" novalidate>
            <mat-form-field appearance="outline" subscriptSizing="dynamic">
              <mat-label>New password</mat-label>
              <input matInput type="password" name="password" formControlName="password" autocomplete="new-password" required />
              <mat-hint>{{ hint }}</mat-hint>
              @if (form.controls.password.invalid) { <mat-error>{{ hint }}</mat-error> }
            </mat-form-field>
            <p class="problem" role="alert">{{ submit.problem() }}</p>
            <button mat-flat-button type="submit" [disabled]="submit.busy() || !token()">Set the password</button>
          </form>
          @if (!token()) { <p class="problem">This link has no reset token in it. Open the link from the mail again.</p> }
          <p><a routerLink="/forgot-password">Ask for a new link</a></p>
        }
      </section>
    </main>
  `,
  styleUrl: './account-card.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ResetPassword {
  private readonly api = inject(AccountApi);
  /** From the link in the mail (?token=…). */
  readonly token = input<string>('');
  protected readonly hint = PASSWORD_HINT;
  protected readonly form = inject(FormBuilder).nonNullable.group({
    password: ['', [Validators.required, Validators.minLength(MIN_PASSWORD_LENGTH)]],
  });
  protected readonly done = signal(false);
  protected readonly submit = new FormSubmit(this.form, (err) => describeAccountError(err, 'The password could not be set.'));

  protected async setPassword(): Promise<void> {
    await this.submit.run(async () => {
      await this.api.confirmReset(this.token(), this.form.getRawValue().password);
      this.done.set(true);
    });
  }
}
