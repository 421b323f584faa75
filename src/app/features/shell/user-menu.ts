import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDividerModule } from '@angular/material/divider';
import { MatIconModule } from '@angular/material/icon';
import { MatMenuModule } from '@angular/material/menu';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, RouterLink } from '@angular/router';
import { AuthStore } from '../../core/auth/auth-store';
import { SiteChoice } from '../../core/auth/site-choice';
import { PendingWorkGuard } from '../../core/sw-update/pending-work-guard';
import { OutdoorMode } from '../../core/theme/outdoor-mode';

/** The signed-in user, their sites (with the site picker), the outdoor theme and sign-out. */
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
}
