import { ScrollingModule } from '@angular/cdk/scrolling';
import { ChangeDetectionStrategy, Component, computed, inject, input, resource, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule, type MatSelectChange } from '@angular/material/select';
import { narrowScreen } from '../../core/layout/narrow-screen';
import { serverMessage } from '../../core/api/api-error';
import type { StoredRecord } from '../../../../shared/model/stored-record';
import { loadedOr, loadProblem } from '../../core/api/resource-value';
import { SetupApi } from './setup-api';

type Collar = StoredRecord<'collar'>;

/**
 * A site's collars (possibly thousands) in a virtual-scroll list with a filter and each collar's
 * own treatment (treatments applied to single collars), and the printable tag sheet (one QR code
 * per collar that Walk opens) in A4 or Letter, for the whole site or one plot.
 */
@Component({
  selector: 'fw-collar-list',
  imports: [
    ReactiveFormsModule,
    ScrollingModule,
    MatButtonModule,
    MatButtonToggleModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
  ],
  template: `
    <section aria-labelledby="collars-heading">
      <h3 id="collars-heading">Collars ({{ collars().length }})</h3>
      <div class="tags">
        <mat-button-toggle-group [formControl]="paper" aria-label="Paper size of the tag sheet">
          <mat-button-toggle value="a4">A4</mat-button-toggle>
          <mat-button-toggle value="letter">Letter</mat-button-toggle>
        </mat-button-toggle-group>
        <mat-form-field subscriptSizing="dynamic">
          <mat-label>Tags of</mat-label>
          <!-- "All plots" has a value of its own: mat-select shows a null value as a blank field. -->
          <mat-select [formControl]="tagPlot">
            <mat-option value="">All plots ({{ count(collars().length) }})</mat-option>
            @for (p of plots(); track p.id) {
              <mat-option [value]="p.id">Plot {{ p.code }} ({{ count(perPlot().get(p.id) ?? 0) }})</mat-option>
            }
          </mat-select>
        </mat-form-field>
        <a mat-flat-button [href]="tagUrl()" download data-testid="tag-sheet">Download tag sheet (PDF)</a>
      </div>
      <mat-form-field subscriptSizing="dynamic">
        <mat-label>Filter collars</mat-label>
        <input matInput [formControl]="filter" />
      </mat-form-field>
      <div class="row header" aria-hidden="true"><span>Code</span><span>Plot</span><span>Diameter (cm)</span><span>Status</span><span>Collar treatment</span><span>Notes</span></div>
      <cdk-virtual-scroll-viewport [itemSize]="phone() ? 100 : 44" class="viewport" role="list" aria-label="Collars of the site">
        <div class="row" role="listitem" *cdkVirtualFor="let c of shown(); trackBy: byId">
          <span class="code">{{ c.code }}</span><span data-label="Plot">{{ plotCode(c) }}</span><span data-label="Diameter (cm)">{{ c.diameterCm ?? '' }}</span>
          <span data-label="Status">{{ c.status }}</span>
          <span>
            @if (collarTreatments().length) {
              <mat-select class="treatment" [aria-label]="'Treatment of collar ' + c.code" [value]="c.treatmentId ?? ''" (selectionChange)="setTreatment(c, $event)">
                <mat-option value="">(no collar treatment)</mat-option>
                @for (t of collarTreatments(); track t.id) {
                  <mat-option [value]="t.id">{{ t.code }}</mat-option>
                }
              </mat-select>
            } @else {
              {{ treatmentCode(c) }}
            }
          </span>
          <span class="notes">{{ c.notes }}</span>
        </div>
      </cdk-virtual-scroll-viewport>
      <p role="status">{{ message() }}</p>
    </section>
  `,
  styles: `
    .tags { display: flex; gap: 1rem; align-items: center; margin-block: .5rem 1rem; flex-wrap: wrap; }
    .viewport { height: 360px; border: 1px solid var(--mat-sys-outline-variant); border-radius: 8px; }
    .row { display: grid; grid-template-columns: 8rem 6rem 8rem 6rem 10rem 1fr; gap: .5rem; height: 44px; align-items: center; padding-inline: .75rem; box-sizing: border-box; }
    .header { font-weight: 600; }
    .code { font-weight: 600; }
    .treatment { min-height: 36px; display: flex; align-items: center; border-bottom: 1px solid var(--mat-sys-outline); }
    // A phone shows each collar as a small card: two columns, each value with its name.
    @media (max-width: 599.98px) {
      .header { display: none; }
      .row { grid-template-columns: minmax(0, 1fr) minmax(0, 1fr); grid-auto-rows: minmax(22px, auto); height: 100px; gap: 2px .5rem;
        padding-block: 6px; border-bottom: 1px solid var(--mat-sys-outline-variant); }
      .row > [data-label]::before { content: attr(data-label) ': '; color: var(--mat-sys-on-surface-variant); }
    }
    .notes { overflow: hidden; text-overflow: ellipsis; white-space: nowrap; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CollarList {
  private readonly api = inject(SetupApi);
  readonly siteId = input.required<string>();
  readonly plots = input<StoredRecord<'plot'>[]>([]);
  readonly treatments = input<StoredRecord<'treatment'>[]>([]);
  /** A new value loads the collars again (after an import). */
  readonly reloadToken = input(0);

  private readonly list = resource({
    params: () => ({ siteId: this.siteId(), reload: this.reloadToken() }),
    loader: ({ params }) => this.api.list('collar', { siteId: params.siteId }),
  });
  protected readonly collars = loadedOr(this.list, []);
  protected readonly filter = new FormControl('', { nonNullable: true });
  protected readonly paper = new FormControl<'a4' | 'letter'>('a4', { nonNullable: true });
  /** '' is every plot: mat-select shows a null value as a blank field. */
  protected readonly tagPlot = new FormControl('', { nonNullable: true });
  private readonly filterText = toSignal(this.filter.valueChanges, { initialValue: '' });
  private readonly paperNow = toSignal(this.paper.valueChanges, { initialValue: this.paper.value });
  private readonly tagPlotId = toSignal(this.tagPlot.valueChanges, { initialValue: '' });
  private readonly saveMessage = signal('');
  private readonly loadMessage = loadProblem(this.list, 'Could not load the collars');
  protected readonly message = computed(() => this.loadMessage() || this.saveMessage());
  protected readonly phone = narrowScreen();
  protected readonly tagUrl = computed(() => this.api.tagSheetUrl(this.siteId(), this.paperNow(), this.tagPlotId() || null));
  protected readonly perPlot = computed(() => {
    const n = new Map<string, number>();
    for (const c of this.collars()) n.set(c.plotId, (n.get(c.plotId) ?? 0) + 1);
    return n;
  });
  /** Only treatments applied to single collars (e.g. trenched vs untrenched) belong on a collar. */
  protected readonly collarTreatments = computed(() => this.treatments().filter((t) => t.level === 'collar'));
  private readonly treatmentCodes = computed(() => new Map(this.treatments().map((t) => [t.id, t.code])));
  private readonly plotCodes = computed(() => new Map(this.plots().map((p) => [p.id, p.code])));
  protected readonly shown = computed(() => {
    const f = this.filterText().trim().toLowerCase();
    return f
      ? this.collars().filter((c) => `${c.code} ${this.plotCode(c)} ${this.treatmentCode(c)} ${c.notes}`.toLowerCase().includes(f))
      : this.collars();
  });

  protected plotCode(c: Collar): string {
    return this.plotCodes().get(c.plotId) ?? '';
  }

  protected count(n: number): string {
    return `${n} collar${n === 1 ? '' : 's'}`;
  }

  protected treatmentCode(c: Collar): string {
    return (c.treatmentId && this.treatmentCodes().get(c.treatmentId)) || '';
  }

  protected async setTreatment(c: Collar, change: MatSelectChange<string>): Promise<void> {
    try {
      const saved = await this.api.update('collar', c.id, c.rev, { treatmentId: change.value || null });
      this.list.update((all) => all?.map((x) => (x.id === saved.id ? saved : x)));
      this.saveMessage.set(`Collar ${saved.code}: ${this.treatmentCode(saved) || 'no collar treatment'}`);
    } catch (err) {
      this.saveMessage.set(serverMessage(err, `Collar ${c.code} was not changed`));
      change.source.value = c.treatmentId ?? ''; // back to what is stored
    }
  }

  protected byId(_: number, c: Collar): string {
    return c.id;
  }
}
