import { signal, type Signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import * as L from 'leaflet';
import type { StoredRecord } from '../../../../shared/model/stored-record';
import { BoardApi } from './board-api';
import { BoardMap } from './board-map';
import { BoardStore } from './board-store';

const HOSTILE = '<img src=x onerror=alert(1)>';
const SITE = {
  id: 'site-a',
  rev: 1,
  name: 'Hollow Creek Meadow',
  tileUrl: 'http://tiles.invalid/{z}/{x}/{y}.png',
  tileAttribution: `© ${HOSTILE}`,
};
const PLOT: Pick<StoredRecord<'plot'>, 'id' | 'rev' | 'code' | 'outline'> = {
  id: 'plot-1',
  rev: 1,
  code: `P${HOSTILE}`,
  outline: {
    type: 'Polygon',
    coordinates: [
      [
        [11.6, 50.97],
        [11.601, 50.97],
        [11.601, 50.971],
        [11.6, 50.97],
      ],
    ],
  },
};

/** A map over the given store contents (signals a test may set), with the site record answered as given. */
function mapOver(store: { rows?: Signal<unknown[]>; collars?: Signal<unknown[]>; plots?: Signal<unknown[]> }, site: object) {
  jest.spyOn(HTMLCanvasElement.prototype, 'getContext').mockReturnValue(null); // jsdom draws no canvas
  TestBed.configureTestingModule({
    imports: [BoardMap],
    providers: [
      {
        provide: BoardStore,
        useValue: {
          ensureCollars: async () => undefined,
          site: signal({ id: SITE.id, name: SITE.name }),
          rows: store.rows ?? signal([]),
          collars: store.collars ?? signal([]),
          plots: store.plots ?? signal([]),
        },
      },
      { provide: BoardApi, useValue: { record: async () => site } },
    ],
  });
  const fixture = TestBed.createComponent(BoardMap);
  /** Lets the site load and the map draw (Leaflet is made after the first render). */
  const settle = async () => {
    fixture.detectChanges();
    await fixture.whenStable();
    await new Promise((r) => setTimeout(r, 0));
    fixture.detectChanges();
    await fixture.whenStable();
  };
  return { fixture, settle };
}

describe('BoardMap', () => {
  // jsdom has no performance.measure; a draw marks its time with one a frame later.
  beforeAll(() => Object.defineProperty(performance, 'measure', { value: () => undefined, configurable: true }));

  it('when a plot code or the tile attribution holds HTML, then the map shows it as literal text and no element is made from it', async () => {
    const { fixture, settle } = mapOver({ plots: signal([PLOT]) }, SITE);
    await settle();
    const host = fixture.nativeElement as HTMLElement;
    expect([...host.querySelectorAll('.fw-plot-label')].map((l) => l.textContent)).toEqual([`P${HOSTILE}`]);
    expect(host.querySelector('.leaflet-control-attribution')?.textContent).toContain(`© ${HOSTILE}`);
    expect(host.querySelectorAll('[onerror]')).toHaveLength(0);
    fixture.destroy();
  });

  it('when a refresh changes only the states, then the map keeps the view the person chose; when the collars shown reach further, then it fits them again', async () => {
    const collar = (id: string, latitude: number, longitude: number) => ({ id, code: id.toUpperCase(), latitude, longitude });
    const collars = signal([collar('c1', 50.97, 11.6), collar('c2', 50.971, 11.601)]);
    const rows = signal([
      { collarId: 'c1', state: 'due' },
      { collarId: 'c2', state: 'due' },
    ]);
    const fit = jest.spyOn(L.Map.prototype, 'fitBounds');
    const { fixture, settle } = mapOver({ rows, collars }, { ...SITE, tileUrl: null });
    await settle();
    const fitsAfterFirstDraw = fit.mock.calls.length;
    expect(fitsAfterFirstDraw).toBeGreaterThan(0);

    rows.set([
      { collarId: 'c1', state: 'complete' },
      { collarId: 'c2', state: 'partial' },
    ]);
    await settle();
    expect(fit.mock.calls.length).toBe(fitsAfterFirstDraw);

    collars.set([...collars(), collar('c3', 50.975, 11.61)]);
    rows.set([...rows(), { collarId: 'c3', state: 'due' }]);
    await settle();
    expect(fit.mock.calls.length).toBe(fitsAfterFirstDraw + 1);
    fixture.destroy();
  });
});
