import { ChangeDetectionStrategy, Component, inject, input } from '@angular/core';
import { AbstractControl, FormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { ErrorStateMatcher } from '@angular/material/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { AuthStore } from '../../core/auth/auth-store';
import { homePathFor } from '../../core/auth/destinations';
import { FormSubmit } from '../../core/forms/form-submit';
import { describeSignInError } from './sign-in-error';

/**
 * Field errors show once a field was touched (an empty submit touches every field), not merely
 * because the form was submitted: after the server refuses a password the field is emptied and
 * the one message that matters is the server's ("Wrong e-mail or password").
 */
class TouchedErrorStateMatcher implements ErrorStateMatcher {
  isErrorState(control: AbstractControl | null): boolean {
    return !!control && control.invalid && control.touched;
  }
}

@Component({
  selector: 'fw-sign-in',
  providers: [{ provide: ErrorStateMatcher, useClass: TouchedErrorStateMatcher }],
  imports: [ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule],
  templateUrl: './sign-in.html',
  styleUrl: './sign-in.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SignIn {
  private readonly auth = inject(AuthStore);
  private readonly router = inject(Router);

  /** Where a guard sent the user from (query parameter), so they return there. */
  readonly returnTo = input<string>();

  protected readonly form = inject(FormBuilder).nonNullable.group({
    email: ['', [Validators.required, Validators.email]],
    password: ['', Validators.required],
  });
  protected readonly submit = new FormSubmit(this.form, describeSignInError);

  protected async signIn(): Promise<void> {
    await this.submit.run(async () => {
      const { email, password } = this.form.getRawValue();
      try {
        const user = await this.auth.signIn(email.trim(), password);
        const target = this.returnTo();
        await this.router.navigateByUrl(target?.startsWith('/') ? target : homePathFor(user.roles));
      } catch (err) {
        // A refused password is typed again, not edited; the frame still reports the error.
        this.form.controls.password.reset();
        throw err;
      }
    });
  }
}
