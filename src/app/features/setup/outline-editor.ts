import { ChangeDetectionStrategy, Component, computed, inject, input, output, resource, signal } from '@angular/core';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { fieldProblems, serverMessage } from '../../core/api/api-error';
import { MIN_VERTICES, outlineText, parseOutline, toOutline, toVertices, type Vertex } from './outline-geometry';
import { OutlineMap, type MapCollar, type MapPlot } from './outline-map';
import type { StoredRecord } from '../../../../shared/model/stored-record';
import { loadedOr } from '../../core/api/resource-value';
import { SetupApi } from './setup-api';

type Plot = StoredRecord<'plot'>;

/**
 * A plot's outline: drawn on the map (click to add corners, close, drag corners to edit, clear)
 * or typed as GeoJSON, which is the keyboard way to the same result. Saved with PATCH /api/plots/:id.
 */
@Component({
  selector: 'fw-outline-editor',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, MatSelectModule, OutlineMap],
  templateUrl: './outline-editor.html',
  styleUrl: './outline-editor.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OutlineEditor {
  private readonly api = inject(SetupApi);
  readonly siteId = input.required<string>();
  readonly site = input<StoredRecord<'site'> | null>(null);
  readonly plots = input<Plot[]>([]);
  readonly saved = output<Plot>();

  /** Plots as last saved here: the list from the parent may be older than our own PATCH answers. */
  private readonly savedHere = signal<Map<string, Plot>>(new Map());
  protected readonly allPlots = computed(() => this.plots().map((p) => this.savedHere().get(p.id) ?? p));
  protected readonly plotId = signal<string | null>(null);
  protected readonly plot = computed(() => this.allPlots().find((p) => p.id === this.plotId()) ?? null);
  protected readonly vertices = signal<Vertex[]>([]);
  protected readonly closed = signal(false);
  /** The outline as GeoJSON text: typed by the person, or written here after each change on the map. */
  protected readonly text = new FormControl('', { nonNullable: true });
  protected readonly errors = signal<string[]>([]);
  protected readonly message = signal('');
  protected readonly busy = signal(false);
  /** The site's positioned collars to draw against; without them (a failed load) the outline can still be drawn. */
  private readonly collarList = resource({
    params: () => this.siteId(),
    loader: ({ params: siteId }) => this.api.list('collar', { siteId }),
  });
  private readonly collarRows = loadedOr(this.collarList, []);
  protected readonly collars = computed<MapCollar[]>(() =>
    this.collarRows().flatMap((c) =>
      c.latitude !== null && c.longitude !== null ? [{ code: c.code, lat: c.latitude, lng: c.longitude }] : [],
    ),
  );
  protected readonly minVertices = MIN_VERTICES;
  protected readonly others = computed<MapPlot[]>(() =>
    this.allPlots()
      .filter((p) => p.id !== this.plotId())
      .map((p) => ({ code: p.code, vertices: toVertices(p.outline) })),
  );
  protected readonly center = computed<Vertex | null>(() => {
    const s = this.site();
    return s && s.latitude !== null && s.longitude !== null ? { lat: s.latitude, lng: s.longitude } : null;
  });
  protected readonly tileUrl = computed(() => this.site()?.tileUrl ?? null);
  protected readonly tileAttribution = computed(() => this.site()?.tileAttribution ?? null);
  /** Save needs a closed outline, or no corners at all (which removes the outline). */
  protected readonly canSave = computed(() => !!this.plot() && (this.closed() || this.vertices().length === 0));

  /** A new plot choice shows that plot's saved outline. */
  protected choosePlot(id: string | null): void {
    this.plotId.set(id);
    this.show(this.plot()?.outline ?? null, '');
  }

  private show(outline: unknown, message: string): void {
    const v = toVertices(outline);
    this.vertices.set(v);
    this.closed.set(v.length >= MIN_VERTICES);
    this.text.setValue(outlineText(toOutline(v)));
    this.errors.set([]);
    this.message.set(message);
  }

  private changed(v: Vertex[], closed: boolean, message: string): void {
    this.vertices.set(v);
    this.closed.set(closed);
    this.text.setValue(closed ? outlineText(toOutline(v)) : '');
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
    const parsed = parseOutline(this.text.value);
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
      const rec = await this.api.update('plot', plot.id, plot.rev, { outline: toOutline(this.vertices()) });
      this.savedHere.update((m) => new Map(m).set(rec.id, rec));
      this.errors.set([]);
      this.message.set(rec.outline ? `Outline of ${rec.code} saved` : `Outline of ${rec.code} removed`);
      this.saved.emit(rec);
    } catch (err) {
      this.errors.set(fieldProblems(err).map((p) => `${p.path}: ${p.message}`));
      this.message.set(serverMessage(err, 'The outline was not saved'));
    } finally {
      this.busy.set(false);
    }
  }
}
