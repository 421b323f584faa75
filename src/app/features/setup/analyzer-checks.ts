import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  input,
  linkedSignal,
  resource,
  signal,
  viewChild,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatPaginator, MatPaginatorModule } from '@angular/material/paginator';
import { MatSelectModule } from '@angular/material/select';
import { MatSort, MatSortModule } from '@angular/material/sort';
import { MatTableDataSource, MatTableModule } from '@angular/material/table';
import { DEFAULT_CALIBRATION_DRIFT_LIMIT_PCT, worstDriftPct } from '../../../../shared/model/calibration';
import type { StoredRecord } from '../../../../shared/model/stored-record';
import { serverMessage } from '../../core/api/api-error';
import { CalibrationForm, type CalibrationEntry } from '../calibration/calibration-form';
import { siteTime } from '../calibration/site-clock';
import { loadedOr, loadProblem } from '../../core/api/resource-value';
import { SetupApi } from './setup-api';

type Check = StoredRecord<'analyzerCheck'>;

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
  file: CheckFile | null;
}

export interface CheckFile {
  id: string;
  name: string;
  /** False while the file's bytes are still only on the phone that recorded the check. */
  uploaded: boolean;
}

/** What a check came to, in words: a skipped check says why; a check with no verdict says so; a calibration gives its drift and cylinder. */
export function checkOutcome(c: Check): string {
  if (c.skipped) return `Skipped: ${(c.skipReason ?? '').trim() || 'no reason given'}`;
  const verdict = c.passed === true ? 'Passed' : c.passed === false ? 'Failed' : 'Recorded (no pass/fail)';
  return c.kind === 'calibration' ? [verdict, ...calibrationFacts(c)].join(' · ') : verdict;
}

const signed = (x: number) => `${x > 0 ? '+' : ''}${x}`;

function calibrationFacts(c: Check): string[] {
  const out: string[] = [];
  const drifts = (
    [
      ['zero', c.zeroDriftPpm],
      ['span', c.driftPpm],
    ] as const
  ).flatMap(([w, v]) => (typeof v === 'number' ? [`${w} ${signed(v)}`] : []));
  const pct = worstDriftPct(c);
  if (drifts.length) out.push(`drift ${drifts.join(', ')} µmol/mol${pct === null ? '' : ` (${pct} %)`}`);
  if (typeof c.spanGasPpm === 'number') out.push(`span gas ${c.spanGasPpm} µmol/mol${c.spanCylinder ? ` (${c.spanCylinder})` : ''}`);
  return out;
}

function fileOf(a: StoredRecord<'attachment'> | undefined): CheckFile | null {
  return a ? { id: a.id, name: a.fileName || 'file', uploaded: Boolean(a.objectKey) } : null;
}

/** What a column sorts by: ISO-8601 UTC strings sort as times, words without case. */
function sortKey(r: CheckRow, column: string): string {
  if (column === 'at') return r.at;
  const words = column === 'kind' ? r.kind : column === 'who' ? r.who : column === 'outcome' ? r.outcome : (r.file?.name ?? '');
  return words.toLowerCase();
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
            <mat-option [value]="a.id">{{ a.name }}{{ a.serial ? ' · ' + a.serial : '' }}</mat-option>
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
  readonly analyzers = input<StoredRecord<'analyzer'>[]>([]);
  readonly timeZone = input('UTC');
  /** The site's calibration drift limit, % of the span gas. */
  readonly driftLimitPct = input(DEFAULT_CALIBRATION_DRIFT_LIMIT_PCT);

  protected readonly columns = ['kind', 'at', 'who', 'outcome', 'file'];
  /** The first analyzer is shown until another is chosen (or the chosen one leaves the list). */
  protected readonly analyzerId = linkedSignal<StoredRecord<'analyzer'>[], string | null>({
    source: this.analyzers,
    computation: (list, previous) => (list.some((a) => a.id === previous?.value) ? previous!.value : (list[0]?.id ?? null)),
  });
  /** The chosen analyzer's checks and the files kept with them (by the check they belong to). */
  private readonly records = resource({
    params: () => {
      const analyzerId = this.analyzerId();
      return analyzerId ? { siteId: this.siteId(), analyzerId } : undefined;
    },
    loader: async ({ params: { siteId, analyzerId } }) => {
      const [checks, files] = await Promise.all([
        this.api.list('analyzerCheck', { siteId, analyzerId }),
        this.api.list('attachment', { siteId, ownerEntity: 'analyzerCheck' }),
      ]);
      return { checks, files: new Map(files.map((f) => [f.ownerId, f])) };
    },
  });
  private readonly loaded = loadedOr(this.records, { checks: [], files: new Map() });
  /** What the last save said; choosing another analyzer clears it. */
  private readonly saveMessage = linkedSignal({ source: this.analyzerId, computation: () => '' });
  private readonly loadMessage = loadProblem(this.records, 'Could not load the checks');
  protected readonly message = computed(() => this.loadMessage() || this.saveMessage());
  protected readonly calibrating = signal(false);
  protected readonly saving = signal(false);
  protected readonly analyzerName = computed(() => this.analyzers().find((a) => a.id === this.analyzerId())?.name ?? '');
  /** Names of who recorded each check; admins may list users, anyone else sees the check without a name. */
  private readonly users = resource({
    loader: async () => new Map((await this.api.users()).map((u) => [u.id, u.displayName])),
  });
  private readonly names = loadedOr(this.users, new Map<string, string>());
  protected readonly data = new MatTableDataSource<CheckRow>([]);
  private readonly sort = viewChild(MatSort);
  private readonly paginator = viewChild(MatPaginator);
  private readonly rows = computed<CheckRow[]>(() => {
    const { checks, files } = this.loaded();
    return checks.map((c) => ({
      id: c.id,
      kind: KIND_LABEL[c.kind] ?? c.kind,
      at: c.at,
      when: siteTime(c.at, this.timeZone()),
      who: (c.updatedBy && this.names().get(c.updatedBy)) || (c.updatedBy ? 'a former user' : 'unknown'),
      outcome: checkOutcome(c),
      file: fileOf(files.get(c.id)),
    }));
  });

  constructor() {
    // Hands the rows, sort and pages to Material's table source (not a signal API).
    effect(() => {
      this.data.data = this.rows();
      this.data.sort = this.sort() ?? null;
      this.data.paginator = this.paginator() ?? null;
    });
    this.data.sortingDataAccessor = sortKey;
  }

  /** Sends a calibration of the chosen analyzer to the server; the list shows it once stored. */
  protected async saveCalibration(entry: CalibrationEntry): Promise<void> {
    const analyzerId = this.analyzerId();
    if (!analyzerId || this.saving()) return;
    this.saving.set(true);
    try {
      await this.api.create('analyzerCheck', { siteId: this.siteId(), analyzerId, kind: 'calibration', ...entry });
      this.calibrating.set(false);
      this.saveMessage.set(`Calibration of ${this.analyzerName()} saved.`);
      this.records.reload();
    } catch (err) {
      this.saveMessage.set(serverMessage(err, 'The calibration was not saved'));
    } finally {
      this.saving.set(false);
    }
  }
}
