import { clockOffsetS } from './start-of-day-items';

describe('analyzer clock offset', () => {
  it('when the analyzer shows the site’s wall time, then the offset is against the site’s clock, not the phone’s zone', () => {
    // 21:58:00 UTC on 4 December is 10:58:00 on 5 December in Auckland (NZDT, UTC+13); the device runs in UTC.
    const now = new Date('2026-12-04T21:58:00.000Z');
    expect(clockOffsetS('10:58:05', now, 'Pacific/Auckland')).toBe(5);
    expect(clockOffsetS('10:57:30', now, 'Pacific/Auckland')).toBe(-30);
  });

  it('when the two clocks sit either side of the site’s midnight, then the offset goes the short way round', () => {
    // 11:00:10 UTC on 4 December is 00:00:10 on 5 December in Auckland.
    expect(clockOffsetS('23:59:50', new Date('2026-12-04T11:00:10.000Z'), 'Pacific/Auckland')).toBe(-20);
  });
});
