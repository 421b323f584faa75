import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, viewChild } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatPaginator, MatPaginatorModule } from '@angular/material/paginator';
import { MatSelectModule } from '@angular/material/select';
import { MatSort, MatSortModule } from '@angular/material/sort';
import { MatTableDataSource, MatTableModule } from '@angular/material/table';
import { DEFAULT_CALIBRATION_DRIFT_LIMIT_PCT, worstDriftPct } from '../../../../shared/model/calibration';
import type { EntityFields } from '../../../../shared/model/entities';
import { serverMessage } from '../../core/api/api-error';
import { CalibrationForm, type CalibrationEntry } from '../calibration/calibration-form';
import { siteTime } from '../calibration/site-clock';
import { SetupApi, type Rec } from './setup-api';

const KIND_LABEL: Record<string, string> = {
  calibration: 'Calibration',
  leak: 'Leak check',
  ambient: 'Ambient reading',
  clock: 'Clock',
  'warm-up': 'Warm-up',
  'safety-ack': 'Safety note read',
};

export interface CheckRow {
  id: string;
  kind: string;
  at: string;
  when: string;
  who: string;
  outcome: string;
  /** The file the check was read from (a leak check's logger file), when one was kept. */
  file: { id: string; name: string; uploaded: boolean } | null;
}

/** What a check came to, in words: a skipped check says why; a check with no verdict says so; a calibration gives its drift and cylinder. */
export function checkOutcome(c: Rec): string {
  if (c['skipped']) return `Skipped: ${String(c['skipReason'] ?? '').trim() || 'no reason given'}`;
  const verdict = c['passed'] === true ? 'Passed' : c['passed'] === false ? 'Failed' : 'Recorded (no pass/fail)';
  return c['kind'] === 'calibration' ? [verdict, ...calibrationFacts(c)].join(' · ') : verdict;
}

const signed = (x: number) => `${x > 0 ? '+' : ''}${x}`;

function calibrationFacts(rec: Rec): string[] {
  const c = rec as unknown as Partial<EntityFields<'analyzerCheck'>>;
  const out: string[] = [];
  const drifts = (
    [
      ['zero', c.zeroDriftPpm],
      ['span', c.driftPpm],
    ] as const
  )
    .filter(([, v]) => typeof v === 'number')
    .map(([w, v]) => `${w} ${signed(v!)}`);
  const pct = worstDriftPct(c);
  if (drifts.length) out.push(`drift ${drifts.join(', ')} µmol/mol${pct === null ? '' : ` (${pct} %)`}`);
  if (typeof c.spanGasPpm === 'number') out.push(`span gas ${c.spanGasPpm} µmol/mol${c.spanCylinder ? ` (${c.spanCylinder})` : ''}`);
  return out;
}

function fileOf(a: Rec | undefined): CheckRow['file'] {
  return a ? { id: a.id, name: String(a['fileName'] || 'file'), uploaded: Boolean(a['objectKey']) } : null;
}

