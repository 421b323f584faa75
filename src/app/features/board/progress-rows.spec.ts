import type { ProgressCollar } from './board-api';
import { filterRows, groupCounts, needs, NO_FILTER, readyToClose, sortRows, type ProgressRow } from './progress-rows';

function row(code: string, order: number, over: Partial<ProgressRow> = {}): ProgressRow {
  return {
    collarId: code,
    code,
    routeId: 'r1',
    plotId: 'p1',
    state: 'due',
    skipReason: null,
    order,
    items: { offset: { state: 'due', done: 0, needed: 1 }, closures: { state: 'due', done: 0, needed: 1 } },
    routeName: 'West',
    plotCode: 'P01',
    treatmentCodes: ['CTL'],
    crewNames: [],
    ...over,
  };
}

describe('progress rows', () => {
  const rows = [
    row('C10', 0),
    row('C2', 1, {
      state: 'partial',
      items: { offset: { state: 'complete', done: 1, needed: 1 }, closures: { state: 'due', done: 0, needed: 1 } },
    }),
    row('C3', 2, { state: 'skipped', skipReason: 'standing water', routeId: 'r2', plotId: 'p2', plotCode: 'P02', treatmentCodes: ['WRM'] }),
  ];

  it('when "needs offset" is chosen, then complete offsets and skipped collars are left out', () => {
    expect(filterRows(rows, { ...NO_FILTER, need: 'offset' }, new Map()).map((r) => r.code)).toEqual(['C10']);
    expect(filterRows(rows, { ...NO_FILTER, need: 'closures' }, new Map()).map((r) => r.code)).toEqual(['C10', 'C2']);
    expect(needs(rows[2] as ProgressCollar, 'offset')).toBe(false);
  });

  it('when a crew member is chosen, then only the routes assigned to them remain', () => {
    expect(filterRows(rows, { ...NO_FILTER, crewId: 'u1' }, new Map([['u1', ['r2']]])).map((r) => r.code)).toEqual(['C3']);
    expect(filterRows(rows, { ...NO_FILTER, treatment: 'WRM' }, new Map()).map((r) => r.code)).toEqual(['C3']);
    expect(filterRows(rows, { ...NO_FILTER, text: 'WATER' }, new Map()).map((r) => r.code)).toEqual(['C3']);
  });

  it('when sorted by code, then numbers inside codes sort as numbers; by state, due comes first', () => {
    expect(sortRows(rows, 'code', false).map((r) => r.code)).toEqual(['C2', 'C3', 'C10']);
    expect(sortRows(rows, 'state', true).map((r) => r.state)).toEqual(['skipped', 'partial', 'due']);
  });

  it('when grouped by plot, then each bar counts its collars per state', () => {
    const bars = groupCounts(rows, (r) => [{ key: r.plotId, label: r.plotCode }]);
    expect(bars).toEqual([
      { key: 'p1', label: 'P01', counts: { due: 1, partial: 1, complete: 0, skipped: 0 }, total: 2 },
      { key: 'p2', label: 'P02', counts: { due: 0, partial: 0, complete: 0, skipped: 1 }, total: 1 },
    ]);
  });

  it('when anything is still due or partial, then the campaign is not ready to close', () => {
    expect(readyToClose(rows)).toBe(false);
    expect(readyToClose([{ ...rows[2] }, { ...rows[0], state: 'complete' }])).toBe(true);
    expect(readyToClose([])).toBe(false);
  });
});
