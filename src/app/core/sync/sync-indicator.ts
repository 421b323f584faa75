import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatBottomSheet } from '@angular/material/bottom-sheet';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { SyncEngine } from './sync-engine';
import { SyncSheet } from './sync-sheet';

/** The toolbar's sync state; a tap opens the sheet of what is not yet synced. */
@Component({
  selector: 'fw-sync-indicator',
  imports: [MatIconModule, MatProgressBarModule],
  template: `
    <button type="button" class="chip" [class]="'chip ' + view().kind" data-testid="sync-indicator"
            [attr.data-synced-at]="engine.lastSuccess()"
            [attr.aria-label]="'Sync: ' + view().label + '. Show details'" (click)="open()">
      <mat-icon aria-hidden="true">{{ view().icon }}</mat-icon>
      <span role="status" data-testid="sync-label">{{ view().label }}</span>
      @if (engine.conflicts() > 0) {
        <span class="badge" data-testid="sync-conflicts">{{ engine.conflicts() }} conflict{{ engine.conflicts() === 1 ? '' : 's' }}</span>
      }
    </button>
    @if (view().progress !== undefined) {
      <mat-progress-bar class="bar" [mode]="view().progress === null ? 'indeterminate' : 'determinate'"
                        [value]="view().progress ?? 0" aria-label="Sync progress" />
    }
  `,
  styles: `
    :host { position: relative; display: inline-flex; flex-direction: column; }
    .chip {
      display: inline-flex; align-items: center; gap: 6px; min-height: 48px; padding: 2px 12px;
      border: 0; border-radius: 999px; cursor: pointer;
      background: var(--mat-sys-surface-container-high); color: var(--mat-sys-on-surface);
      font: var(--mat-sys-label-large); font-weight: 600;
    }
    .chip.unsynced, .chip.offline, .chip.signIn { background: var(--mat-sys-tertiary-container); color: var(--mat-sys-on-tertiary-container); }
    .chip.error { background: var(--mat-sys-error-container); color: var(--mat-sys-on-error-container); }
    mat-icon { font-size: 20px; width: 20px; height: 20px; }
    .badge { padding: 0 8px; border-radius: 999px; background: var(--mat-sys-error); color: var(--mat-sys-on-error); }
    .bar { position: absolute; left: 8px; right: 8px; bottom: -4px; width: auto; }
    @media (max-width: 480px) { .chip span[role='status'] { max-width: 40vw; overflow: hidden; text-overflow: ellipsis; white-space: nowrap; } }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SyncIndicator {
  protected readonly engine = inject(SyncEngine);
  protected readonly view = this.engine.view;
  private readonly sheet = inject(MatBottomSheet);

  protected open(): void {
    this.sheet.open(SyncSheet, { ariaLabel: 'Sync details' });
  }
}