/** An analyzer's check records (calibration, leak, ambient, clock, warm-up): kind, when, who, the result and the file it was read from. */
@Component({
  selector: 'fw-analyzer-checks',
  imports: [CalibrationForm, MatButtonModule, MatFormFieldModule, MatSelectModule, MatTableModule, MatSortModule, MatPaginatorModule],
  template: `
    <section aria-labelledby="checks-heading">
      <h3 id="checks-heading">Analyzer checks</h3>
      <mat-form-field subscriptSizing="dynamic">
        <mat-label>Checks of analyzer</mat-label>
        <mat-select [value]="analyzerId()" (valueChange)="analyzerId.set($event)">
          @for (a of analyzers(); track a.id) {
            <mat-option [value]="a.id">{{ a['name'] }}{{ a['serial'] ? ' · ' + a['serial'] : '' }}</mat-option>
          }
        </mat-select>
      </mat-form-field>
      <div class="fw-table-box" tabindex="0" role="region" aria-label="Check records of the analyzer, scrolls sideways">
      <table mat-table [dataSource]="data" matSort matSortActive="at" matSortDirection="desc" aria-label="Check records of the analyzer">
        <ng-container matColumnDef="kind">
          <th mat-header-cell *matHeaderCellDef mat-sort-header>Check</th>
          <td mat-cell *matCellDef="let c">{{ c.kind }}</td>
        </ng-container>
        <ng-container matColumnDef="at">
          <th mat-header-cell *matHeaderCellDef mat-sort-header>Time ({{ timeZone() }})</th>
          <td mat-cell *matCellDef="let c">{{ c.when }}</td>
        </ng-container>
        <ng-container matColumnDef="who">
          <th mat-header-cell *matHeaderCellDef mat-sort-header>By</th>
          <td mat-cell *matCellDef="let c">{{ c.who }}</td>
        </ng-container>
        <ng-container matColumnDef="outcome">
          <th mat-header-cell *matHeaderCellDef mat-sort-header>Result</th>
          <td mat-cell *matCellDef="let c">{{ c.outcome }}</td>
        </ng-container>
        <ng-container matColumnDef="file">
          <th mat-header-cell *matHeaderCellDef>File</th>
          <td mat-cell *matCellDef="let c">
            @if (c.file; as f) {
              @if (f.uploaded) { <a [href]="'/api/attachments/' + f.id + '/content'" [attr.download]="f.name">{{ f.name }}</a> }
              @else { {{ f.name }} (still on the phone) }
            }
          </td>
        </ng-container>
        <tr mat-header-row *matHeaderRowDef="columns"></tr>
        <tr mat-row *matRowDef="let row; columns: columns"></tr>
        <tr class="mat-mdc-row" *matNoDataRow>
          <td class="mat-mdc-cell empty" [attr.colspan]="columns.length">{{ analyzerId() ? 'No checks recorded for this analyzer.' : 'Choose an analyzer.' }}</td>
        </tr>
      </table>
      </div>
      <mat-paginator [pageSize]="25" [pageSizeOptions]="[25, 100]" aria-label="Pages of analyzer checks" />
      @if (analyzerId()) {
        @if (calibrating()) {
          <h4>New calibration of {{ analyzerName() }}</h4>
          <fw-calibration-form [driftLimitPct]="driftLimitPct()" [timeZone]="timeZone()" [busy]="saving()" (save)="saveCalibration($event)" />
          <button mat-button type="button" (click)="calibrating.set(false)">Cancel</button>
        } @else {
          <button mat-stroked-button type="button" (click)="calibrating.set(true)">Record a calibration…</button>
        }
      }
      <p role="status" data-testid="checks-message">{{ message() }}</p>
    </section>
  `,
  styles: `table { width: 100%; } .empty { padding: 1rem; }`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AnalyzerChecks {
  private readonly api = inject(SetupApi);
  readonly siteId = input.required<string>();
  readonly analyzers = input<Rec[]>([]);
  readonly timeZone = input('UTC');
  /** The site's calibration drift limit, % of the span gas. */
  readonly driftLimitPct = input(DEFAULT_CALIBRATION_DRIFT_LIMIT_PCT);

  protected readonly columns = ['kind', 'at', 'who', 'outcome', 'file'];
  protected readonly analyzerId = signal<string | null>(null);
  protected readonly checks = signal<Rec[]>([]);
  /** Files kept with checks, by the check they belong to. */
  private readonly files = signal<Map<string, Rec>>(new Map());
  protected readonly message = signal('');
  protected readonly calibrating = signal(false);
  protected readonly saving = signal(false);
  protected readonly analyzerName = computed(() => String(this.analyzers().find((a) => a.id === this.analyzerId())?.['name'] ?? ''));
  private readonly names = signal<Map<string, string>>(new Map());
  protected readonly data = new MatTableDataSource<CheckRow>([]);
  private readonly sort = viewChild(MatSort);
  private readonly paginator = viewChild(MatPaginator);
  private readonly rows = computed<CheckRow[]>(() =>
    this.checks().map((c) => ({
      id: c.id,
      kind: KIND_LABEL[String(c['kind'])] ?? String(c['kind']),
      at: String(c['at']),
      when: siteTime(String(c['at']), this.timeZone()),
      who: this.names().get(String(c['updatedBy'])) ?? (c['updatedBy'] ? 'a former user' : 'unknown'),
      outcome: checkOutcome(c),
      file: fileOf(this.files().get(c.id)),
    })),
  );

  constructor() {
    void this.loadNames();
    // The first analyzer is shown until another is chosen.
    effect(() => {
      const list = this.analyzers();
      if (!list.some((a) => a.id === this.analyzerId())) this.analyzerId.set(list[0]?.id ?? null);
    });
    effect(() => {
      const id = this.analyzerId();
      void this.load(this.siteId(), id);
    });
    effect(() => {
      this.data.data = this.rows();
      this.data.sort = this.sort() ?? null;
      this.data.paginator = this.paginator() ?? null;
    });
    // ISO-8601 UTC strings sort as times.
    this.data.sortingDataAccessor = (r, key) => (key === 'at' ? r.at : String(r[key as keyof CheckRow]).toLowerCase());
  }

  /** Names of who recorded each check; admins may list users, anyone else sees the check without a name. */
  private async loadNames(): Promise<void> {
    try {
      this.names.set(new Map((await this.api.users()).map((u) => [u.id, u.displayName])));
    } catch {
      this.names.set(new Map());
    }
  }

  /** Sends a calibration of the chosen analyzer to the server; the list shows it once stored. */
  protected async saveCalibration(entry: CalibrationEntry): Promise<void> {
    const analyzerId = this.analyzerId();
    if (!analyzerId || this.saving()) return;
    this.saving.set(true);
    try {
      await this.api.create('analyzer-checks', { siteId: this.siteId(), analyzerId, kind: 'calibration', ...entry });
      this.calibrating.set(false);
      this.message.set(`Calibration of ${this.analyzerName()} saved.`);
      await this.load(this.siteId(), analyzerId, false);
    } catch (err) {
      this.message.set(serverMessage(err, 'The calibration was not saved'));
    } finally {
      this.saving.set(false);
    }
  }

  private async load(siteId: string, analyzerId: string | null, clearMessage = true): Promise<void> {
    if (!analyzerId) return this.checks.set([]);
    try {
      const [checks, files] = await Promise.all([
        this.api.list('analyzer-checks', { siteId, analyzerId }),
        this.api.list('attachments', { siteId, ownerEntity: 'analyzerCheck' }),
      ]);
      if (this.analyzerId() !== analyzerId) return; // another analyzer was chosen meanwhile
      this.files.set(new Map(files.map((f) => [String(f['ownerId']), f])));
      this.checks.set(checks);
      if (clearMessage) this.message.set('');
    } catch (err) {
      this.checks.set([]);
      this.message.set(serverMessage(err, 'Could not load the checks'));
    }
  }
}
