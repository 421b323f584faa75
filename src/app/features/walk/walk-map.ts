import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  ElementRef,
  NgZone,
  afterNextRender,
  computed,
  effect,
  inject,
  viewChild,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { Router, RouterLink } from '@angular/router';
import * as L from 'leaflet';
import { SiteChoice } from '../../core/auth/site-choice';
import { liveSignal } from '../../core/db/live-query-signal';
import { escapeHtml, mapText } from '../../core/map/map-text';
import { Gps } from './gps';
import { STATE_COLOURS, STATE_GLYPHS, STATE_LEGEND, STATE_WORDS } from '../../core/map/collar-states';
import { LABEL_H, MARKER_PX, estimateLabelWidth, placeLabels } from './map-labels';
import { WalkContext } from '../field-day/walk-context';
import { RouteStore } from './route-store';
import { walkOptions } from './walk-query';

/**
 * A marker's face: the state's shape (the Board's glyph) filling a 48 px target, and a label with
 * the code and the state's word, both as text (codes are typed by people). The label is placed
 * afterwards by placeLabels().
 */
function markerFace(mark: string, text: string, colour: string): HTMLElement {
  const face = document.createElement('span');
  face.className = 'face';
  const m = mapText(mark, 'm');
  m.style.color = colour;
  const t = mapText(text, 't');
  for (const part of [m, t]) {
    part.setAttribute('aria-hidden', 'true');
    face.append(part);
  }
  return face;
}

/**
 * The route's collars over the plot outlines, with our own markers: the state is a shape and a
 * word beside the code, never colour alone. No map tiles are fetched unless the site names a tile
 * source, so it works with no signal.
 */
