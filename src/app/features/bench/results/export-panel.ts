import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, OnDestroy, inject, input, signal } from '@angular/core';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { DATA_LICENCES } from '../../../../../shared/results/data-licences';
import { serverMessage } from '../../../core/api/api-error';
import { formValue } from '../../../core/forms/form-value';
import { ResultsApi, type ClosureSelection, type ExportJob } from './results-api';

const POLL_MS = 1000;

/** Starts the export job, shows its progress from the job API, and offers the zipped data package when it is done. */
@Component({
  selector: 'fw-export-panel',
  imports: [DecimalPipe, MatButtonModule, MatFormFieldModule, MatProgressBarModule, MatSelectModule, ReactiveFormsModule],
  template: `
    <p>The data package holds one CSV per table (collars and events, visits, offset sets, probe readings, closures with raw and review
      results and flags, raw series, temperature logs, aggregates), <code>datapackage.json</code> with table schemas and units,
      EML 2.2 metadata and the provenance of the numbers.</p>
    <!-- The hint runs to two lines: the field grows with it instead of sliding it under the button. -->
    <mat-form-field appearance="outline" subscriptSizing="dynamic">
      <mat-label>Data licence</mat-label>
      <mat-select [formControl]="licence">
        @for (l of licences; track l.id) { <mat-option [value]="l.id">{{ l.id }} — {{ l.title }}</mat-option> }
      </mat-select>
      <mat-hint>Needed to build: written into datapackage.json and the EML, so a repository can publish the data.</mat-hint>
    </mat-form-field>
    <p><button mat-flat-button type="button" (click)="start()" [disabled]="running() || !chosenLicence()">Build data package</button></p>
    @if (job(); as j) {
      <p role="status" data-testid="export-status">{{ j.state }} · {{ j.done }} / {{ j.total ?? '?' }}
</p>
      @if (j.total) { <mat-progress-bar mode="determinate" [value]="(100 * j.done) / j.total" [attr.aria-label]="'Data package progress, ' + j.done + ' of ' + j.total" /> }
      @if (j.state === 'completed' && j.result) {
        <a matButton="outlined" [href]="'/api/results/exports/' + j.id + '/file'" [attr.download]="j.result.fileName" data-testid="export-download">
          Download {{ j.result.fileName }} ({{ j.result.sizeBytes / 1024 | number: '1.0-0' }} kB)</a>
      }
      @if (j.error) { <p role="alert">{{ j.error }}</p> }
    }
    @if (problem()) { <p role="alert">{{ problem() }}</p> }`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ExportPanel implements OnDestroy {
  private readonly api = inject(ResultsApi);
  readonly siteId = input.required<string>();
  readonly selection = input.required<ClosureSelection>();
  readonly model = input.required<string>();
  protected readonly licences = DATA_LICENCES;
  protected readonly licence = new FormControl('', { nonNullable: true });
  protected readonly chosenLicence = formValue(this.licence);
  protected readonly job = signal<ExportJob | null>(null);
  protected readonly running = signal(false);
  protected readonly problem = signal('');
  private timer: ReturnType<typeof setTimeout> | null = null;

  protected async start(): Promise<void> {
    this.running.set(true);
    this.problem.set('');
    try {
      const { jobId } = await this.api.startExport(this.siteId(), this.selection(), this.model(), this.licence.value);
      await this.poll(jobId);
    } catch (err) {
      this.problem.set(serverMessage(err, 'The export could not be started'));
      this.running.set(false);
    }
  }

  private async poll(id: string): Promise<void> {
    const { job } = await this.api.exportJob(id);
    this.job.set(job);
    if (job.state === 'completed' || job.state === 'failed') {
      this.running.set(false);
      return;
    }
    this.timer = setTimeout(
      () =>
        void this.poll(id).catch((e) => {
          this.problem.set(serverMessage(e, 'Progress unavailable'));
          this.running.set(false);
        }),
      POLL_MS,
    );
  }

  ngOnDestroy(): void {
    if (this.timer) clearTimeout(this.timer);
  }
}
