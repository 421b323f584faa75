import { localHourFormatter, localNoonFormatter } from './season-days';

// Zone offsets from the IANA time zone database (via Intl): Central European Time UTC+1, summer time UTC+2
// from the last Sunday of March; Pacific Daylight Time UTC−7.
describe("local noon and local hour in the site's zone", () => {
  it("when a day starts or ends summer time, then noon is read with that day's own offset", () => {
    const noon = localNoonFormatter('Europe/Berlin');
    expect(new Date(noon('2026-03-28')).toISOString()).toBe('2026-03-28T11:00:00.000Z');
    expect(new Date(noon('2026-03-29')).toISOString()).toBe('2026-03-29T10:00:00.000Z');
    expect(new Date(noon('2026-10-25')).toISOString()).toBe('2026-10-25T11:00:00.000Z');
    expect(new Date(localNoonFormatter('America/Los_Angeles')('2026-06-02')).toISOString()).toBe('2026-06-02T19:00:00.000Z');
    expect(new Date(localNoonFormatter('UTC')('2026-06-02')).toISOString()).toBe('2026-06-02T12:00:00.000Z');
  });

  it('when a visit is at 05:30 UTC in UTC−7, then its local hour is 22.5 (night, not morning)', () => {
    expect(localHourFormatter('America/Los_Angeles')('2026-06-02T05:30:00Z')).toBe(22.5);
    expect(localHourFormatter('Europe/Berlin')('2026-06-02T07:15:00Z')).toBe(9.25);
  });
});
