import { FLAG_ADVICE } from '../../shared/flux/flag-advice';
import { DIGEST_STATE_LINES, digestWithStateCounts } from '../../shared/model/testing/digest-words';
import type { Digest } from '../../shared/board/board-wire';
import { digestMail } from './digest-mail';

const digest = (over: Partial<Digest> = {}): Digest => ({
  ...digestWithStateCounts({ id: 's', name: 'Hollow Creek Meadow', timezone: 'Pacific/Auckland' }),
  ...over,
});

describe('digest mail words', () => {
  it('when the mail counts collars per route, then each count carries the word of the shared state table', () => {
    const { text } = digestMail(digest(), 'lead@fluxwalk.example', 'Lee', null);
    expect(text).toContain(`${DIGEST_STATE_LINES.counts}.`);
    expect(text).toContain(`${DIGEST_STATE_LINES.dueHeading} (1): C1`);
    expect(text).toContain(DIGEST_STATE_LINES.partial);
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
