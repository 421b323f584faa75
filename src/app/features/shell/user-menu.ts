import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatDividerModule } from '@angular/material/divider';
import { MatIconModule } from '@angular/material/icon';
import { MatMenuModule } from '@angular/material/menu';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { AuthStore } from '../../core/auth/auth-store';
import { SiteChoice } from '../../core/auth/site-choice';
import { DeviceRemoval } from '../../core/device/device-removal';
import { PendingWorkGuard } from '../../core/sw-update/pending-work-guard';
import { OutdoorMode } from '../../core/theme/outdoor-mode';
import { SignOutRemoveDialog } from './sign-out-remove-dialog';

/** The signed-in user, their sites (with the site picker), the outdoor theme, sign-out, and sign-out that removes the user's data from a shared device. */
@Component({
  selector: 'fw-user-menu',
  imports: [RouterLink, MatButtonModule, MatDividerModule, MatIconModule, MatMenuModule],
  templateUrl: './user-menu.html',
  styleUrl: './user-menu.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class UserMenu {
  protected readonly auth = inject(AuthStore);
  protected readonly siteChoice = inject(SiteChoice);
  protected readonly outdoor = inject(OutdoorMode);
  private readonly pendingWork = inject(PendingWorkGuard);
  private readonly router = inject(Router);
  private readonly snackBar = inject(MatSnackBar);
  private readonly removal = inject(DeviceRemoval);
  private readonly dialog = inject(MatDialog);

  protected readonly roleList = computed(() => this.auth.roles().join(', '));

  protected chooseSite(siteId: string): void {
    this.siteChoice.choose(siteId);
  }

  protected refreshAccount(): void {
    void this.auth.refresh();
  }

  protected async signOut(): Promise<void> {
    const pending = this.pendingWork.count();
    if (pending > 0) {
      // Signing out forgets this device's session; unsent work must reach the server first.
      this.snackBar.open(`${pending} not yet synced — sync before signing out.`, 'OK', { duration: 8000 });
      return;
    }
    await this.auth.signOut();
    await this.router.navigateByUrl('/sign-in');
  }

  /** For a shared tablet: the next person finds none of this user's records, queued work or Board copies. */
  protected async signOutAndRemove(): Promise<void> {
    const unsaved = await this.removal.unsaved();
    if (unsaved.pending + unsaved.refused + unsaved.conflicts > 0) {
      const ref = this.dialog.open<SignOutRemoveDialog, typeof unsaved, boolean>(SignOutRemoveDialog, { data: unsaved, maxWidth: '560px' });
      if ((await firstValueFrom(ref.afterClosed())) !== true) return;
    }
    await this.removal.signOutAndRemove();
    await this.router.navigateByUrl('/sign-in');
    this.snackBar.open('Signed out. Your data was removed from this device.', 'OK', { duration: 6000 });
  }
}
