import { ChangeDetectionStrategy, Component, effect, inject } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterOutlet } from '@angular/router';
import { AppUpdate } from './core/sw-update/app-update';
import { PendingWorkGuard } from './core/sw-update/pending-work-guard';
import { RELOAD_PAGE } from './core/sw-update/reload-page';

@Component({
  selector: 'fw-root',
  imports: [RouterOutlet],
  template: '<router-outlet />',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class App {
  private readonly update = inject(AppUpdate);
  private readonly snackBar = inject(MatSnackBar);
  private readonly pendingWork = inject(PendingWorkGuard);
  private readonly reloadPage = inject(RELOAD_PAGE);

  constructor() {
    // Offered on every screen, sign-in included; the reload happens only on the user's word.
    // An effect because it drives the snack bar (a non-signal API), not to load data.
    effect(() => {
      if (!this.update.updateReady()) return;
      this.snackBar
        .open('A new version of Fluxwalk is ready.', 'Reload')
        .onAction()
        .subscribe(() => this.reloadForUpdate());
    });
  }

  private reloadForUpdate(): void {
    if (!this.update.reloadToUpdate()) {
      // Unsent ops live in IndexedDB and survive a reload, but the person decides, knowing the count.
      const n = this.pendingWork.count();
      this.snackBar
        .open(`${n} not yet synced. They stay on this device through the update; syncing first is safer.`, 'Reload anyway', {
          duration: 15000,
        })
        .onAction()
        .subscribe(() => this.reloadPage());
    }
  }
}
