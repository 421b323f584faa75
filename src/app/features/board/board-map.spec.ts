import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
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

describe('BoardMap', () => {
  it('when a plot code or the tile attribution holds HTML, then the map shows it as literal text and no element is made from it', async () => {
    jest.spyOn(HTMLCanvasElement.prototype, 'getContext').mockReturnValue(null); // jsdom draws no canvas
    TestBed.configureTestingModule({
      imports: [BoardMap],
      providers: [
        {
          provide: BoardStore,
          useValue: {
            ensureCollars: async () => undefined,
            site: signal({ id: SITE.id, name: SITE.name }),
            rows: signal([]),
            collars: signal([]),
            plots: signal([PLOT]),
          },
        },
        { provide: BoardApi, useValue: { record: async () => SITE } },
      ],
    });
    const fixture = TestBed.createComponent(BoardMap);
    fixture.detectChanges();
    await fixture.whenStable();
    await new Promise((r) => setTimeout(r, 0));
    fixture.detectChanges();
    await fixture.whenStable();
    const host = fixture.nativeElement as HTMLElement;
    expect([...host.querySelectorAll('.fw-plot-label')].map((l) => l.textContent)).toEqual([`P${HOSTILE}`]);
    expect(host.querySelector('.leaflet-control-attribution')?.textContent).toContain(`© ${HOSTILE}`);
    expect(host.querySelectorAll('[onerror]')).toHaveLength(0);
    fixture.destroy();
  });
});
