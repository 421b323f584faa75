import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  ElementRef,
  afterNextRender,
  computed,
  effect,
  inject,
  resource,
  viewChild,
} from '@angular/core';
import { DomSanitizer, type SafeHtml } from '@angular/platform-browser';
import * as L from 'leaflet';
import { serverMessage } from '../../core/api/api-error';
import { escapeHtml, mapText } from '../../core/map/map-text';
import type { StoredRecord } from '../../../../shared/model/stored-record';
import { BoardApi, type ProgressState } from './board-api';
import { BoardStore } from './board-store';
import { CollarCanvasLayer, type CollarPoint } from './collar-canvas-layer';
import { STATE_LABELS, shapeSvg } from './state-badge';

const STATES: ProgressState[] = ['due', 'partial', 'complete', 'skipped'];

/**
 * The progress states on a map: our own marker shapes with the collar code beside them, plot
 * outlines with their codes, and no background tiles unless the site names a tile server
 * (then with its attribution) — nothing is downloaded from elsewhere otherwise.
 */
@Component({
  selector: 'fw-board-map',
  template: `
    <section aria-labelledby="map-heading">
      <h2 id="map-heading" class="visually-hidden">Map</h2>
      <ul class="legend" aria-label="Map legend">
        @for (s of states; track s) { <li><span [innerHTML]="shape(s)"></span> {{ label(s) }} ({{ counts()[s] }})</li> }
        <li><span class="outline"></span> plot outline</li>
      </ul>
      <div #map class="map" role="region" aria-label="Map of collars by state"></div>
      <p class="note">Each collar is drawn as its state's shape with its code beside it where there is room; zoom in for more codes, click a collar to name it.</p>
      <p class="note">{{ note() }}</p>
      <p role="alert" class="problem">{{ problem() }}</p>
    </section>
  `,
  styles: `
    .legend { display: flex; flex-wrap: wrap; gap: 1rem; list-style: none; padding: 0; margin: .5rem 0; }
    .legend li { display: inline-flex; align-items: center; gap: 4px; }
    .outline { display: inline-block; width: 16px; height: 12px; border: 2px dashed #33415c; }
    .map { height: 520px; border: 1px solid var(--mat-sys-outline-variant); border-radius: 8px; background: #f3f1ea; }
    .note { font-size: .85rem; color: var(--mat-sys-on-surface-variant); }
    .problem { color: var(--mat-sys-error); }
    .visually-hidden { position: absolute; width: 1px; height: 1px; overflow: hidden; clip: rect(0 0 0 0); white-space: nowrap; }
    :host ::ng-deep .fw-plot-label { background: transparent; border: 0; box-shadow: none; font: 700 12px system-ui, sans-serif; color: #33415c; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BoardMap {
  private readonly store = inject(BoardStore);
  private readonly api = inject(BoardApi);
  private readonly host = viewChild.required<ElementRef<HTMLElement>>('map');
  /** The site's record (its tile server); read once the map opens and again when the site changes. */
  private readonly siteRead = resource({
    params: () => this.store.site()?.id,
    loader: ({ params: siteId }) => this.api.record('site', siteId),
  });
  private readonly site = computed(() => (this.siteRead.hasValue() ? this.siteRead.value() : null));
  private map: L.Map | null = null;
  private layer: L.LayerGroup | null = null;
  private collarLayer: CollarCanvasLayer | null = null;
  protected readonly states = STATES;
  protected readonly problem = computed(() => {
    const err = this.siteRead.error();
    return err ? serverMessage(err, 'The site could not be loaded') : '';
  });
  protected readonly note = computed(() =>
    this.site()?.tileUrl
      ? 'Background map from the tile server set for this site.'
      : 'No background map: the site has no tile server set (an admin can set one in Setup).',
  );
  protected readonly counts = computed(() => {
    const c: Record<ProgressState, number> = { due: 0, partial: 0, complete: 0, skipped: 0 };
    for (const r of this.store.rows()) c[r.state]++;
    return c;
  });

  constructor() {
    void this.store.ensureCollars();
    afterNextRender(() => {
      this.map = L.map(this.host().nativeElement, { zoomSnap: 0.5, maxZoom: 22 }).setView([0, 0], 2);
      this.layer = L.layerGroup().addTo(this.map);
      this.collarLayer = new CollarCanvasLayer().addTo(this.map);
    });
    inject(DestroyRef).onDestroy(() => this.map?.remove());
    // Draws into Leaflet (not Angular's view) whenever what it shows changes; nothing is loaded here.
    effect(() => this.draw(this.store.rows(), this.store.collars(), this.store.plots(), this.site()));
  }

  private readonly sanitizer = inject(DomSanitizer);
  // Our own constant SVG shapes (no user input), so they may bypass the HTML sanitizer that strips SVG.
  private readonly legendShapes = Object.fromEntries(STATES.map((s) => [s, this.sanitizer.bypassSecurityTrustHtml(shapeSvg(s))])) as Record<
    ProgressState,
    SafeHtml
  >;

  protected shape(s: ProgressState): SafeHtml {
    return this.legendShapes[s];
  }

  protected label(s: ProgressState): string {
    return STATE_LABELS[s];
  }

  private tiles: L.TileLayer | null = null;
  /** The extent the view was last fitted to. */
  private fitted: L.LatLngBounds | null = null;

  private draw(
    rows: ReturnType<BoardStore['rows']>,
    collars: StoredRecord<'collar'>[],
    plots: StoredRecord<'plot'>[],
    site: StoredRecord<'site'> | null,
  ): void {
    const map = this.map;
    const layer = this.layer;
    if (!map || !layer) return;
    const tileUrl = site?.tileUrl;
    if (tileUrl && !this.tiles) {
      this.tiles = L.tileLayer(tileUrl, { attribution: escapeHtml(site?.tileAttribution ?? ''), maxZoom: 22 }).addTo(map);
    }
    const t0 = performance.now();
    layer.clearLayers();
    const bounds = L.latLngBounds([]);
    for (const p of plots) {
      const outline = p.outline;
      if (!outline) continue;
      const g = L.geoJSON(outline, { style: { color: '#33415c', weight: 2, dashArray: '6 4', fill: false }, interactive: false });
      g.bindTooltip(mapText(p.code), { permanent: true, direction: 'center', className: 'fw-plot-label' });
      g.addTo(layer);
      bounds.extend(g.getBounds());
    }
    const state = new Map(rows.map((r) => [r.collarId, r.state]));
    const points: CollarPoint[] = [];
    for (const c of collars) {
      const s = state.get(c.id);
      const { latitude: lat, longitude: lon } = c;
      if (!s || lat === null || lon === null) continue;
      points.push({ lat, lon, code: c.code, state: s });
      bounds.extend([lat, lon]);
    }
    // One canvas for all collars: a DOM element per marker took 1.8 s to draw 5 000 of them.
    this.collarLayer?.setPoints(points);
    const drawn = points.length;
    // Fitted again only when what is shown reaches elsewhere: a refresh of the states keeps the person's view.
    if (bounds.isValid() && !this.fitted?.equals(bounds)) {
      map.fitBounds(bounds, { padding: [20, 20] });
      this.fitted = bounds;
    }
    markDrawn(t0, drawn);
  }
}

/**
 * A performance measure `board-map-draw` from the start of a draw to the first task after the
 * next frame, so style, layout and paint of the markers count too (read by the e2e run).
 */
function markDrawn(t0: number, markers: number): void {
  requestAnimationFrame(() =>
    setTimeout(() => performance.measure('board-map-draw', { start: t0, end: performance.now(), detail: { markers } })),
  );
}
