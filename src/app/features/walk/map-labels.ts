/** Marker size on the Walk map, CSS px: a 48 px touch target, as every Walk control. */
export const MARKER_PX = 48;
/** Label box height, CSS px. */
export const LABEL_H = 22;

export type LabelSide = 'right' | 'left' | 'above' | 'below';

export interface LabelRequest {
  /** Marker centre in container pixels. */
  x: number;
  y: number;
  /** Label width in pixels (measured, or estimated from the text). */
  width: number;
}

export interface LabelPlace {
  side: LabelSide;
  /** Label box, container pixels. */
  left: number;
  top: number;
}

interface Box {
  l: number;
  t: number;
  r: number;
  b: number;
}

const overlaps = (a: Box, b: Box) => a.l < b.r && b.l < a.r && a.t < b.b && b.t < a.b;

function boxFor(m: LabelRequest, side: LabelSide): Box {
  const half = MARKER_PX / 2;
  switch (side) {
    case 'right':
      return { l: m.x + half, t: m.y - LABEL_H / 2, r: m.x + half + m.width, b: m.y + LABEL_H / 2 };
    case 'left':
      return { l: m.x - half - m.width, t: m.y - LABEL_H / 2, r: m.x - half, b: m.y + LABEL_H / 2 };
    case 'above':
      return { l: m.x - m.width / 2, t: m.y - half - LABEL_H, r: m.x + m.width / 2, b: m.y - half };
    case 'below':
      return { l: m.x - m.width / 2, t: m.y + half, r: m.x + m.width / 2, b: m.y + half + LABEL_H };
  }
}

/**
 * Where each marker's label goes: the first side (right, left, above, below) whose box stays
 * inside the map and overlaps no marker and no label already placed; null when no side fits (the
 * label is hidden until the map zooms in; the marker keeps its full name for screen readers).
 * Labels are placed in the given order, so the caller puts the ones that matter most first.
 */
export function placeLabels(markers: readonly LabelRequest[], size: { width: number; height: number }): (LabelPlace | null)[] {
  const half = MARKER_PX / 2;
  const taken: Box[] = markers.map((m) => ({ l: m.x - half, t: m.y - half, r: m.x + half, b: m.y + half }));
  return markers.map((m, i) => {
    for (const side of ['right', 'left', 'above', 'below'] as const) {
      const box = boxFor(m, side);
      if (box.l < 0 || box.t < 0 || box.r > size.width || box.b > size.height) continue;
      if (taken.some((o, j) => j !== i && overlaps(box, o))) continue;
      taken.push(box);
      return { side, left: box.l, top: box.t };
    }
    return null;
  });
}

/** Label width for a code when the browser cannot measure it (bold 13 px text plus padding). */
export function estimateLabelWidth(text: string): number {
  return Math.ceil(text.length * 8.5 + 10);
}
