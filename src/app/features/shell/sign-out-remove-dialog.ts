import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule } from '@angular/material/dialog';
import { DeviceRemoval, type Unsaved } from '../../core/device/device-removal';
import { BackupDownload } from '../../core/sync/backup-download';
import { SyncEngine } from '../../core/sync/sync-engine';

/**
 * The warning before "Sign out and remove this device's data" when something exists only here:
 * sync first or save a backup file first, cancel, or remove anyway. Closes with true to remove.
 */
@Component({
  selector: 'fw-sign-out-remove-dialog',
  imports: [MatButtonModule, MatDialogModule],
  template: `
    <h2 mat-dialog-title>Remove your data from this device?</h2>
    <mat-dialog-content>
      @if (atRisk()) {
        @if (left().pending) { <p class="loss">{{ left().pending }} not yet synced will be lost.</p> }
        @if (left().refused || left().conflicts) {
          <p class="loss">{{ left().refused }} change(s) the server refused and {{ left().conflicts }} open conflict(s) exist only on this device.</p>
        }
        <p>Sync first to send them, or save a backup file to keep them.</p>
      } @else {
        <p>Everything is synced: your work is on the server.</p>
      }
      <p role="status">{{ note() }}</p>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button mat-button type="button" [mat-dialog-close]="false" cdkFocusInitial>Cancel</button>
      @if (atRisk()) {
        <button mat-stroked-button type="button" [disabled]="busy()" (click)="syncFirst()">Sync first</button>
        <button mat-stroked-button type="button" [disabled]="busy()" (click)="saveBackup()">Save a backup file</button>
        <button mat-flat-button type="button" class="danger" [disabled]="busy()" [mat-dialog-close]="true">Remove anyway</button>
      } @else {
        <button mat-flat-button type="button" [mat-dialog-close]="true">Sign out and remove</button>
      }
    </mat-dialog-actions>
  `,
  styles: `
    .loss { font-weight: 600; color: var(--mat-sys-error); }
    .danger { background: var(--mat-sys-error); color: var(--mat-sys-on-error); }
    mat-dialog-actions { flex-wrap: wrap; gap: 4px; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SignOutRemoveDialog {
  private readonly removal = inject(DeviceRemoval);
  private readonly engine = inject(SyncEngine);
  private readonly backup = inject(BackupDownload);
  protected readonly left = signal<Unsaved>(inject<Unsaved>(MAT_DIALOG_DATA));
  protected readonly atRisk = computed(() => this.left().pending + this.left().refused + this.left().conflicts > 0);
  protected readonly busy = signal(false);
  protected readonly note = signal('');

  protected async syncFirst(): Promise<void> {
    await this.work('Syncing…', async () => {
      await this.engine.syncNow();
      this.left.set(await this.removal.unsaved());
      return this.atRisk() ? 'Some work could not be synced (no signal, or the server refused it).' : 'Synced.';
    });
  }

  protected async saveBackup(): Promise<void> {
    await this.work('Saving…', async () => `Saved ${await this.backup.save()}.`);
  }

  private async work(doing: string, task: () => Promise<string>): Promise<void> {
    this.busy.set(true);
    this.note.set(doing);
    try {
      this.note.set(await task());
    } catch (err) {
      this.note.set(err instanceof Error ? err.message : 'That did not work');
    } finally {
      this.busy.set(false);
    }
  }
}
