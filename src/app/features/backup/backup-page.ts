import { ChangeDetectionStrategy, Component, inject, signal, computed } from '@angular/core';
import { SiteTimePipe } from '../../core/time/site-time-pipe';
import { SiteChoice } from '../../core/auth/site-choice';
import { MatButtonModule } from '@angular/material/button';
import { AuthStore } from '../../core/auth/auth-store';
import {
  BackupFileError,
  importBackup,
  parseBackup,
  summarizeBackup,
  type BackupFile,
  type BackupSummaryRow,
} from '../../core/db/backup-file';
import { DeviceDb } from '../../core/db/device-db';
import { BackupDownload } from '../../core/sync/backup-download';
import { fieldLabel } from '../../core/sync/op-labels';
import { SyncEngine } from '../../core/sync/sync-engine';

/**
 * Backup files: save what is not yet synced; load your own file on any device (ops the device
 * already has or the server acknowledged are skipped); open anyone's file read-only (a lead
 * checking a crew's progress when nobody has signal).
 */
@Component({
  selector: 'fw-backup-page',
  imports: [SiteTimePipe, MatButtonModule],
  template: `
    <h1>Backup files</h1>
    <p>A backup file holds every change on this device that the server does not have yet, and changes it refused.
      Keep it, or send it to your lead, when you cannot sync for a long time.</p>
    <p><button mat-flat-button type="button" (click)="save()">Save a backup file</button></p>
    @if (saved()) { <p role="status">Saved {{ saved() }}.</p> }

    <h2>Load or open a file</h2>
    <label class="file">Backup file <input type="file" accept="application/json,.json" (change)="chosen($event)" data-testid="backup-input" /></label>
    <p role="alert" class="problem">{{ problem() }}</p>
    <p role="status">{{ result() }}</p>

    @if (file(); as f) {
      <section aria-labelledby="read-title">
        <h3 id="read-title">{{ f.user.displayName }} ({{ f.user.email }}) · saved {{ f.createdAt | siteTime: zone() }}</h3>
        @if (f.user.id === me()) {
          <button mat-stroked-button type="button" (click)="load(f)">Queue these {{ rows().length }} changes on this device</button>
        } @else {
          <p>Read-only: this is someone else's work. It reaches the server when they sync or load it on their own device.</p>
        }
        <ul>
          @for (r of rows(); track $index) {
            <li>{{ r.entity }} {{ r.id.slice(0, 8) }} · {{ r.op === 'delete' ? 'deleted' : r.created ? 'created' : 'changed ' + fields(r) }} · {{ r.at | siteTime: zone() }}</li>
          }
        </ul>
        @if (f.rejected.length) { <p>{{ f.rejected.length }} change(s) in the file were refused by the server.</p> }
      </section>
    }
  `,
  styles: `
    h1 { font: var(--mat-sys-headline-small); }
    .file { display: inline-flex; flex-direction: column; gap: 4px; font-weight: 600; }
    .problem { color: var(--mat-sys-error); font-weight: 600; }
    li { overflow-wrap: anywhere; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BackupPage {
  private readonly siteChoiceForTimes = inject(SiteChoice);
  /** Times shown here are the chosen site's wall time, zone named. */
  protected readonly zone = computed(() => this.siteChoiceForTimes.current()?.timezone ?? 'UTC');
  private readonly auth = inject(AuthStore);
  private readonly deviceDb = inject(DeviceDb);
  private readonly engine = inject(SyncEngine);
  private readonly download = inject(BackupDownload);
  protected readonly me = () => this.auth.user()?.id ?? null;
  protected readonly file = signal<BackupFile | null>(null);
  protected readonly rows = signal<BackupSummaryRow[]>([]);
  protected readonly saved = signal('');
  protected readonly problem = signal('');
  protected readonly result = signal('');

  protected fields(r: BackupSummaryRow): string {
    return r.fields.map(fieldLabel).join(', ');
  }

  protected async save(): Promise<void> {
    this.saved.set(await this.download.save());
  }

  protected async chosen(event: Event): Promise<void> {
    this.problem.set('');
    this.result.set('');
    const f = (event.target as HTMLInputElement).files?.[0];
    if (!f) return;
    try {
      const parsed = parseBackup(await f.text());
      this.file.set(parsed);
      this.rows.set(summarizeBackup(parsed));
    } catch (err) {
      this.file.set(null);
      this.problem.set(err instanceof BackupFileError ? err.message : 'The file could not be read');
    }
  }

  protected async load(f: BackupFile): Promise<void> {
    try {
      const t = await this.deviceDb.run((db) => importBackup(db, f, this.me() ?? ''));
      this.result.set(`${t.queued} change(s) queued, ${t.skipped} already on this device or on the server.`);
      if (t.queued) this.engine.requestSync('backup');
    } catch (err) {
      this.problem.set(err instanceof Error ? err.message : 'The file could not be loaded');
    }
  }
}
