import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { Role } from '../../core/auth/session-user';

export interface InvitationPreview {
  email: string;
  roles: Role[];
  sites: { id: string; name: string }[];
  expiresAt: string;
}

export interface OpenInvitation extends InvitationPreview {
  id: string;
  invitedBy: string | null;
  createdAt: string;
}

/** The accounts API: invitations, accepting one, password change and reset. */
@Injectable({ providedIn: 'root' })
export class AccountApi {
  private readonly http = inject(HttpClient);

  async lookupInvitation(token: string): Promise<InvitationPreview> {
    return (await firstValueFrom(this.http.post<{ invitation: InvitationPreview }>('/api/invitations/lookup', { token }))).invitation;
  }

  async acceptInvitation(token: string, displayName: string, password: string): Promise<{ email: string }> {
    return (
      await firstValueFrom(this.http.post<{ account: { email: string } }>('/api/invitations/accept', { token, displayName, password }))
    ).account;
  }

  async invite(email: string, roles: Role[], siteIds: string[]): Promise<OpenInvitation> {
    return (await firstValueFrom(this.http.post<{ invitation: OpenInvitation }>('/api/invitations', { email, roles, siteIds }))).invitation;
  }

  async openInvitations(): Promise<OpenInvitation[]> {
    return (await firstValueFrom(this.http.get<{ items: OpenInvitation[] }>('/api/invitations'))).items;
  }

  async withdraw(id: string): Promise<void> {
    await firstValueFrom(this.http.delete(`/api/invitations/${id}`));
  }

  async changePassword(currentPassword: string, newPassword: string): Promise<void> {
    await firstValueFrom(this.http.post('/api/auth/password', { currentPassword, newPassword }));
  }

  async requestReset(email: string): Promise<string> {
    return (await firstValueFrom(this.http.post<{ message: string }>('/api/auth/password-reset', { email }))).message;
  }

  async confirmReset(token: string, password: string): Promise<void> {
    await firstValueFrom(this.http.post('/api/auth/password-reset/confirm', { token, password }));
  }
}
