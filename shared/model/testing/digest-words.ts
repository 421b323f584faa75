/**
 * The daily digest's words, as the mail (server) and the Board's preview (app) both write them, for
 * one route whose counts differ per state: 1 due, 2 partial, 3 complete, 4 skipped. Both specs
 * render this digest and expect these lines, so a changed word or order is one edit here.
 * Test data only: each spec types the digest with its own Digest interface (the shapes agree).
 */
import { PROGRESS_STATE_WORDS, PROGRESS_STATES, progressStateHeading } from '../progress-state';

export const DIGEST_STATE_COUNTS = { due: 1, partial: 2, complete: 3, skipped: 4 } as const;

/** The digest both specs render: one open campaign, one route, counts as DIGEST_STATE_COUNTS. */
export function digestWithStateCounts(site: { id: string; name: string; timezone: string }) {
  return {
    site,
    localDate: '2026-05-04',
    campaigns: [
      {
        id: 'c1',
        name: 'May round',
        startsOn: '2026-05-03',
        endsOn: '2026-05-05',
        routes: [
          {
            routeId: 'r1',
            routeName: 'North loop',
            due: ['C1'],
            partial: [
              { code: 'C2', missing: ['probes 0/1'] },
              { code: 'C3', missing: ['offset 0/1'] },
            ],
            complete: DIGEST_STATE_COUNTS.complete,
            skipped: DIGEST_STATE_COUNTS.skipped,
          },
        ],
      },
    ],
    anomalies: { total: 0, problems: 0, items: [] },
    silentDevices: [],
  };
}

/** What both surfaces write for that route: each count with its state's word, and the partial collar with what it misses. */
export const DIGEST_STATE_LINES = {
  counts: `North loop: ${PROGRESS_STATES.map((s) => `${DIGEST_STATE_COUNTS[s]} ${PROGRESS_STATE_WORDS[s]}`).join(', ')}`,
  partial: `${progressStateHeading('partial')} C2: still needs probes 0/1`,
  /** The due list starts with the state's word (the mail adds the count: "Due (1): C1"). */
  dueHeading: progressStateHeading('due'),
} as const;
