import { formatSiteTime, localDay, siteIsoLocal, siteToday } from './site-time';

// Expected values are the IANA tz database's rules (tzdata, read through the runtime's Intl):
// Europe/Berlin CET+1/CEST+2 switching on the last Sundays of March and October at 01:00 UTC;
// America/Anchorage AKST−9/AKDT−8 (second Sunday of March, first Sunday of November, 02:00 local);
// Pacific/Auckland NZST+12/NZDT+13 (last Sunday of September, first Sunday of April).
describe('site time', () => {
  it('Berlin spring change (2026-03-29): 00:59 UTC is 01:59 CET, 01:00 UTC is 03:00 CEST', () => {
    expect(formatSiteTime('2026-03-29T00:59:00Z', 'Europe/Berlin')).toBe('2026-03-29 01:59 CET');
    expect(formatSiteTime('2026-03-29T01:00:00Z', 'Europe/Berlin')).toBe('2026-03-29 03:00 CEST');
    expect(siteIsoLocal('2026-03-29T01:00:00Z', 'Europe/Berlin')).toBe('2026-03-29T03:00:00+02:00');
  });

  it('Berlin autumn change (2026-10-25): the repeated 02:30 is told apart by the zone', () => {
    expect(formatSiteTime('2026-10-25T00:30:00Z', 'Europe/Berlin')).toBe('2026-10-25 02:30 CEST');
    expect(formatSiteTime('2026-10-25T01:30:00Z', 'Europe/Berlin')).toBe('2026-10-25 02:30 CET');
    expect(siteIsoLocal('2026-10-25T01:30:00Z', 'Europe/Berlin')).toBe('2026-10-25T02:30:00+01:00');
  });

  it('Berlin local day: 23:30 UTC in summer is already the next day', () => {
    expect(localDay('2026-07-01T22:30:00Z', 'Europe/Berlin')).toBe('2026-07-02');
    expect(localDay('2026-07-01T21:30:00Z', 'Europe/Berlin')).toBe('2026-07-01');
  });

  it('Anchorage names its zone and its day lags UTC by 8 or 9 hours', () => {
    expect(formatSiteTime('2026-07-02T07:00:00Z', 'America/Anchorage')).toBe('2026-07-01 23:00 AKDT');
    expect(formatSiteTime('2026-01-02T08:00:00Z', 'America/Anchorage')).toBe('2026-01-01 23:00 AKST');
    expect(localDay('2026-01-02T08:59:00Z', 'America/Anchorage')).toBe('2026-01-01');
    expect(localDay('2026-01-02T09:00:00Z', 'America/Anchorage')).toBe('2026-01-02');
    // 2026-03-08 02:00 AKST → 03:00 AKDT (11:00 UTC)
    expect(siteIsoLocal('2026-03-08T11:00:00Z', 'America/Anchorage')).toBe('2026-03-08T03:00:00-08:00');
    expect(siteIsoLocal('2026-03-08T10:59:00Z', 'America/Anchorage')).toBe('2026-03-08T01:59:00-09:00');
  });

  it('Auckland is a calendar day ahead of UTC across the date line, with its own DST', () => {
    expect(siteToday('Pacific/Auckland', Date.parse('2026-06-30T12:00:00Z'))).toBe('2026-07-01');
    expect(siteToday('Pacific/Auckland', Date.parse('2026-06-30T11:59:00Z'))).toBe('2026-06-30');
    expect(siteIsoLocal('2026-01-15T00:00:00Z', 'Pacific/Auckland')).toBe('2026-01-15T13:00:00+13:00');
    // NZDT ends 2026-04-05 03:00 NZDT → 02:00 NZST (14:00 UTC on the 4th)
    expect(siteIsoLocal('2026-04-04T13:59:00Z', 'Pacific/Auckland')).toBe('2026-04-05T02:59:00+13:00');
    expect(siteIsoLocal('2026-04-04T14:00:00Z', 'Pacific/Auckland')).toBe('2026-04-05T02:00:00+12:00');
  });

  it('"today" is the site day, not the UTC day, near midnight', () => {
    const now = Date.parse('2026-07-01T23:30:00Z');
    expect(siteToday('UTC', now)).toBe('2026-07-01');
    expect(siteToday('Europe/Berlin', now)).toBe('2026-07-02');
    expect(siteToday('America/Anchorage', now)).toBe('2026-07-01');
  });

  it('zones are named by their letters where a locale has them, else by the offset', () => {
    expect(formatSiteTime('2026-01-15T00:00:00Z', 'Pacific/Auckland', { timeOnly: true })).toBe('13:00 NZDT');
    expect(formatSiteTime('2026-07-15T00:00:00Z', 'Pacific/Auckland', { timeOnly: true })).toBe('12:00 NZST');
    expect(formatSiteTime('2026-07-15T00:00:00Z', 'Europe/London', { timeOnly: true })).toBe('01:00 BST');
    expect(formatSiteTime('2026-07-15T00:00:00Z', 'Asia/Kathmandu', { timeOnly: true })).toBe('05:45 GMT+5:45');
  });

  it('no time shows as nothing, and time-only keeps the zone', () => {
    expect(formatSiteTime(null, 'UTC')).toBe('');
    expect(formatSiteTime('not a time', 'UTC')).toBe('');
    expect(formatSiteTime('2026-07-01T10:05:09Z', 'UTC', { timeOnly: true, seconds: true })).toBe('10:05:09 UTC');
  });
});
