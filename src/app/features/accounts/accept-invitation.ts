import { ChangeDetectionStrategy, Component, computed, inject, input, resource } from '@angular/core';
import { FormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { AuthStore } from '../../core/auth/auth-store';
import { homePathFor } from '../../core/auth/destinations';
import { FormSubmit } from '../../core/forms/form-submit';
import { AccountApi, type InvitationPreview } from './account-api';
import { MIN_PASSWORD_LENGTH, PASSWORD_HINT, describeAccountError } from './password-hint';

/** The page an invitation mail links to: choose a name and a password, then straight into the app. */
@Component({
  selector: 'fw-accept-invitation',
  imports: [ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatInputModule, MatProgressBarModule],
  templateUrl: './accept-invitation.html',
  styleUrl: './account-card.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AcceptInvitation {
  private readonly api = inject(AccountApi);
  private readonly auth = inject(AuthStore);
  private readonly router = inject(Router);

  /** From the link in the mail (?token=…). */
  readonly token = input<string>('');

  protected readonly hint = PASSWORD_HINT;
  private readonly lookup = resource({
    params: () => this.token() || undefined,
    loader: ({ params: token }) => this.api.lookupInvitation(token),
  });
  protected readonly invitation = computed<InvitationPreview | null>(() => (this.lookup.hasValue() ? this.lookup.value() : null));
  /** Why the invitation cannot be shown: no token in the link, or the server's refusal. */
  protected readonly lookupProblem = computed(() => {
    if (!this.token()) return 'This link has no invitation in it. Open the link from the mail again.';
    const err = this.lookup.error();
    return err ? describeAccountError(err, 'This invitation could not be opened.') : '';
  });
  protected readonly form = inject(FormBuilder).nonNullable.group({
    displayName: ['', [Validators.required, Validators.maxLength(120)]],
    password: ['', [Validators.required, Validators.minLength(MIN_PASSWORD_LENGTH)]],
  });
  protected readonly submit = new FormSubmit(this.form, (err) => describeAccountError(err, 'The account could not be made.'));

  protected async createAccount(): Promise<void> {
    const invitation = this.invitation();
    if (!invitation) return;
    await this.submit.run(async () => {
      const { displayName, password } = this.form.getRawValue();
      await this.api.acceptInvitation(this.token(), displayName.trim(), password);
      const user = await this.auth.signIn(invitation.email, password);
      await this.router.navigateByUrl(homePathFor(user.roles));
    });
  }
}