@Component({
  selector: 'fw-walk-map',
  imports: [MatButtonModule, RouterLink],
  template: `
    <div class="walk">
      <a mat-button routerLink="/walk">← Route</a>
      <h1>Map</h1>
      <p class="legend" data-testid="map-legend">{{ legend }} · ◎ you</p>
      <div #map class="map" role="region" aria-label="Map of the route's collars" data-testid="walk-map"></div>
      @if (!tileUrl()) { <p class="muted">No map background: this site has no tile source, so nothing is downloaded.</p> }
    </div>
  `,
  styleUrl: './walk.scss',
  styles: `
    .map { height: 62vh; min-height: 320px; border: 1px solid var(--mat-sys-outline); border-radius: 8px; background: #f4f1ea; }
    .legend { font-size: 1.05rem; }
    :host ::ng-deep .fw-marker { font-weight: 700; color: #111; }
    :host ::ng-deep .fw-marker .face { display: contents; }
    :host ::ng-deep .fw-marker .m { display: flex; align-items: center; justify-content: center; width: 48px; height: 48px; font-size: 30px; line-height: 1; background: rgba(255, 255, 255, 0.85); border-radius: 50%; }
    :host ::ng-deep .fw-marker .t { position: absolute; height: 22px; box-sizing: border-box; background: #fff; border: 1px solid #111; border-radius: 4px; padding: 0 4px; font-size: 13px; line-height: 20px; white-space: nowrap; }
    :host ::ng-deep .fw-marker .t.hidden { display: none; }
    :host ::ng-deep .fw-marker:focus-visible { outline: 3px solid #0b57d0; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class WalkMap {
  private readonly site = inject(SiteChoice).current;
  private readonly walk = inject(WalkContext);
  private readonly gps = inject(Gps);
  private readonly router = inject(Router);
  private readonly zone = inject(NgZone);
  private readonly host = viewChild.required<ElementRef<HTMLElement>>('map');
  private readonly options = walkOptions(() => this.site()?.id ?? null);
  protected readonly tileUrl = computed(() => this.options()?.site?.tileUrl ?? null);
  private readonly route = inject(RouteStore).view(() => {
    const c = this.walk.choice();
    return { campaignId: c.campaignId, routeId: c.routeId, round: c.round, flipped: c.flipped };
  });
  private readonly plots = liveSignal(
    () => this.site()?.id ?? null,
    async (db, siteId) => (siteId ? db.records('plot').where('siteId').equals(siteId).toArray() : []),
    [],
  );
  protected readonly legend = STATE_LEGEND;
  private map: L.Map | null = null;
  private placed: { marker: L.Marker; label: string }[] = [];
  private readonly layers = { plots: L.layerGroup(), collars: L.layerGroup(), me: L.layerGroup() };
  private fitted = false;
  private hasView = false;

  constructor() {
    const stop = this.gps.watch();
    inject(DestroyRef).onDestroy(() => {
      stop();
      this.map?.remove();
    });
    afterNextRender(() => {
      // No view yet: drawAll() fits the collars (or shows the world when none has a position), so
      // the map lays itself out once instead of a world view and then the route's.
      this.map = this.zone.runOutsideAngular(() =>
        L.map(this.host().nativeElement, { zoomControl: true, attributionControl: true, maxZoom: 22 }),
      );
      Object.values(this.layers).forEach((l) => l.addTo(this.map!));
      this.map.on('zoomend moveend resize', () => this.layoutLabels());
      const url = this.tileUrl();
      if (url) L.tileLayer(url, { attribution: escapeHtml(this.options()?.site?.tileAttribution ?? ''), maxZoom: 20 }).addTo(this.map);
      this.drawAll();
    });
    // Only draws into Leaflet (a non-Angular API): the data comes from the live route and plots above.
    effect(() => {
      this.route();
      this.plots();
      this.gps.fix();
      this.drawAll();
    });
  }

  private drawAll(): void {
    const map = this.map;
    if (!map) return;
    const rows = this.route()?.rows ?? [];
    this.layers.plots.clearLayers();
    for (const p of this.plots()) {
      const outline = p.outline;
      if (outline) {
        L.geoJSON(outline, { style: { color: '#333', weight: 2, dashArray: '6 4', fillOpacity: 0.04 }, interactive: false }).addTo(
          this.layers.plots,
        );
      }
    }
    this.layers.collars.clearLayers();
    this.placed = [];
    const points: L.LatLngExpression[] = [];
    for (const r of rows) {
      if (r.latitude === null || r.longitude === null) continue;
      points.push([r.latitude, r.longitude]);
      const label = `${r.code}, ${STATE_WORDS[r.state]}`;
      const icon = L.divIcon({
        className: 'fw-marker',
        html: markerFace(STATE_GLYPHS[r.state], `${r.code} ${STATE_WORDS[r.state]}`, STATE_COLOURS[r.state]),
        iconSize: [MARKER_PX, MARKER_PX],
        iconAnchor: [MARKER_PX / 2, MARKER_PX / 2],
      });
      const marker = L.marker([r.latitude, r.longitude], { icon, title: label, alt: label, keyboard: true, riseOnHover: true });
      const open = () => this.zone.run(() => void this.router.navigate(['/walk/visit', r.id]));
      marker.on('click', open);
      marker.addTo(this.layers.collars);
      this.placed.push({ marker, label: `${r.code} ${STATE_WORDS[r.state]}` });
      const el = marker.getElement();
      el?.setAttribute('aria-label', `Open collar ${label}`);
      // Leaflet makes the marker focusable but Enter only opens a popup: a focused marker opens its
      // collar with Enter or Space, like the button it announces itself as.
      el?.addEventListener('keydown', (e) => {
        if (e.key !== 'Enter' && e.key !== ' ') return;
        e.preventDefault();
        open();
      });
    }
    this.layers.me.clearLayers();
    const fix = this.gps.fix();
    if (fix) {
      L.circle([fix.latitude, fix.longitude], {
        radius: fix.accuracyM,
        color: '#0b57d0',
        weight: 1,
        fillOpacity: 0.1,
        interactive: false,
      }).addTo(this.layers.me);
      L.marker([fix.latitude, fix.longitude], {
        icon: L.divIcon({
          className: 'fw-marker',
          html: markerFace('◎', 'you', '#0b57d0'),
          iconSize: [MARKER_PX, MARKER_PX],
          iconAnchor: [MARKER_PX / 2, MARKER_PX / 2],
        }),
        keyboard: false,
        interactive: false,
      }).addTo(this.layers.me);
    }
    let moved = false;
    if (!this.fitted && points.length) {
      // The container may have been laid out after the map was made; measure again before fitting.
      map.invalidateSize();
      map.fitBounds(L.latLngBounds(points), { padding: [40, 40], maxZoom: 22 });
      this.fitted = moved = true;
    } else if (!this.fitted && this.route() !== undefined && !this.hasView) {
      map.setView([0, 0], 2); // the route has no positioned collar
      moved = true;
    }
    this.hasView ||= moved;
    // A move lays the labels out already (moveend); otherwise they follow the redrawn markers here.
    if (!moved) this.layoutLabels();
  }

  /** Puts each code label beside its marker where it overlaps nothing and stays inside the map; hides the rest. */
  private layoutLabels(): void {
    const map = this.map;
    if (!map) return;
    const size = map.getSize();
    const items = this.placed.map(({ marker, label }) => {
      const el = marker.getElement()?.querySelector<HTMLElement>('.t') ?? null;
      const p = map.latLngToContainerPoint(marker.getLatLng());
      return { el, x: p.x, y: p.y, width: el?.offsetWidth || estimateLabelWidth(label) };
    });
    const places = placeLabels(items, { width: size.x, height: size.y });
    items.forEach((it, i) => {
      const place = places[i];
      if (!it.el) return;
      it.el.classList.toggle('hidden', !place);
      it.el.dataset['side'] = place?.side ?? 'none';
      if (!place) return;
      // Label box from container pixels to the marker element's own box (its top-left is centre − 24 px).
      it.el.style.left = `${place.left - (it.x - MARKER_PX / 2)}px`;
      it.el.style.top = `${place.top - (it.y - MARKER_PX / 2)}px`;
      it.el.style.height = `${LABEL_H}px`;
    });
  }
}
