import { ScrollingModule } from '@angular/cdk/scrolling';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatExpansionModule } from '@angular/material/expansion';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { NOT_DUE_WORDS, PROGRESS_STATE_WORDS, PROGRESS_STATES, progressCountsText } from '../../../../shared/model/progress-state';
import { narrowScreen } from '../../core/layout/narrow-screen';
import { BoardApi, type ItemKey } from './board-api';
import { BoardStore } from './board-store';
import { StateBadge } from './state-badge';
import {
  filterRows,
  groupCounts,
  itemText,
  NO_FILTER,
  sortRows,
  type GroupBar,
  type ProgressFilter,
  type ProgressRow,
  type SortKey,
} from './progress-rows';
import { formValue } from '../../core/forms/form-value';

/**
 * Every collar × due item with its state, filters, counts and bars per route, plot and
 * treatment, sortable, in a CDK virtual scroll so thousands of collars keep a small DOM.
 */
@Component({
  selector: 'fw-progress-view',
  imports: [
    ReactiveFormsModule,
    ScrollingModule,
    MatButtonModule,
    MatExpansionModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatSlideToggleModule,
    StateBadge,
  ],
  templateUrl: './progress-view.html',
  styleUrl: './progress-view.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ProgressView {
  protected readonly store = inject(BoardStore);
  private readonly api = inject(BoardApi);
  private readonly fb = inject(NonNullableFormBuilder);
  /** The filters and the sort, one typed form; the rows follow its value. */
  protected readonly form = this.fb.group({
    need: this.fb.control<ProgressFilter['need']>(NO_FILTER.need),
    routeId: NO_FILTER.routeId,
    plotId: NO_FILTER.plotId,
    treatment: NO_FILTER.treatment,
    crewId: NO_FILTER.crewId,
    state: this.fb.control<ProgressFilter['state']>(NO_FILTER.state),
    text: NO_FILTER.text,
    sortKey: this.fb.control<SortKey>('order'),
  });
  private readonly value = formValue(this.form);
  protected readonly filter = computed<ProgressFilter>(() => {
    const { sortKey: _sort, ...filter } = this.value();
    return filter;
  });
  protected readonly phone = narrowScreen();
  /** How many filters differ from "everything", for the folded panel's summary. */
  protected readonly filtersSet = computed(
    () => (Object.keys(NO_FILTER) as (keyof ProgressFilter)[]).filter((k) => this.filter()[k] !== NO_FILTER[k]).length,
  );
  protected readonly sortKey = computed(() => this.value().sortKey);
  protected readonly descending = signal(false);
  protected readonly groupBy = signal<'route' | 'plot' | 'treatment'>('route');
  protected readonly itemText = itemText;
  protected readonly states = PROGRESS_STATES;
  protected readonly stateWords = PROGRESS_STATE_WORDS;
  protected readonly notDue = NOT_DUE_WORDS;
  protected readonly items: { key: ItemKey; label: string }[] = [
    { key: 'offset', label: 'Offset' },
    { key: 'closures', label: 'Closures' },
    { key: 'probes', label: 'Probes' },
  ];
  protected readonly sorts: { key: SortKey; label: string }[] = [
    { key: 'order', label: 'Walking order' },
    { key: 'code', label: 'Collar code' },
    { key: 'state', label: 'State' },
    { key: 'plot', label: 'Plot' },
    { key: 'route', label: 'Route' },
  ];

  protected readonly shown = computed(() =>
    sortRows(filterRows(this.store.rows(), this.filter(), this.store.crewRoutes()), this.sortKey(), this.descending()),
  );

  protected readonly counts = computed(() => {
    const c = { due: 0, partial: 0, complete: 0, skipped: 0 };
    for (const r of this.shown()) c[r.state]++;
    return c;
  });
  protected readonly countsText = computed(() => progressCountsText(this.counts(), ' · '));

  protected readonly bars = computed<GroupBar[]>(() => {
    const by = this.groupBy();
    return groupCounts(this.shown(), (r) =>
      by === 'route'
        ? [{ key: r.routeId ?? '-', label: r.routeName || 'No route' }]
        : by === 'plot'
          ? [{ key: r.plotId, label: r.plotCode }]
          : r.treatmentCodes.map((t) => ({ key: t, label: t })),
    );
  });

  protected readonly csvOptions = this.fb.group({ forSpreadsheet: false });
  protected readonly csvForSpreadsheet = toSignal(this.csvOptions.controls.forSpreadsheet.valueChanges, { initialValue: false });
  protected readonly csvUrl = computed(() => {
    const id = this.store.campaignId();
    return id ? this.api.csvUrl(id, this.store.round(), this.csvForSpreadsheet()) : '';
  });

  protected readonly treatmentCodes = computed(() => this.store.treatments().map((t) => t.code));
  protected readonly assignedCrew = computed(() => this.store.members().filter((m) => this.store.crewRoutes().has(m.id)));

  protected pct(bar: GroupBar, state: 'complete' | 'skipped' | 'partial'): number {
    return bar.total ? (100 * bar.counts[state]) / bar.total : 0;
  }

  /** The bar read aloud: done states first, as the bar fills. */
  protected barLabel(b: GroupBar): string {
    const w = PROGRESS_STATE_WORDS;
    return `${b.label}: ${b.counts.complete} ${w.complete}, ${b.counts.skipped} ${w.skipped}, ${b.counts.partial} ${w.partial}, ${b.counts.due} ${w.due} of ${b.total}`;
  }

  protected byId(_: number, r: ProgressRow): string {
    return r.collarId;
  }
}
