import * as L from 'leaflet';
import { mapText } from '../../core/map/map-text';
import type { ProgressState } from './board-api';
import { STATE_COLOURS, STATE_LABELS } from './state-badge';

export interface CollarPoint {
  lat: number;
  lon: number;
  code: string;
  state: ProgressState;
}

/** Marker box in CSS pixels (the 16-unit shapes of state-badge.ts drawn at 14 px). */
const BOX = 14;
const UNIT = BOX / 16;
/** Labels are placed on a grid of this many pixels; a label whose cells are taken is left out until the map zooms in. */
const CELL = 12;
/** A click this close (px) to a collar names it. */
const HIT_PX = 10;

/**
 * Draws a state's shape centred on (x, y) with canvas calls — the same figures as STATE_SHAPES
 * (open ring, half-filled ring, filled square, barred diamond), so shape tells the state apart
 * without colour.
 */
export function drawShape(ctx: CanvasRenderingContext2D, state: ProgressState, x: number, y: number): void {
  const c = STATE_COLOURS[state];
  const ox = x - BOX / 2,
    oy = y - BOX / 2;
  const p = (u: number) => u * UNIT;
  ctx.fillStyle = c;
  ctx.strokeStyle = c;
  ctx.beginPath();
  switch (state) {
    case 'due':
    case 'partial':
      ctx.lineWidth = p(2.2);
      ctx.arc(ox + p(8), oy + p(8), p(5.5), 0, 2 * Math.PI);
      ctx.stroke();
      if (state === 'partial') {
        ctx.beginPath();
        ctx.arc(ox + p(8), oy + p(8), p(5.5), Math.PI / 2, (3 * Math.PI) / 2); // the left half
        ctx.closePath();
        ctx.fill();
      }
      break;
    case 'complete':
      ctx.fillRect(ox + p(2.5), oy + p(2.5), p(11), p(11));
      break;
    case 'skipped':
      ctx.lineWidth = p(2);
      ctx.moveTo(ox + p(8), oy + p(1.5));
      ctx.lineTo(ox + p(14.5), oy + p(8));
      ctx.lineTo(ox + p(8), oy + p(14.5));
      ctx.lineTo(ox + p(1.5), oy + p(8));
      ctx.closePath();
      ctx.moveTo(ox + p(4.5), oy + p(11.5));
      ctx.lineTo(ox + p(11.5), oy + p(4.5));
      ctx.stroke();
      break;
  }
}

/**
 * Thousands of collars as one canvas instead of one DOM element each: every collar's state shape,
 * and its code beside it wherever there is room (labels never overlap; zooming in shows more).
 * Redrawn after each move or zoom; a click near a collar opens a popup with its code and state.
 */
export class CollarCanvasLayer extends L.Layer {
  private canvas: HTMLCanvasElement | null = null;
  private points: CollarPoint[] = [];
  /** Screen positions of the last draw, for clicks. */
  private placed: { x: number; y: number; p: CollarPoint }[] = [];
  labelled = 0;

  setPoints(points: CollarPoint[]): this {
    this.points = points;
    this.redraw();
    return this;
  }

  override onAdd(map: L.Map): this {
    const canvas = L.DomUtil.create('canvas', 'fw-collar-canvas leaflet-zoom-hide');
    canvas.setAttribute('aria-hidden', 'true');
    map.getPane('overlayPane')!.appendChild(canvas);
    this.canvas = canvas;
    map.on('moveend zoomend resize viewreset', this.redraw, this);
    map.on('click', this.pick, this);
    this.redraw();
    return this;
  }

  override onRemove(map: L.Map): this {
    map.off('moveend zoomend resize viewreset', this.redraw, this);
    map.off('click', this.pick, this);
    this.canvas?.remove();
    this.canvas = null;
    return this;
  }

  redraw(): void {
    const map = this._map as L.Map | undefined;
    const canvas = this.canvas;
    if (!map || !canvas) return;
    const size = map.getSize();
    const dpr = window.devicePixelRatio || 1;
    canvas.width = Math.round(size.x * dpr);
    canvas.height = Math.round(size.y * dpr);
    canvas.style.width = `${size.x}px`;
    canvas.style.height = `${size.y}px`;
    L.DomUtil.setPosition(canvas, map.containerPointToLayerPoint([0, 0]));
    const ctx = canvas.getContext('2d');
    this.placed = [];
    this.labelled = 0;
    if (!ctx) return;
    ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
    ctx.clearRect(0, 0, size.x, size.y);
    for (const p of this.points) {
      const pt = map.latLngToContainerPoint([p.lat, p.lon]);
      if (pt.x < -BOX || pt.y < -BOX || pt.x > size.x + BOX || pt.y > size.y + BOX) continue;
      drawShape(ctx, p.state, pt.x, pt.y);
      this.placed.push({ x: pt.x, y: pt.y, p });
    }
    this.drawLabels(ctx);
  }

  /** Codes to the right of their shapes, skipping any that would overlap a shape or a label already drawn. */
  private drawLabels(ctx: CanvasRenderingContext2D): void {
    const taken = new Set<number>();
    const key = (cx: number, cy: number) => cx * 100_003 + cy;
    const cells = (x0: number, y0: number, x1: number, y1: number) => {
      const out: number[] = [];
      for (let cx = Math.floor(x0 / CELL); cx <= Math.floor(x1 / CELL); cx++) {
        for (let cy = Math.floor(y0 / CELL); cy <= Math.floor(y1 / CELL); cy++) out.push(key(cx, cy));
      }
      return out;
    };
    for (const s of this.placed) for (const k of cells(s.x - BOX / 2, s.y - BOX / 2, s.x + BOX / 2 - 1, s.y + BOX / 2 - 1)) taken.add(k);
    ctx.font = '600 11px system-ui, sans-serif';
    ctx.textBaseline = 'middle';
    ctx.lineJoin = 'round';
    for (const s of this.placed) {
      const w = ctx.measureText(s.p.code).width;
      const x = s.x + BOX / 2 + 2;
      const mine = cells(x, s.y - 6, x + w, s.y + 6);
      if (mine.some((k) => taken.has(k))) continue;
      for (const k of mine) taken.add(k);
      ctx.lineWidth = 3;
      ctx.strokeStyle = '#fff';
      ctx.strokeText(s.p.code, x, s.y);
      ctx.fillStyle = '#1b1b1b';
      ctx.fillText(s.p.code, x, s.y);
      this.labelled++;
    }
  }

  /** The collar nearest to a point of the map container, within HIT_PX. */
  nearest(x: number, y: number): CollarPoint | null {
    let best: CollarPoint | null = null;
    let bestD = HIT_PX * HIT_PX;
    for (const s of this.placed) {
      const d = (s.x - x) ** 2 + (s.y - y) ** 2;
      if (d <= bestD) {
        bestD = d;
        best = s.p;
      }
    }
    return best;
  }

  private pick(e: L.LeafletMouseEvent): void {
    const hit = this.nearest(e.containerPoint.x, e.containerPoint.y);
    if (!hit || !this._map) return;
    L.popup({ closeButton: true })
      .setLatLng([hit.lat, hit.lon])
      .setContent(mapText(`${hit.code}: ${STATE_LABELS[hit.state]}`))
      .openOn(this._map);
  }
}
