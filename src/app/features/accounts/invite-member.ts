import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, type WritableSignal } from '@angular/core';
import { FormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { formatSiteTime } from '../../../../shared/time/site-time';
import { AuthStore } from '../../core/auth/auth-store';
import { LEAD_INVITES, ROLES, type Role } from '../../core/auth/session-user';
import { FormSubmit } from '../../core/forms/form-submit';
import { AccountApi, type InvitationPreview, type OpenInvitation } from './account-api';
import { describeAccountError } from './password-hint';

/**
 * Invite someone by e-mail. Admins choose any roles and sites; leads invite crew to their own
 * sites (the server enforces both). Open invitations are listed and can be withdrawn.
 */
@Component({
  selector: 'fw-invite-member',
  imports: [ReactiveFormsModule, MatButtonModule, MatCheckboxModule, MatFormFieldModule, MatInputModule],
  templateUrl: './invite-member.html',
  styles: `
    .page {
      max-width: 640px;
      padding: 16px;
    }
    form {
      display: flex;
      flex-direction: column;
      gap: 4px;
    }
    fieldset {
      border: 1px solid var(--mat-sys-outline-variant);
      border-radius: 8px;
      margin: 0 0 12px;
      padding: 8px 12px;
    }
    legend {
      padding: 0 4px;
    }
    .problem {
      color: var(--mat-sys-error);
      font-weight: 600;
      margin: 0;
    }
    .done {
      color: var(--mat-sys-primary);
      font-weight: 600;
      margin: 0;
    }
    ul.open {
      list-style: none;
      padding: 0;
    }
    ul.open li {
      display: flex;
      gap: 12px;
      align-items: center;
      justify-content: space-between;
      border-top: 1px solid var(--mat-sys-outline-variant);
      padding: 6px 0;
    }
    .meta {
      font-size: 0.85rem;
      color: var(--mat-sys-on-surface-variant);
      display: block;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InviteMember {
  private readonly api = inject(AccountApi);
  private readonly auth = inject(AuthStore);

  /** Preselected site (?siteId=…, e.g. from Setup's Members tab). */
  readonly siteId = input<string>('');

  protected readonly isAdmin = computed(() => this.auth.roles().includes('admin'));
  protected readonly roleChoices = computed<readonly Role[]>(() => (this.isAdmin() ? ROLES : LEAD_INVITES));
  protected readonly sites = this.auth.sites;
  protected readonly chosenRoles = signal<Role[]>([...LEAD_INVITES]);
  protected readonly chosenSites = signal<string[]>([]);
  protected readonly open = signal<OpenInvitation[]>([]);
  protected readonly done = signal('');
  protected readonly form = inject(FormBuilder).nonNullable.group({ email: ['', [Validators.required, Validators.email]] });
  protected readonly submit = new FormSubmit(this.form, (err) => describeAccountError(err, 'The invitation was not sent.'));

  constructor() {
    effect(() => {
      const preset = this.siteId();
      if (preset) this.chosenSites.set([preset]);
      else if (this.sites().length === 1) this.chosenSites.set([this.sites()[0].id]);
    });
    void this.loadOpen();
  }

  protected toggle<T>(list: WritableSignal<T[]>, value: T, on: boolean): void {
    list.update((all) => (on ? [...new Set([...all, value])] : all.filter((v) => v !== value)));
  }

  protected async sendInvitation(): Promise<void> {
    await this.submit.run(async () => {
      this.done.set('');
      const sent = await this.api.invite(this.form.getRawValue().email.trim(), this.chosenRoles(), this.chosenSites());
      this.done.set(`Invitation sent to ${sent.email}. The link works once, until ${this.expiry(sent)}.`);
      this.form.reset();
      await this.loadOpen();
    });
  }

  protected async withdraw(inv: OpenInvitation): Promise<void> {
    try {
      await this.api.withdraw(inv.id);
      this.done.set(`Invitation to ${inv.email} withdrawn; its link no longer works.`);
      await this.loadOpen();
    } catch (err) {
      this.submit.problem.set(describeAccountError(err, 'Not withdrawn.'));
    }
  }

  /** When the link stops working, in the (first) invited site's zone, as the server's mail says it; UTC for no site. */
  protected expiry(inv: InvitationPreview): string {
    const zone = this.sites().find((s) => s.id === inv.sites[0]?.id)?.timezone ?? 'UTC';
    return formatSiteTime(inv.expiresAt, zone);
  }

  private async loadOpen(): Promise<void> {
    try {
      this.open.set(await this.api.openInvitations());
    } catch (err) {
      this.submit.problem.set(describeAccountError(err, 'Open invitations could not be loaded.'));
    }
  }
}
