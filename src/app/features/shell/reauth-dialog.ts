import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { AuthStore } from '../../core/auth/auth-store';
import { describeSignInError } from '../sign-in/sign-in-error';

/** Password prompt for the same account; the screen underneath is left as it is. */
@Component({
  selector: 'fw-reauth-dialog',
  imports: [MatButtonModule, MatDialogModule, MatFormFieldModule, MatInputModule, ReactiveFormsModule],
  template: `
    <h2 mat-dialog-title>Sign in again</h2>
    <form [formGroup]="form" (ngSubmit)="signInAgain()">
      <mat-dialog-content>
        <p>Signed in on this device as <strong>{{ auth.user()?.email }}</strong>.</p>
        <mat-form-field appearance="outline">
          <mat-label>Password</mat-label>
          <input matInput type="password" autocomplete="current-password" formControlName="password" required />
        </mat-form-field>
        <div role="alert" class="problem">{{ problem() }}</div>
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button mat-button type="button" mat-dialog-close>Later</button>
        <button mat-flat-button type="submit" [disabled]="busy()">Sign in</button>
      </mat-dialog-actions>
    </form>
  `,
  styles: `
    mat-form-field { width: 100%; }
    .problem { color: var(--mat-sys-error); font-weight: 600; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReauthDialog {
  protected readonly auth = inject(AuthStore);
  private readonly ref = inject(MatDialogRef<ReauthDialog>);
  protected readonly password = new FormControl('', { nonNullable: true, validators: Validators.required });
  // [formGroup] gives the form its ngSubmit; a bare <form> would do a native submit and reload.
  protected readonly form = new FormGroup({ password: this.password });
  protected readonly busy = signal(false);
  protected readonly problem = signal('');

  protected async signInAgain(): Promise<void> {
    if (this.password.invalid || this.busy()) return;
    this.busy.set(true);
    try {
      await this.auth.signInAgain(this.password.value);
      this.ref.close(true);
    } catch (err) {
      this.problem.set(describeSignInError(err));
      this.password.reset();
    } finally {
      this.busy.set(false);
    }
  }
}
