import { ChangeDetectionStrategy, Component, computed, inject, input, resource, signal } from '@angular/core';
import { FormBuilder, FormControl, FormRecord, ReactiveFormsModule, Validators } from '@angular/forms';
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
  /** One box per role; crew is chosen to begin with (all a lead may invite). */
  protected readonly roleBoxes = new FormRecord(
    Object.fromEntries(ROLES.map((r) => [r, new FormControl((LEAD_INVITES as readonly Role[]).includes(r), { nonNullable: true })])),
  );
  /** One box per site of the inviter; the preselected site, or the only one, is chosen to begin with. */
  protected readonly siteBoxes = computed(() => {
    const sites = this.sites();
    const preset = this.siteId() || (sites.length === 1 ? sites[0]!.id : '');
    return new FormRecord(Object.fromEntries(sites.map((s) => [s.id, new FormControl(s.id === preset, { nonNullable: true })])));
  });
  private readonly openList = resource({ loader: () => this.api.openInvitations() });
  protected readonly open = computed(() => (this.openList.hasValue() ? this.openList.value() : []));
  protected readonly done = signal('');
  protected readonly form = inject(FormBuilder).nonNullable.group({ email: ['', [Validators.required, Validators.email]] });
  protected readonly submit = new FormSubmit(this.form, (err) => describeAccountError(err, 'The invitation was not sent.'));
  /** A failed load of the open invitations, said where the form's own problems are. */
  protected readonly problem = computed(() => {
    const err = this.openList.error();
    return this.submit.problem() || (err ? describeAccountError(err, 'Open invitations could not be loaded.') : '');
  });

  protected box(boxes: FormRecord<FormControl<boolean>>, key: string): FormControl<boolean> {
    return boxes.controls[key]!;
  }

  private chosen<K extends string>(boxes: FormRecord<FormControl<boolean>>, keys: readonly K[]): K[] {
    return keys.filter((k) => boxes.controls[k]?.value);
  }

  protected async sendInvitation(): Promise<void> {
    await this.submit.run(async () => {
      this.done.set('');
      const roles = this.isAdmin() ? this.chosen(this.roleBoxes, ROLES) : [...LEAD_INVITES];
      const siteIds = this.chosen(
        this.siteBoxes(),
        this.sites().map((s) => s.id),
      );
      const sent = await this.api.invite(this.form.getRawValue().email.trim(), roles, siteIds);
      this.done.set(`Invitation sent to ${sent.email}. The link works once, until ${this.expiry(sent)}.`);
      this.form.reset();
      this.openList.reload();
    });
  }

  protected async withdraw(inv: OpenInvitation): Promise<void> {
    try {
      await this.api.withdraw(inv.id);
      this.done.set(`Invitation to ${inv.email} withdrawn; its link no longer works.`);
      this.openList.reload();
    } catch (err) {
      this.submit.problem.set(describeAccountError(err, 'Not withdrawn.'));
    }
  }

  /** When the link stops working, in the (first) invited site's zone, as the server's mail says it; UTC for no site. */
  protected expiry(inv: InvitationPreview): string {
    const zone = this.sites().find((s) => s.id === inv.sites[0]?.id)?.timezone ?? 'UTC';
    return formatSiteTime(inv.expiresAt, zone);
  }
}
