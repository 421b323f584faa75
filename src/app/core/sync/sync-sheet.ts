import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { SiteTimePipe } from '../time/site-time-pipe';
import { SiteChoice } from '../auth/site-choice';
import { MatBottomSheetRef } from '@angular/material/bottom-sheet';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { liveSignal } from '../db/live-query-signal';
import { BackupDownload } from './backup-download';
import { fieldLabel, labelsFor } from './op-labels';
import { StorageStatus, formatBytes } from './storage-status';
import { SyncEngine } from './sync-engine';

interface FileRow {
  key: string;
  name: string;
  size: number;
  uploadedAt: string | null;
  attempts: number;
  error: string | null;
}

/** An op the server refused, with what it would have changed. */
interface RejectedRow {
  key: string;
  label: string;
  message: string;
  what: string;
}

interface PendingRow {
  key: string;
  label: string;
  what: string;
  at: string;
  sent: boolean;
}

/** What is not yet synced (changes and files), files uploaded, what the server refused, storage, and the backup file. */
@Component({
  selector: 'fw-sync-sheet',
  imports: [SiteTimePipe, MatButtonModule, MatIconModule, RouterLink],
  template: `
    <section aria-labelledby="sync-sheet-title" data-testid="sync-sheet">
      <h2 id="sync-sheet-title">{{ engine.view().label }}</h2>
      <p class="muted">
        Last successful sync:
        @if (engine.lastSuccess(); as t) { {{ t | siteTime: zone() }} } @else { not yet on this device }
      </p>
      @if (engine.lastError(); as e) { <p class="error" role="alert">{{ e }}</p> }

      <div class="actions">
        <button mat-flat-button type="button" (click)="syncNow()">
          <mat-icon aria-hidden="true">sync</mat-icon> Sync now
        </button>
        <button mat-stroked-button type="button" (click)="saveBackup()">
          <mat-icon aria-hidden="true">download</mat-icon> Save a backup file
        </button>
        <a mat-button routerLink="/backup" (click)="close()">Load or open a backup file</a>
      </div>
      @if (saved()) { <p class="muted" role="status">Saved {{ saved() }}</p> }

      @if (engine.conflicts() > 0) {
        <p><a mat-stroked-button routerLink="/conflicts" (click)="close()" data-testid="open-conflicts">
          <mat-icon aria-hidden="true">call_split</mat-icon> Resolve {{ engine.conflicts() }} conflict{{ engine.conflicts() === 1 ? '' : 's' }}
        </a></p>
      }

      <h3>Not yet synced ({{ pending().length + waitingFiles().length }})</h3>
      @if (pending().length || waitingFiles().length) {
        <ul class="rows" data-testid="unsynced-list">
          @for (p of pending(); track p.key) {
            <li><strong>{{ p.label }}</strong> · {{ p.what }} · {{ p.at | siteTime: zone() }}@if (p.sent) { · sent, waiting for the answer }</li>
          }
          @for (f of waitingFiles(); track f.key) {
            <li data-testid="file-waiting"><strong>File {{ f.name }}</strong> · {{ bytes(f.size) }} · waiting for upload
              @if (f.attempts) { · {{ f.attempts }} failed attempt{{ f.attempts === 1 ? '' : 's' }}, retried with the next sync@if (f.error) { ({{ f.error }}) } }</li>
          }
        </ul>
      } @else {
        <p class="muted">Everything on this device has reached the server.</p>
      }

      @if (uploadedFiles().length) {
        <h3>Files uploaded ({{ uploadedFiles().length }})</h3>
        <p class="muted">Safe on the server; a copy also stays on this device.</p>
        <ul class="rows" data-testid="uploaded-list">
          @for (f of uploadedFiles(); track f.key) {
            <li><strong>{{ f.name }}</strong> · {{ bytes(f.size) }} · uploaded {{ f.uploadedAt | siteTime: zone() }}</li>
          }
        </ul>
      }

      @if (rejected().length) {
        <h3>Refused by the server ({{ rejected().length }})</h3>
        <p class="muted">Kept here and in the backup file; ask your lead if the reason is unclear.</p>
        <ul class="rows" data-testid="rejected-list">
          @for (r of rejected(); track r.key) {
            <li><strong>{{ r.label }}</strong> · {{ r.what }} — {{ r.message }}</li>
          }
        </ul>
      }

      <h3>Storage on this device</h3>
      <p class="muted" data-testid="storage-status">
        @switch (storage.persisted()) {
          @case (true) { Kept by the browser (persistent storage granted). }
          @case (false) { Not guaranteed: the browser may clear it after long disuse — sync often and keep backup files. }
          @default { Persistence not known yet. }
        }
        @if (storage.usage(); as u) { Using {{ bytes(u.usage) }} of {{ bytes(u.quota) }}. }
      </p>
    </section>
  `,
  styles: `
    section { padding: 8px 4px 16px; max-height: 80vh; overflow: auto; }
    h2 { font: var(--mat-sys-title-large); margin: 0 0 4px; }
    h3 { font: var(--mat-sys-title-small); margin: 16px 0 4px; }
    .muted { color: var(--mat-sys-on-surface-variant); margin: 4px 0; }
    .error { color: var(--mat-sys-error); font-weight: 600; }
    .actions { display: flex; flex-wrap: wrap; gap: 8px; margin: 8px 0; }
    .rows { margin: 0; padding-left: 20px; li { margin: 4px 0; overflow-wrap: anywhere; } }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SyncSheet {
  private readonly siteChoiceForTimes = inject(SiteChoice);
  /** Times shown here are the chosen site's wall time, zone named. */
  protected readonly zone = computed(() => this.siteChoiceForTimes.current()?.timezone ?? 'UTC');
  protected readonly engine = inject(SyncEngine);
  protected readonly storage = inject(StorageStatus);
  private readonly backup = inject(BackupDownload);
  private readonly ref = inject(MatBottomSheetRef<SyncSheet>);
  protected readonly saved = signal('');

  protected readonly pending = liveSignal(
    () => null,
    async (db) => {
      const ops = await db.outbox.orderBy('seq').limit(200).toArray();
      const labels = await labelsFor(db, ops);
      return ops.map((o): PendingRow => ({
        key: o.opId,
        label: labels.get(`${o.entity}:${o.id}`) ?? o.entity,
        what:
          o.op === 'delete' ? 'deleted' : o.baseRev === null ? 'created' : `changed ${Object.keys(o.fields).map(fieldLabel).join(', ')}`,
        at: o.updatedAt,
        sent: o.sentAt !== null,
      }));
    },
    [] as PendingRow[],
  );

  /** Files kept on this device: bytes waiting for upload, and those already uploaded (kept as a copy). */
  private readonly files = liveSignal(
    () => null,
    async (db) => {
      const rows = (await db.blobs.toArray()).sort((a, b) => b.createdAt.localeCompare(a.createdAt)).slice(0, 200);
      const records = await db.records('attachment').bulkGet(rows.map((r) => r.attachmentId));
      return rows.map((r, i): FileRow => ({
        key: r.attachmentId,
        name: records[i]?.fileName || r.attachmentId,
        size: r.blob.size,
        uploadedAt: r.uploadedAt,
        attempts: r.attempts ?? 0,
        error: r.lastError ?? null,
      }));
    },
    [] as FileRow[],
  );
  protected readonly waitingFiles = computed(() => this.files().filter((f) => f.uploadedAt === null));
  protected readonly uploadedFiles = computed(() => this.files().filter((f) => f.uploadedAt !== null));

  protected readonly rejected = liveSignal(
    () => null,
    async (db) => {
      const rows = await db.rejected.orderBy('opId').toArray();
      const labels = await labelsFor(db, rows);
      return rows.map((r) => ({
        key: r.opId,
        label: labels.get(`${r.entity}:${r.id}`) ?? r.entity,
        message: r.message,
        what: r.op === 'delete' ? 'delete' : Object.keys(r.fields).map(fieldLabel).join(', '),
      }));
    },
    [] as RejectedRow[],
  );

  constructor() {
    void this.storage.refreshUsage();
  }

  protected bytes(n: number): string {
    return formatBytes(n);
  }

  protected syncNow(): void {
    this.engine.requestSync('demand');
  }

  protected async saveBackup(): Promise<void> {
    this.saved.set(await this.backup.save());
  }

  protected close(): void {
    this.ref.dismiss();
  }
}
