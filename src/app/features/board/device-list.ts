import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { serverMessage } from '../../core/api/api-error';
import { BackupFileError, parseBackup, summarizeBackup, type BackupFile, type BackupSummaryRow } from '../../core/db/backup-file';
import { entityName } from '../../core/sync/op-labels';
import { SiteTimePipe } from '../../core/time/site-time-pipe';
import { BoardApi, type DeviceRow } from './board-api';
import { BoardCache } from './board-cache';
import { BoardStore } from './board-store';

/**
 * Each member's devices with last push, last pull and the outbox size they last reported; a
 * device silent for more than a day is marked. A crew's backup file opens read-only here (the
 * same reader as the Backup screen) to see their unsent progress when nobody has signal.
 */
@Component({
  selector: 'fw-device-list',
  imports: [MatButtonModule, SiteTimePipe],
  template: `
    <section aria-labelledby="devices-heading">
      <h2 id="devices-heading">Devices</h2>
      <p role="alert" class="problem">{{ problem() }}</p>
      <div class="fw-table-box" tabindex="0" role="region" aria-label="Devices, scrolls sideways">
      <table>
        <caption>Devices of this site's members, least recently heard from first</caption>
        <thead><tr><th scope="col">Person</th><th scope="col">Device</th><th scope="col">Last push</th><th scope="col">Last pull</th>
          <th scope="col">Not yet synced (last reported)</th><th scope="col">Status</th></tr></thead>
        <tbody>
          @for (d of devices(); track d.id) {
            <tr [class.silent]="d.silent" data-testid="device-row">
              <td>{{ d.displayName }} <span class="email">{{ d.email }}</span></td>
              <td class="mono">{{ d.id.slice(0, 8) }}</td>
              <td>{{ d.lastPushAt ? (d.lastPushAt | siteTime: zone()) : 'never' }}</td>
              <td>{{ d.lastPullAt ? (d.lastPullAt | siteTime: zone()) : 'never' }}</td>
              <td>{{ d.outboxSize ?? 'unknown' }}</td>
              <td>{{ d.silent ? '⚠ silent for more than a day' : 'heard from today' }}</td>
            </tr>
          } @empty { <tr><td colspan="6">No device has synced for this site yet.</td></tr> }
        </tbody>
      </table>
      </div>

      <h3>Open a crew's backup file</h3>
      <p>Read-only: the changes reach the server when their owner syncs or loads the file on their own device.</p>
      <!-- The file input stays hidden; a Material button opens the browser's file picker for it. -->
      <input #backupInput type="file" class="fw-visually-hidden" tabindex="-1" aria-hidden="true" accept="application/json,.json" (change)="open($event)" data-testid="board-backup-input" />
      <button type="button" matButton="outlined" (click)="backupInput.click()">Choose a backup file…</button>
      <p role="alert" class="problem">{{ fileProblem() }}</p>
      @if (file(); as f) {
        <h4>{{ f.user.displayName }} ({{ f.user.email }}) · saved {{ f.createdAt | siteTime: zone() }} · {{ rows().length }} change(s) not yet synced</h4>
        <ul class="changes" tabindex="0" aria-label="Changes in the backup file">
          @for (r of rows(); track $index) {
            <li>{{ label(r) }} {{ r.id.slice(0, 8) }} · {{ r.op === 'delete' ? 'deleted' : r.created ? 'created' : 'changed' }} · {{ r.at | siteTime: zone() }}</li>
          }
        </ul>
      }
    </section>
  `,
  styles: `
    table { border-collapse: collapse; width: 100%; }
    caption { text-align: left; font-weight: 600; padding-block: .25rem; }
    th, td { text-align: left; padding: 4px 8px; border-bottom: 1px solid var(--mat-sys-outline-variant); }
    tr.silent td { font-weight: 600; background: #fff4d6; color: #3d2c00; }
    .email { color: var(--mat-sys-on-surface-variant); font-size: .85rem; }
    tr.silent .email { color: #3d2c00; }
    .mono { font-family: ui-monospace, monospace; }
    .file { display: inline-flex; flex-direction: column; gap: 4px; font-weight: 600; }
    .changes { max-height: 16rem; overflow: auto; }
    .problem { color: var(--mat-sys-error); font-weight: 600; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DeviceList {
  private readonly store = inject(BoardStore);
  private readonly api = inject(BoardApi);
  private readonly cache = inject(BoardCache);
  protected readonly zone = this.store.zone;
  protected readonly devices = signal<DeviceRow[]>([]);
  protected readonly problem = signal('');
  protected readonly file = signal<BackupFile | null>(null);
  protected readonly rows = signal<BackupSummaryRow[]>([]);
  protected readonly fileProblem = signal('');

  constructor() {
    void this.load();
  }

  private async load(): Promise<void> {
    const site = this.store.site();
    if (!site) return;
    try {
      this.devices.set((await this.cache.load(`devices.${site.id}`, () => this.api.devices(site.id))).value);
    } catch (err) {
      this.problem.set(serverMessage(err, 'Devices could not be loaded'));
    }
  }

  protected label(r: BackupSummaryRow): string {
    return entityName(r.entity as Parameters<typeof entityName>[0]);
  }

  protected async open(event: Event): Promise<void> {
    this.fileProblem.set('');
    this.file.set(null);
    const f = (event.target as HTMLInputElement).files?.[0];
    if (!f) return;
    try {
      const file = parseBackup(await f.text());
      this.file.set(file);
      this.rows.set(summarizeBackup(file));
    } catch (err) {
      this.fileProblem.set(err instanceof BackupFileError ? err.message : 'The file could not be read');
    }
  }
}
