import { plotFields } from './site-layout';

const base = { siteId: '0f3c2a9e-5b1d-4c7e-9a2f-6d8e1b4c7a10', code: 'P1' };

describe('plot outlines', () => {
  it('when the ring is closed with four positions, then the outline is accepted (RFC 7946 §3.1.6)', () => {
    const outline = {
      type: 'Polygon',
      coordinates: [
        [
          [10, 51],
          [10.001, 51],
          [10.001, 51.001],
          [10, 51],
        ],
      ],
    };
    expect(plotFields.safeParse({ ...base, outline }).success).toBe(true);
  });

  it('when the ring is open or too short, then the outline is refused with a message', () => {
    const open = {
      type: 'Polygon',
      coordinates: [
        [
          [10, 51],
          [10.001, 51],
          [10.001, 51.001],
          [10, 51.001],
        ],
      ],
    };
    const short = {
      type: 'Polygon',
      coordinates: [
        [
          [10, 51],
          [10.001, 51],
          [10, 51],
        ],
      ],
    };
    for (const outline of [open, short]) {
      const r = plotFields.safeParse({ ...base, outline });
      expect(r.success).toBe(false);
      expect(r.error?.issues[0].message).toMatch(/closed/);
    }
  });
});
