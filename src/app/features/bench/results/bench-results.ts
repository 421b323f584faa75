import { ChangeDetectionStrategy, Component, effect, inject, input, signal } from '@angular/core';
import { MatSelectModule } from '@angular/material/select';
import { MatTabsModule } from '@angular/material/tabs';
import { serverMessage } from '../../../core/api/api-error';
import { ExportPanel } from './export-panel';
import { ResponseChart } from './response-chart';
import { ResultsApi, type ClosureSelection, type ResponseModel, type Responses, type Seasonal, type Summary } from './results-api';
import { SeasonalChart } from './seasonal-chart';
import { SummaryTable } from './summary-table';

type Tab = 'summary' | 'response' | 'seasonal' | 'export';

/** The lab's results for one site: treatment summary, temperature response, seasonal totals and the data package. */
@Component({
  selector: 'fw-bench-results',
  imports: [ExportPanel, MatSelectModule, MatTabsModule, ResponseChart, SeasonalChart, SummaryTable],
  templateUrl: './bench-results.html',
  styles: [
    `
      .options {
        display: flex;
        gap: 8px 16px;
        flex-wrap: wrap;
        margin: 8px 0;
      }
      .options mat-form-field {
        flex: 1 1 220px;
        min-width: 0;
      }
      mat-tab-nav-panel {
        display: block;
        padding-top: 8px;
      }
    `,
  ],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BenchResults {
  private readonly api = inject(ResultsApi);
  readonly siteId = input.required<string>();
  protected readonly tab = signal<Tab>('summary');
  protected readonly selection = signal<ClosureSelection>('accepted');
  protected readonly model = signal<ResponseModel>('lloyd-taylor');
  protected readonly summary = signal<Summary | null>(null);
  protected readonly responses = signal<Responses | null>(null);
  protected readonly seasonal = signal<Seasonal | null>(null);
  protected readonly loading = signal(false);
  protected readonly problem = signal('');
  protected readonly tabs: { id: Tab; label: string }[] = [
    { id: 'summary', label: 'Treatment summary' },
    { id: 'response', label: 'Temperature response' },
    { id: 'seasonal', label: 'Seasonal totals' },
    { id: 'export', label: 'Data package' },
  ];
  private seq = 0;

  constructor() {
    effect(() => void this.load(this.tab(), this.siteId(), this.selection(), this.model()));
  }

  protected choose(t: Tab): void {
    this.tab.set(t);
  }

  private async load(tab: Tab, siteId: string, sel: ClosureSelection, model: string): Promise<void> {
    if (tab === 'export') return;
    const seq = ++this.seq;
    this.loading.set(true);
    try {
      if (tab === 'summary') {
        const s = await this.api.summary(siteId, sel);
        if (seq === this.seq) this.summary.set(s);
      }
      if (tab === 'response') {
        const r = await this.api.responses(siteId, sel);
        if (seq === this.seq) this.responses.set(r);
      }
      if (tab === 'seasonal') {
        const s = await this.api.seasonal(siteId, sel, model);
        if (seq === this.seq) this.seasonal.set(s);
      }
      this.problem.set('');
    } catch (err) {
      this.problem.set(serverMessage(err, 'The results could not be loaded'));
    } finally {
      if (seq === this.seq) this.loading.set(false);
    }
  }
}
