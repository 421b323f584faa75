import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { SessionExpiry } from '../../core/auth/session-expiry';
import { ReauthDialog } from './reauth-dialog';

/** "Sign in again" above the current screen after the server ended the session. */
@Component({
  selector: 'fw-session-banner',
  imports: [MatButtonModule, MatIconModule],
  template: `
    @if (expiry.expired()) {
      <div class="banner" role="status">
        <mat-icon aria-hidden="true">lock_clock</mat-icon>
        <span>Your session has ended. Sign in again to reach the server — what is on screen stays.</span>
        <button mat-flat-button type="button" (click)="openSignInAgain()">Sign in again</button>
      </div>
    }
  `,
  styles: `
    .banner {
      display: flex; flex-wrap: wrap; align-items: center; gap: 12px;
      padding: 12px 16px;
      background: var(--mat-sys-tertiary-container);
      color: var(--mat-sys-on-tertiary-container);
      font-weight: 600;
    }
    span { flex: 1 1 240px; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SessionBanner {
  protected readonly expiry = inject(SessionExpiry);
  private readonly dialog = inject(MatDialog);

  protected openSignInAgain(): void {
    this.dialog.open(ReauthDialog, { width: 'min(420px, 92vw)', autoFocus: 'first-tabbable' });
  }
}
