import { collarSettling, newestDisturbance, siteDaysSince, siteSettlingLimits } from './collar-settling';

// Collar insertion cuts roots and disturbs the soil, so closures right after an install or a reseat
// read high: waiting at least a day, better about a week, is common practice (from memory; the
// site sets both limits: settlingDaysHard, settlingDaysWarn).
const limits = { settlingDaysHard: 2, settlingDaysWarn: 7 };
const NOON_UTC = new Date('2026-06-15T12:00:00Z');

describe('siteDaysSince', () => {
  it('when the site’s day is ahead of UTC, then the days count by the site’s calendar', () => {
    // 20:00 UTC on 14 June is 08:00 on 15 June in Auckland (NZST, UTC+12).
    expect(siteDaysSince('2026-06-14', 'Pacific/Auckland', new Date('2026-06-14T20:00:00Z'))).toBe(1);
    expect(siteDaysSince('2026-06-14', 'UTC', new Date('2026-06-14T20:00:00Z'))).toBe(0);
  });

  it('when the site’s day is behind UTC, then a day has not passed before the site’s midnight', () => {
    // 11:00 UTC on 15 June is 01:00 on 15 June in Honolulu (HST, UTC−10); 09:00 UTC is still the 14th there.
    expect(siteDaysSince('2026-06-15', 'Pacific/Honolulu', new Date('2026-06-15T11:00:00Z'))).toBe(0);
    expect(siteDaysSince('2026-06-14', 'Pacific/Honolulu', new Date('2026-06-15T09:00:00Z'))).toBe(0);
  });

  it('when a clock change falls between, then whole calendar days still count (no 23- or 25-hour drift)', () => {
    // Europe/Berlin springs forward on 29 March 2026: 28 March to 30 March is two days at 00:30 local.
    expect(siteDaysSince('2026-03-28', 'Europe/Berlin', new Date('2026-03-29T22:30:00Z'))).toBe(2);
  });
});

describe('newestDisturbance', () => {
  const event = (kind: string, date: string, deleted = false) => ({ kind, date, deleted });

  it('when a reseat is newer than the install, then it is the newest; clipping and deleted events do not count', () => {
    const events = [
      event('installed', '2026-03-01'),
      event('reseated', '2026-06-12'),
      event('clipped', '2026-06-14'),
      event('reseated', '2026-06-13', true),
    ];
    expect(newestDisturbance(events, '2026-03-01')).toEqual({ date: '2026-06-12', what: 'reseated' });
  });

  it('when the collar only has an install date, then that is the disturbance; without either there is none', () => {
    expect(newestDisturbance([], '2026-06-01')).toEqual({ date: '2026-06-01', what: 'installed' });
    expect(newestDisturbance([event('damaged', '2026-06-10')], null)).toBeNull();
  });
});

describe('collarSettling', () => {
  it('when the disturbance is within the hard limit, then closures should wait', () => {
    expect(collarSettling({ date: '2026-06-14', what: 'installed' }, limits, 'UTC', NOON_UTC)).toEqual({
      level: 'hard',
      days: 1,
      since: '2026-06-14',
      what: 'installed',
    });
  });

  it('when past the hard but within the warning limit, then it is a warning; at the warning limit there is no note', () => {
    expect(collarSettling({ date: '2026-06-12', what: 'reseated' }, limits, 'UTC', NOON_UTC)).toMatchObject({ level: 'warn', days: 3 });
    expect(collarSettling({ date: '2026-06-08', what: 'installed' }, limits, 'UTC', NOON_UTC)).toBeNull(); // 7 days: not < 7
    expect(collarSettling(null, limits, 'UTC', NOON_UTC)).toBeNull();
  });

  it('when a site record lacks the limits, then the schema’s one day (hard) and seven days (warning) apply', () => {
    const defaults = siteSettlingLimits.parse({});
    expect(defaults).toEqual({ settlingDaysHard: 1, settlingDaysWarn: 7 });
    const at = (date: string) => collarSettling({ date, what: 'installed' }, defaults, 'UTC', NOON_UTC)?.level ?? null;
    expect([at('2026-06-15'), at('2026-06-14'), at('2026-06-09'), at('2026-06-08')]).toEqual(['hard', 'warn', 'warn', null]);
  });
});
