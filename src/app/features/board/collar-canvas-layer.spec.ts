import type { ProgressState } from './board-api';
import { drawShape } from './collar-canvas-layer';
import { STATE_COLOURS } from './state-badge';

/** A 2D context that records the drawing calls (jsdom has no canvas). */
function recorder() {
  const calls: string[] = [];
  const ctx = new Proxy({} as Record<string, unknown>, {
    get:
      (_t, name: string) =>
      (...args: number[]) =>
        calls.push(`${name}(${args.map((a) => Math.round(a * 100) / 100).join(',')})`),
    set: (_t, name: string, value: unknown) => {
      calls.push(`${name}=${value}`);
      return true;
    },
  }) as unknown as CanvasRenderingContext2D;
  return { ctx, calls };
}

describe('drawShape (map markers on one canvas)', () => {
  // The 16-unit shapes at 14 px: unit 0.875, box from (x − 7, y − 7).
  it('when a collar is due, then an open ring is stroked (r = 5.5 units) and nothing is filled', () => {
    const { ctx, calls } = recorder();
    drawShape(ctx, 'due', 100, 50);
    expect(calls).toContain(`arc(100,50,4.81,0,${Math.round(2 * Math.PI * 100) / 100})`);
    expect(calls.filter((c) => c.startsWith('fill'))).toEqual([`fillStyle=${STATE_COLOURS.due}`]);
    expect(calls.at(-1)).toBe('stroke()');
  });

  it('when partial, then the same ring plus its left half filled', () => {
    const { ctx, calls } = recorder();
    drawShape(ctx, 'partial', 100, 50);
    expect(calls).toContain(`arc(100,50,4.81,${Math.round((Math.PI / 2) * 100) / 100},${Math.round(((3 * Math.PI) / 2) * 100) / 100})`);
    expect(calls.at(-1)).toBe('fill()');
  });

  it('when complete, then a filled square of 11 units; when skipped, a stroked diamond with a bar', () => {
    const sq = recorder();
    drawShape(sq.ctx, 'complete', 100, 50);
    expect(sq.calls).toContain('fillRect(95.19,45.19,9.63,9.63)');
    const sk = recorder();
    drawShape(sk.ctx, 'skipped', 100, 50);
    expect(sk.calls.filter((c) => c.startsWith('lineTo')).length).toBe(4);
    expect(sk.calls).toContain('moveTo(96.94,53.06)');
    expect(sk.calls.at(-1)).toBe('stroke()');
  });

  it('when the four states are drawn, then each has its own sequence of figures (shape, not colour, tells them apart)', () => {
    const shapes = (['due', 'partial', 'complete', 'skipped'] as ProgressState[]).map((s) => {
      const r = recorder();
      drawShape(r.ctx, s, 0, 0);
      return r.calls.filter((c) => !/Style=/.test(c)).join(';');
    });
    expect(new Set(shapes).size).toBe(4);
  });
});
