import type { ItemKey, ProgressCollar, ProgressState, StateCounts } from './board-api';

/** One row of the progress table: the collar's progress plus the names the lead filters by. */
export interface ProgressRow extends ProgressCollar {
  routeName: string;
  plotCode: string;
  treatmentCodes: string[];
  crewNames: string[];
  /** Position in walking order, the default sort. */
  order: number;
}

export type Need = '' | ItemKey;
export interface ProgressFilter {
  need: Need;
  routeId: string;
  plotId: string;
  treatment: string;
  crewId: string;
  state: '' | ProgressState;
  text: string;
}
export const NO_FILTER: ProgressFilter = { need: '', routeId: '', plotId: '', treatment: '', crewId: '', state: '', text: '' };
export type SortKey = 'order' | 'code' | 'state' | 'plot' | 'route';

const STATE_RANK: Record<ProgressState, number> = { due: 0, partial: 1, skipped: 2, complete: 3 };

/** "Needs offset" = the item is due at the collar and not yet complete (a skipped collar needs nothing). */
export function needs(row: ProgressCollar, key: ItemKey): boolean {
  const item = row.items[key];
  return !!item && row.state !== 'skipped' && item.state !== 'complete' && item.state !== 'skipped';
}

export function filterRows(rows: readonly ProgressRow[], f: ProgressFilter, crewRoutes: ReadonlyMap<string, string[]>): ProgressRow[] {
  const text = f.text.trim().toLowerCase();
  const crewRouteIds = f.crewId ? new Set(crewRoutes.get(f.crewId) ?? []) : null;
  return rows.filter(
    (r) =>
      (!f.need || needs(r, f.need)) &&
      (!f.routeId || r.routeId === f.routeId) &&
      (!f.plotId || r.plotId === f.plotId) &&
      (!f.treatment || r.treatmentCodes.includes(f.treatment)) &&
      (!crewRouteIds || (r.routeId !== null && crewRouteIds.has(r.routeId))) &&
      (!f.state || r.state === f.state) &&
      (!text || r.code.toLowerCase().includes(text) || (r.skipReason ?? '').toLowerCase().includes(text)),
  );
}

export function sortRows(rows: ProgressRow[], key: SortKey, descending: boolean): ProgressRow[] {
  const cmp: Record<SortKey, (a: ProgressRow, b: ProgressRow) => number> = {
    order: (a, b) => a.order - b.order,
    code: (a, b) => a.code.localeCompare(b.code, undefined, { numeric: true }),
    state: (a, b) => STATE_RANK[a.state] - STATE_RANK[b.state] || a.order - b.order,
    plot: (a, b) => a.plotCode.localeCompare(b.plotCode, undefined, { numeric: true }) || a.order - b.order,
    route: (a, b) => a.routeName.localeCompare(b.routeName) || a.order - b.order,
  };
  const sorted = [...rows].sort(cmp[key]);
  return descending ? sorted.reverse() : sorted;
}

export interface GroupBar {
  key: string;
  label: string;
  counts: StateCounts;
  total: number;
}

/** Counts per group for the progress bars, computed from the rows shown (so filters narrow them too). */
export function groupCounts(rows: readonly ProgressRow[], by: (r: ProgressRow) => { key: string; label: string }[]): GroupBar[] {
  const groups = new Map<string, GroupBar>();
  for (const r of rows) {
    for (const g of by(r)) {
      const bar = groups.get(g.key) ?? { key: g.key, label: g.label, counts: { due: 0, partial: 0, complete: 0, skipped: 0 }, total: 0 };
      bar.counts[r.state]++;
      bar.total++;
      groups.set(g.key, bar);
    }
  }
  return [...groups.values()].sort((a, b) => a.label.localeCompare(b.label, undefined, { numeric: true }));
}

/** Done when every collar is complete or skipped with a reason: the campaign may be closed. */
export function readyToClose(rows: readonly ProgressCollar[]): boolean {
  return rows.length > 0 && rows.every((r) => r.state === 'complete' || r.state === 'skipped');
}

export function itemText(row: ProgressCollar, key: ItemKey): string {
  const item = row.items[key];
  return item ? `${item.done}/${item.needed}` : '–';
}
