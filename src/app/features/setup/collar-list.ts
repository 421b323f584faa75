import { ScrollingModule } from '@angular/cdk/scrolling';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule, type MatSelectChange } from '@angular/material/select';
import { narrowScreen } from '../../core/layout/narrow-screen';
import { serverMessage } from '../../core/api/api-error';
import { SetupApi, type Rec } from './setup-api';

/**
 * A site's collars (possibly thousands) in a virtual-scroll list with a filter and each collar's
 * own treatment (treatments applied to single collars), and the printable tag sheet (one QR code
 * per collar that Walk opens) in A4 or Letter, for the whole site or one plot.
 */
@Component({
  selector: 'fw-collar-list',
  imports: [ScrollingModule, MatButtonModule, MatButtonToggleModule, MatFormFieldModule, MatInputModule, MatSelectModule],
  template: `
    <section aria-labelledby="collars-heading">
      <h3 id="collars-heading">Collars ({{ collars().length }})</h3>
      <div class="tags">
        <mat-button-toggle-group [value]="paper()" (change)="paper.set($event.value)" aria-label="Paper size of the tag sheet">
          <mat-button-toggle value="a4">A4</mat-button-toggle>
          <mat-button-toggle value="letter">Letter</mat-button-toggle>
        </mat-button-toggle-group>
        <mat-form-field subscriptSizing="dynamic">
          <mat-label>Tags of</mat-label>
          <!-- "All plots" has a value of its own: mat-select shows a null value as a blank field. -->
          <mat-select [value]="tagPlotId() ?? ''" (valueChange)="tagPlotId.set($event || null)">
            <mat-option value="">All plots ({{ count(collars().length) }})</mat-option>
            @for (p of plots(); track p.id) {
              <mat-option [value]="p.id">Plot {{ p['code'] }} ({{ count(perPlot().get(p.id) ?? 0) }})</mat-option>
            }
          </mat-select>
        </mat-form-field>
        <a mat-flat-button [href]="tagUrl()" download data-testid="tag-sheet">Download tag sheet (PDF)</a>
      </div>
      <mat-form-field subscriptSizing="dynamic">
        <mat-label>Filter collars</mat-label>
        <input matInput (input)="filter.set($any($event.target).value.trim().toLowerCase())" />
      </mat-form-field>
      <div class="row header" aria-hidden="true"><span>Code</span><span>Plot</span><span>Diameter (cm)</span><span>Status</span><span>Collar treatment</span><span>Notes</span></div>
      <cdk-virtual-scroll-viewport [itemSize]="phone() ? 100 : 44" class="viewport" role="list" aria-label="Collars of the site">
        <div class="row" role="listitem" *cdkVirtualFor="let c of shown(); trackBy: byId">
          <span class="code">{{ c['code'] }}</span><span data-label="Plot">{{ plotCode(c) }}</span><span data-label="Diameter (cm)">{{ c['diameterCm'] ?? '' }}</span>
          <span data-label="Status">{{ c['status'] }}</span>
          <span>
            @if (collarTreatments().length) {
              <mat-select class="treatment" [aria-label]="'Treatment of collar ' + c['code']" [value]="c['treatmentId'] ?? ''" (selectionChange)="setTreatment(c, $event)">
                <mat-option value="">(no collar treatment)</mat-option>
                @for (t of collarTreatments(); track t.id) {
                  <mat-option [value]="t.id">{{ t['code'] }}</mat-option>
                }
              </mat-select>
            } @else {
              {{ treatmentCode(c) }}
            }
          </span>
          <span class="notes">{{ c['notes'] }}</span>
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
  readonly plots = input<Rec[]>([]);
  readonly treatments = input<Rec[]>([]);
  readonly reloadToken = input(0);

  protected readonly collars = signal<Rec[]>([]);
  protected readonly filter = signal('');
  protected readonly paper = signal<'a4' | 'letter'>('a4');
  protected readonly message = signal('');
  protected readonly tagPlotId = signal<string | null>(null);
  protected readonly phone = narrowScreen();
  protected readonly tagUrl = computed(() => this.api.tagSheetUrl(this.siteId(), this.paper(), this.tagPlotId()));
  protected readonly perPlot = computed(() => {
    const n = new Map<string, number>();
    for (const c of this.collars()) n.set(String(c['plotId']), (n.get(String(c['plotId'])) ?? 0) + 1);
    return n;
  });
  /** Only treatments applied to single collars (e.g. trenched vs untrenched) belong on a collar. */
  protected readonly collarTreatments = computed(() => this.treatments().filter((t) => t['level'] === 'collar'));
  private readonly treatmentCodes = computed(() => new Map(this.treatments().map((t) => [t.id, String(t['code'])])));
  private readonly plotCodes = computed(() => new Map(this.plots().map((p) => [p.id, String(p['code'])])));
  protected readonly shown = computed(() => {
    const f = this.filter();
    return f
      ? this.collars().filter((c) => `${c['code']} ${this.plotCode(c)} ${this.treatmentCode(c)} ${c['notes']}`.toLowerCase().includes(f))
      : this.collars();
  });

  constructor() {
    effect(() => {
      this.reloadToken();
      void this.load(this.siteId());
    });
  }

  protected plotCode(c: Rec): string {
    return this.plotCodes().get(String(c['plotId'])) ?? '';
  }

  protected count(n: number): string {
    return `${n} collar${n === 1 ? '' : 's'}`;
  }

  protected treatmentCode(c: Rec): string {
    return this.treatmentCodes().get(String(c['treatmentId'])) ?? '';
  }

  protected async setTreatment(c: Rec, change: MatSelectChange): Promise<void> {
    try {
      const saved = await this.api.update('collars', c.id, c.rev, { treatmentId: (change.value as string) || null });
      this.collars.update((all) => all.map((x) => (x.id === saved.id ? saved : x)));
      this.message.set(`Collar ${String(saved['code'])}: ${this.treatmentCode(saved) || 'no collar treatment'}`);
    } catch (err) {
      this.message.set(serverMessage(err, `Collar ${String(c['code'])} was not changed`));
      change.source.value = String(c['treatmentId'] ?? ''); // back to what is stored
    }
  }

  protected byId(_: number, c: Rec): string {
    return c.id;
  }

  private async load(siteId: string): Promise<void> {
    try {
      this.collars.set(await this.api.list('collars', { siteId }));
    } catch (err) {
      this.message.set(serverMessage(err, 'Could not load the collars'));
    }
  }
}
