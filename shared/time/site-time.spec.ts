import { formatSiteTime, localDay, siteDayStart, siteDayStartOf, siteIsoLocal, siteToday } from './site-time';

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

describe('start of the site day', () => {
  it('when the site is in Auckland, then its day starts at its own midnight (11:00 or 12:00 UTC the day before), not the device’s', () => {
    // NZST UTC+12 in June; NZDT UTC+13 in January (tz database).
    expect(siteDayStartOf('2026-06-02', 'Pacific/Auckland')).toBe('2026-06-01T12:00:00.000Z');
    expect(siteDayStartOf('2026-01-15', 'Pacific/Auckland')).toBe('2026-01-14T11:00:00.000Z');
    // 20:00 UTC on 1 June is already 2 June in Auckland.
    expect(siteDayStart('Pacific/Auckland', new Date('2026-06-01T20:00:00Z'))).toBe('2026-06-01T12:00:00.000Z');
    expect(siteDayStart('America/Anchorage', new Date('2026-07-02T03:30:00Z'))).toBe('2026-07-01T08:00:00.000Z');
  });

  it('when the clocks change that day, then the day still starts at its midnight in the offset before the change', () => {
    // Berlin switches at 02:00 CET on 2026-03-29: midnight is still CET (UTC+1).
    expect(siteDayStartOf('2026-03-29', 'Europe/Berlin')).toBe('2026-03-28T23:00:00.000Z');
    expect(siteDayStartOf('2026-10-25', 'Europe/Berlin')).toBe('2026-10-24T22:00:00.000Z');
  });

  it('when the clocks skip midnight, then the day starts at the first instant that is on it', () => {
    // America/Santiago moves from 00:00 to 01:00 on 2026-09-06 (UTC−4 → UTC−3, tz database):
    // the day starts at 01:00 UTC−3 = 04:00 UTC.
    const start = siteDayStartOf('2026-09-06', 'America/Santiago');
    expect(start).toBe('2026-09-06T04:00:00.000Z');
    expect(localDay(start, 'America/Santiago')).toBe('2026-09-06');
    expect(localDay(new Date(Date.parse(start) - 1), 'America/Santiago')).toBe('2026-09-05');
  });
});
