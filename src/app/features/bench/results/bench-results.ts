import { ChangeDetectionStrategy, Component, computed, inject, input, resource, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { map } from 'rxjs';
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
  imports: [ExportPanel, MatSelectModule, MatTabsModule, ReactiveFormsModule, ResponseChart, SeasonalChart, SummaryTable],
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
  private readonly fb = inject(NonNullableFormBuilder);
  protected readonly options = this.fb.group({
    selection: this.fb.control<ClosureSelection>('accepted'),
    model: this.fb.control<ResponseModel>('lloyd-taylor'),
  });
  private readonly chosen = toSignal(this.options.valueChanges.pipe(map(() => this.options.getRawValue())), {
    initialValue: this.options.getRawValue(),
  });
  protected readonly selection = computed(() => this.chosen().selection);
  protected readonly model = computed(() => this.chosen().model);

  // Each view is read while its tab is open (no params, no request), again when the site or the options change.
  private readonly summaryRead = resource({
    params: () => (this.tab() === 'summary' ? { siteId: this.siteId(), sel: this.selection() } : undefined),
    loader: ({ params }) => this.api.summary(params.siteId, params.sel),
  });
  private readonly responsesRead = resource({
    params: () => (this.tab() === 'response' ? { siteId: this.siteId(), sel: this.selection() } : undefined),
    loader: ({ params }) => this.api.responses(params.siteId, params.sel),
  });
  private readonly seasonalRead = resource({
    params: () => (this.tab() === 'seasonal' ? { siteId: this.siteId(), sel: this.selection(), model: this.model() } : undefined),
    loader: ({ params }) => this.api.seasonal(params.siteId, params.sel, params.model),
  });
  protected readonly summary = computed<Summary | null>(() => (this.summaryRead.hasValue() ? this.summaryRead.value() : null));
  protected readonly responses = computed<Responses | null>(() => (this.responsesRead.hasValue() ? this.responsesRead.value() : null));
  protected readonly seasonal = computed<Seasonal | null>(() => (this.seasonalRead.hasValue() ? this.seasonalRead.value() : null));
  private readonly shown = computed(() => {
    const t = this.tab();
    return t === 'summary' ? this.summaryRead : t === 'response' ? this.responsesRead : t === 'seasonal' ? this.seasonalRead : null;
  });
  protected readonly loading = computed(() => this.shown()?.isLoading() ?? false);
  protected readonly problem = computed(() => {
    const err = this.shown()?.error();
    return err ? serverMessage(err, 'The results could not be loaded') : '';
  });
  protected readonly tabs: { id: Tab; label: string }[] = [
    { id: 'summary', label: 'Treatment summary' },
    { id: 'response', label: 'Temperature response' },
    { id: 'seasonal', label: 'Seasonal totals' },
    { id: 'export', label: 'Data package' },
  ];

  protected choose(t: Tab): void {
    this.tab.set(t);
  }
}
