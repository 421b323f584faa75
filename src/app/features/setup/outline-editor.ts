import { ChangeDetectionStrategy, Component, computed, effect, inject, input, output, signal, untracked } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { fieldProblems, serverMessage } from '../../core/api/api-error';
import { MIN_VERTICES, outlineText, parseOutline, toOutline, toVertices, type Vertex } from './outline-geometry';
import { OutlineMap, type MapCollar, type MapPlot } from './outline-map';
import { SetupApi, type Rec } from './setup-api';

/**
 * A plot's outline: drawn on the map (click to add corners, close, drag corners to edit, clear)
 * or typed as GeoJSON, which is the keyboard way to the same result. Saved with PATCH /api/plots/:id.
 */
@Component({
  selector: 'fw-outline-editor',
  imports: [MatButtonModule, MatFormFieldModule, MatInputModule, MatSelectModule, OutlineMap],
  templateUrl: './outline-editor.html',
  styleUrl: './outline-editor.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OutlineEditor {
  private readonly api = inject(SetupApi);
  readonly siteId = input.required<string>();
  readonly site = input<Rec | null>(null);
  readonly plots = input<Rec[]>([]);
  readonly saved = output<Rec>();

  /** Plots as last saved here: the list from the parent may be older than our own PATCH answers. */
  private readonly savedHere = signal<Map<string, Rec>>(new Map());
  protected readonly allPlots = computed(() => this.plots().map((p) => this.savedHere().get(p.id) ?? p));
  protected readonly plotId = signal<string | null>(null);
  protected readonly plot = computed(() => this.allPlots().find((p) => p.id === this.plotId()) ?? null);
  protected readonly vertices = signal<Vertex[]>([]);
  protected readonly closed = signal(false);
  protected readonly text = signal('');
  protected readonly errors = signal<string[]>([]);
  protected readonly message = signal('');
  protected readonly busy = signal(false);
  protected readonly collars = signal<MapCollar[]>([]);
  protected readonly minVertices = MIN_VERTICES;
  protected readonly others = computed<MapPlot[]>(() =>
    this.allPlots()
      .filter((p) => p.id !== this.plotId())
      .map((p) => ({ code: String(p['code']), vertices: toVertices(p['outline']) })),
  );
  protected readonly center = computed<Vertex | null>(() => {
    const s = this.site();
    return typeof s?.['latitude'] === 'number' && typeof s['longitude'] === 'number' ? { lat: s['latitude'], lng: s['longitude'] } : null;
  });
  protected readonly tileUrl = computed(() => (this.site()?.['tileUrl'] as string | null | undefined) ?? null);
  protected readonly tileAttribution = computed(() => (this.site()?.['tileAttribution'] as string | null | undefined) ?? null);
  /** Save needs a closed outline, or no corners at all (which removes the outline). */
  protected readonly canSave = computed(() => !!this.plot() && (this.closed() || this.vertices().length === 0));

  constructor() {
    effect(() => {
      const siteId = this.siteId();
      void this.loadCollars(siteId);
    });
    // A new plot choice shows that plot's saved outline.
    effect(() => {
      this.plotId();
      untracked(() => this.show(this.plot()?.['outline'] ?? null, ''));
    });
  }

  private async loadCollars(siteId: string): Promise<void> {
    try {
      const rows = await this.api.list('collars', { siteId });
      this.collars.set(
        rows
          .filter((c) => typeof c['latitude'] === 'number' && typeof c['longitude'] === 'number')
          .map((c) => ({ code: String(c['code']), lat: c['latitude'] as number, lng: c['longitude'] as number })),
      );
    } catch {
      this.collars.set([]); // the outline can be drawn without them
    }
  }

  private show(outline: unknown, message: string): void {
    const v = toVertices(outline);
    this.vertices.set(v);
    this.closed.set(v.length >= MIN_VERTICES);
    this.text.set(outlineText(toOutline(v)));
    this.errors.set([]);
    this.message.set(message);
  }

  private changed(v: Vertex[], closed: boolean, message: string): void {
    this.vertices.set(v);
    this.closed.set(closed);
    this.text.set(closed ? outlineText(toOutline(v)) : '');
    this.errors.set([]);
    this.message.set(message);
  }

  protected addCorner(at: Vertex): void {
    if (!this.plot()) return this.message.set('Choose a plot first');
    if (this.closed()) return this.message.set('The outline is closed: drag a corner to move it, or clear it to start again');
    const v = [...this.vertices(), at];
    this.changed(
      v,
      false,
      `${v.length} corner${v.length === 1 ? '' : 's'}${v.length < MIN_VERTICES ? '' : '; close the outline when the last one is in'}`,
    );
  }

  protected moveCorner(e: { index: number; to: Vertex }): void {
    this.changed(
      this.vertices().map((v, i) => (i === e.index ? e.to : v)),
      this.closed(),
      `Corner ${e.index + 1} moved`,
    );
  }

  protected close(): void {
    this.changed(this.vertices(), true, `Outline closed with ${this.vertices().length} corners; save to keep it`);
  }

  protected undo(): void {
    this.changed(this.vertices().slice(0, -1), false, 'Last corner removed');
  }

  protected clear(): void {
    this.changed([], false, 'Outline cleared; save to remove it from the plot, or draw a new one');
  }

  protected useText(): void {
    const parsed = parseOutline(this.text());
    if (parsed.errors) {
      this.errors.set(parsed.errors);
      this.message.set('The GeoJSON was not used');
      return;
    }
    const v = toVertices(parsed.outline);
    this.vertices.set(v);
    this.closed.set(true);
    this.errors.set([]);
    this.message.set(`GeoJSON outline with ${v.length} corners shown on the map; save to keep it`);
  }

  protected async save(): Promise<void> {
    const plot = this.plot();
    if (!plot || !this.canSave()) return;
    this.busy.set(true);
    try {
      const rec = await this.api.update('plots', plot.id, plot.rev, { outline: toOutline(this.vertices()) });
      this.savedHere.update((m) => new Map(m).set(rec.id, rec));
      this.errors.set([]);
      this.message.set(rec['outline'] ? `Outline of ${String(rec['code'])} saved` : `Outline of ${String(rec['code'])} removed`);
      this.saved.emit(rec);
    } catch (err) {
      this.errors.set(fieldProblems(err).map((p) => `${p.path}: ${p.message}`));
      this.message.set(serverMessage(err, 'The outline was not saved'));
    } finally {
      this.busy.set(false);
    }
  }
}
