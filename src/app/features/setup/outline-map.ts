import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  ElementRef,
  NgZone,
  afterNextRender,
  effect,
  inject,
  input,
  output,
  viewChild,
} from '@angular/core';
import * as L from 'leaflet';
import { escapeHtml, mapText } from '../../core/map/map-text';
import type { Vertex } from './outline-geometry';

export interface MapCollar {
  code: string;
  lat: number;
  lng: number;
}

export interface MapPlot {
  code: string;
  vertices: Vertex[];
}

/**
 * A Leaflet map of the site with no background unless the site names a tile source: the other
 * plots' outlines and the collars are the layout to draw against. Clicks add corners and corner
 * handles can be dragged; the editor owns the corners, this only draws them and reports gestures.
 */
@Component({
  selector: 'fw-outline-map',
  template: `<div #map class="map" role="region" [attr.aria-label]="label()" data-testid="outline-map"></div>`,
  styles: `
    .map { height: 420px; border: 1px solid var(--mat-sys-outline); border-radius: 8px; background: #f4f1ea; cursor: crosshair; }
    :host ::ng-deep .fw-corner { background: #fff; border: 2px solid #7a2e00; border-radius: 50%; }
    :host ::ng-deep .fw-collar-label { background: #fff; border: 1px solid #555; border-radius: 3px; padding: 0 2px; font-size: 11px; color: #111; white-space: nowrap; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OutlineMap {
  private readonly zone = inject(NgZone);
  private readonly host = viewChild.required<ElementRef<HTMLElement>>('map');
  readonly label = input('Map of the site for drawing a plot outline');
  readonly vertices = input<Vertex[]>([]);
  readonly closed = input(false);
  readonly others = input<MapPlot[]>([]);
  readonly collars = input<MapCollar[]>([]);
  readonly center = input<Vertex | null>(null);
  readonly tileUrl = input<string | null>(null);
  readonly tileAttribution = input<string | null>(null);
  readonly mapClick = output<Vertex>();
  readonly vertexMoved = output<{ index: number; to: Vertex }>();

  private map: L.Map | null = null;
  private readonly layers = { context: L.layerGroup(), shape: L.layerGroup() };
  private tiles: L.TileLayer | null = null;
  private fittedTo = '';

  constructor() {
    inject(DestroyRef).onDestroy(() => this.map?.remove());
    afterNextRender(() => {
      this.map = this.zone.runOutsideAngular(() =>
        L.map(this.host().nativeElement, { zoomControl: true, attributionControl: true, doubleClickZoom: false }),
      );
      this.map.setView([0, 0], 2);
      Object.values(this.layers).forEach((l) => l.addTo(this.map!));
      this.map.on('click', (e: L.LeafletMouseEvent) => this.zone.run(() => this.mapClick.emit({ lat: e.latlng.lat, lng: e.latlng.lng })));
      this.drawContext();
      this.drawShape();
    });
    // These only draw into the Leaflet map (not a signal API) whenever the layout or the outline changes.
    effect(() => this.drawContext());
    effect(() => this.drawShape());
  }

  /** Tiles (only when the site names a source), other plots and collars; the view fits them once per site layout. */
  private drawContext(): void {
    const [others, collars, url, attribution, center] = [
      this.others(),
      this.collars(),
      this.tileUrl(),
      this.tileAttribution(),
      this.center(),
    ];
    const map = this.map;
    if (!map) return;
    this.tiles?.remove();
    this.tiles = url ? L.tileLayer(url, { attribution: escapeHtml(attribution ?? ''), maxZoom: 22 }).addTo(map) : null;
    this.layers.context.clearLayers();
    for (const p of others) {
      if (p.vertices.length < 3) continue;
      L.polygon(p.vertices, { color: '#33415c', weight: 2, dashArray: '6 4', fill: false, interactive: false })
        .bindTooltip(mapText(p.code), { permanent: true, direction: 'center', className: 'fw-collar-label' })
        .addTo(this.layers.context);
    }
    for (const c of collars) {
      L.circleMarker([c.lat, c.lng], { radius: 4, color: '#111', weight: 1, fillColor: '#fff', fillOpacity: 1, interactive: false })
        .bindTooltip(mapText(c.code), { permanent: true, direction: 'right', offset: [4, 0], className: 'fw-collar-label' })
        .addTo(this.layers.context);
    }
    const points: L.LatLngExpression[] = [...collars.map((c) => [c.lat, c.lng] as L.LatLngTuple), ...others.flatMap((p) => p.vertices)];
    const key = JSON.stringify([points.length, center]);
    if (key === this.fittedTo) return;
    this.fittedTo = key;
    if (points.length > 1) map.fitBounds(L.latLngBounds(points).pad(0.15), { maxZoom: 21 });
    else if (points.length === 1) map.setView(points[0]!, 19);
    else if (center) map.setView(center, 17);
  }

  /** The outline being drawn: a line while open, a polygon once closed, a handle on every corner. */
  private drawShape(): void {
    const [vertices, closed] = [this.vertices(), this.closed()];
    if (!this.map) return;
    this.layers.shape.clearLayers();
    const style = { color: '#7a2e00', weight: 3 };
    if (closed && vertices.length >= 3) L.polygon(vertices, { ...style, fillOpacity: 0.15, interactive: false }).addTo(this.layers.shape);
    else if (vertices.length > 1) L.polyline(vertices, { ...style, dashArray: '4 4', interactive: false }).addTo(this.layers.shape);
    vertices.forEach((v, index) => {
      const handle = L.marker(v, {
        draggable: true,
        keyboard: false,
        title: `Corner ${index + 1}`,
        icon: L.divIcon({ className: 'fw-corner', iconSize: [12, 12] }),
      });
      handle.on('dragend', () => {
        const to = handle.getLatLng();
        this.zone.run(() => this.vertexMoved.emit({ index, to: { lat: to.lat, lng: to.lng } }));
      });
      handle.addTo(this.layers.shape);
    });
  }
}
