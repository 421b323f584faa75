import { LABEL_H, MARKER_PX, estimateLabelWidth, placeLabels } from './map-labels';

const SIZE = { width: 390, height: 400 };

describe('Walk map labels', () => {
  it('markers are 48 px touch targets', () => {
    expect(MARKER_PX).toBe(48);
  });

  it('when markers are far apart, then each label sits to the right of its marker', () => {
    const places = placeLabels(
      [
        { x: 60, y: 60, width: 70 },
        { x: 60, y: 200, width: 70 },
      ],
      SIZE,
    );
    expect(places).toEqual([
      { side: 'right', left: 84, top: 60 - LABEL_H / 2 },
      { side: 'right', left: 84, top: 200 - LABEL_H / 2 },
    ]);
  });

  it('when a marker is at the right edge, then its label goes to the left and stays inside the map', () => {
    const [p] = placeLabels([{ x: 370, y: 100, width: 70 }], SIZE);
    expect(p!.side).toBe('left');
    expect(p!.left).toBeGreaterThanOrEqual(0);
    expect(p!.left + 70).toBeLessThanOrEqual(370 - MARKER_PX / 2);
  });

  it('when two markers are close, then the labels do not overlap each other or a marker: one moves, and one is hidden when no side is free', () => {
    const markers = [
      { x: 100, y: 100, width: 70 },
      { x: 150, y: 100, width: 70 },
      { x: 125, y: 130, width: 70 },
    ];
    const places = placeLabels(markers, SIZE);
    const boxes = places.flatMap((p, i) => (p ? [{ l: p.left, t: p.top, r: p.left + markers[i].width, b: p.top + LABEL_H }] : []));
    const markerBoxes = markers.map((m) => ({ l: m.x - 24, t: m.y - 24, r: m.x + 24, b: m.y + 24 }));
    const hit = (a: (typeof boxes)[0], b: (typeof boxes)[0]) => a.l < b.r && b.l < a.r && a.t < b.b && b.t < a.b;
    for (const [i, a] of boxes.entries()) {
      for (const [j, b] of boxes.entries()) if (i !== j) expect(hit(a, b)).toBe(false);
      for (const m of markerBoxes) expect(hit(a, m)).toBe(false);
      expect(a.l >= 0 && a.t >= 0 && a.r <= SIZE.width && a.b <= SIZE.height).toBe(true);
    }
    expect(places[0]!.side).not.toBe('right'); // the right side is the second marker
  });

  it('when a marker is boxed in on every side, then its label is hidden (null), not drawn over the others', () => {
    const ring = [
      { x: 200, y: 200, width: 60 },
      { x: 250, y: 200, width: 60 },
      { x: 150, y: 200, width: 60 },
      { x: 200, y: 150, width: 60 },
      { x: 200, y: 250, width: 60 },
    ];
    const places = placeLabels(ring, SIZE);
    expect(places[0]).toBeNull();
  });

  it('estimates a label width from its text when the browser cannot measure', () => {
    expect(estimateLabelWidth('K-07 partial')).toBe(Math.ceil(12 * 8.5 + 10));
  });
});
