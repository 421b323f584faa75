import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { RouterLink } from '@angular/router';
import { FormSubmit } from '../../core/forms/form-submit';
import { AccountApi } from './account-api';
import { describeAccountError } from './password-hint';

/** Asks for a reset link; the answer is the same whether or not the address has an account. */
@Component({
  selector: 'fw-forgot-password',
  imports: [ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatInputModule],
  template: `
    <main class="account-page">
      <section class="card" aria-labelledby="forgot-title">
        <h1 id="forgot-title">Forgot your password?</h1>
        @if (sent(); as message) {
          <p class="done" role="status">{{ message }}</p>
          <p><a routerLink="/sign-in">Back to sign-in</a></p>
        } @else {
          <p>Enter the address you sign in with. We send a link to set a new password; it works once.</p>
          <form [formGroup]="form" (ngSubmit)="sendLink()" novalidate>
            <mat-form-field appearance="outline">
              <mat-label>E-mail</mat-label>
              <input matInput type="email" name="email" formControlName="email" autocomplete="username" required />
              @if (form.controls.email.invalid) { <mat-error>Enter an e-mail address.</mat-error> }
            </mat-form-field>
            <p class="problem" role="alert">{{ submit.problem() }}</p>
            <button mat-flat-button type="submit" [disabled]="submit.busy()">Send the link</button>
          </form>
          <p><a routerLink="/sign-in">Back to sign-in</a></p>
        }
      </section>
    </main>
  `,
  styleUrl: './account-card.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ForgotPassword {
  private readonly api = inject(AccountApi);
  protected readonly form = inject(FormBuilder).nonNullable.group({ email: ['', [Validators.required, Validators.email]] });
  protected readonly sent = signal<string | null>(null);
  protected readonly submit = new FormSubmit(this.form, (err) => describeAccountError(err, 'The link could not be asked for.'));

  protected async sendLink(): Promise<void> {
    await this.submit.run(async () => {
      this.sent.set(await this.api.requestReset(this.form.getRawValue().email.trim()));
    });
  }
}
