import type { DataSource } from 'typeorm';
import type { SessionUser } from '../../shared/auth/roles';
import { csvLine } from '../../shared/csv/csv-cell';
import { NOT_DUE_WORDS, progressStateWords } from '../../shared/model/progress-state';
import { campaignProgress } from '../campaigns/campaign-progress';

const ITEMS = ['offset', 'closures', 'probes'] as const;

/** The progress answer as CSV, one row per collar in walking order, with route, plot and treatment named. */
export async function progressCsv(ds: DataSource, user: SessionUser, campaignId: string, round: number | null): Promise<string> {
  const progress = await campaignProgress(ds, user, campaignId, round);
  const names = await ds.query(
    `
    SELECT k.id, p.code AS plot, array_remove(ARRAY[pt.code, kt.code], NULL) AS treatments
      FROM collar k JOIN plot p ON p.id = k.plot_id
      LEFT JOIN treatment pt ON pt.id = p.treatment_id LEFT JOIN treatment kt ON kt.id = k.treatment_id
     WHERE k.id = ANY($1::uuid[])`,
    [progress.collars.map((c) => c.collarId)],
  );
  const routeIds = [...new Set(progress.collars.map((c) => c.routeId).filter((x): x is string => !!x))];
  const routes: { id: string; name: string }[] = routeIds.length
    ? await ds.query(`SELECT id, name FROM route WHERE id = ANY($1::uuid[])`, [routeIds])
    : [];
  const routeName = new Map(routes.map((r) => [r.id, r.name]));
  const byId = new Map<string, { plot: string; treatments: string[] }>(
    names.map((n: { id: string; plot: string; treatments: string[] }) => [n.id, n]),
  );
  const header = [
    'collar',
    'route',
    'plot',
    'treatment',
    'round',
    'state',
    'skip_reason',
    ...ITEMS.flatMap((k) => [`${k}_state`, `${k}_done`, `${k}_needed`]),
  ];
  const rows = progress.collars.map((c) => {
    const n = byId.get(c.collarId);
    const items = c.items as Record<string, { state: string; done: number; needed: number } | undefined>;
    return [
      c.code,
      c.routeId ? (routeName.get(c.routeId) ?? '') : '',
      n?.plot ?? '',
      n?.treatments.join(' ') ?? '',
      round ?? 'all',
      progressStateWords(c.state),
      c.skipReason ?? '',
      ...ITEMS.flatMap((k) =>
        items[k] ? [progressStateWords(items[k]!.state), items[k]!.done, items[k]!.needed] : [NOT_DUE_WORDS, '', ''],
      ),
    ];
  });
  // Codes, names and skip reasons are typed by people: the shared writer keeps them from running as formulas.
  return [header, ...rows].map((r) => csvLine(r, '\r\n')).join('');
}
