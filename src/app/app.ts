import { ChangeDetectionStrategy, Component, effect, inject } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';
import { RouterOutlet } from '@angular/router';
import { AppUpdate } from './core/sw-update/app-update';

@Component({
  selector: 'fw-root',
  imports: [RouterOutlet],
  template: '<router-outlet />',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class App {
  private readonly update = inject(AppUpdate);
  private readonly snackBar = inject(MatSnackBar);

  constructor() {
    // Offered on every screen, sign-in included; the reload happens only on the user's word.
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
      this.snackBar.open('Work on this device is still being saved. Reload again in a moment.', 'OK');
    }
  }
}
