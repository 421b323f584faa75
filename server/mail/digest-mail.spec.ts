import { FLAG_ADVICE } from '../../shared/flux/flag-advice';
import { PROGRESS_STATE_WORDS, PROGRESS_STATES, progressStateHeading } from '../../shared/model/progress-state';
import type { Digest } from './digest-content';
import { digestMail } from './digest-mail';

const digest = (over: Partial<Digest> = {}): Digest => ({
  site: { id: 's', name: 'Hollow Creek Meadow', timezone: 'Pacific/Auckland' },
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
          complete: 3,
          skipped: 4,
        },
      ],
    },
  ],
  anomalies: { total: 0, problems: 0, items: [] },
  silentDevices: [],
  ...over,
});

describe('digest mail words', () => {
  it('when the mail counts collars per route, then each count carries the word of the shared state table', () => {
    const { text } = digestMail(digest(), 'lead@fluxwalk.example', 'Lee', null);
    const counts = { due: 1, partial: 2, complete: 3, skipped: 4 };
    expect(text).toContain(`North loop: ${PROGRESS_STATES.map((s) => `${counts[s]} ${PROGRESS_STATE_WORDS[s]}`).join(', ')}.`);
    expect(text).toContain(`${progressStateHeading('due')} (1): C1`);
    expect(text).toContain(`${progressStateHeading('partial')} C2: still needs probes 0/1`);
  });

  it('when a flagged closure is listed, then the mail says what happened in words, not the flag code', () => {
    const { text } = digestMail(
      digest({
        anomalies: {
          total: 1,
          problems: 0,
          items: [
            {
              kind: 'closure-flag',
              severity: 'warn',
              collarId: 'k',
              collarCode: 'C7',
              recordId: 'z',
              at: '2026-05-03T22:00:00.000Z',
              value: -0.4,
              threshold: null,
              flags: ['negative-flux'],
              message: `Closure flagged: ${FLAG_ADVICE['negative-flux'].words}`,
            },
          ],
        },
      }),
      'lead@fluxwalk.example',
      'Lee',
      null,
    );
    expect(text).toContain(FLAG_ADVICE['negative-flux'].words);
    expect(text).not.toContain('negative-flux');
  });

  it('when a device has been silent, then its last contact reads in the site’s zone (naming it), not in UTC', () => {
    // 2026-05-03 22:30 UTC is 2026-05-04 10:30 in Auckland (NZST, UTC+12 in May).
    const { text } = digestMail(
      digest({ silentDevices: [{ displayName: 'Rowan', email: 'r@x', lastSeenAt: '2026-05-03T22:30:00.000Z', outboxSize: 2 }] }),
      'lead@fluxwalk.example',
      'Lee',
      null,
    );
    expect(text).toContain('last heard 2026-05-04 10:30 NZST');
    expect(text).not.toContain('UTC');
  });
});
