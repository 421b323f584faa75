import { digestDue, localClock } from './local-clock';

describe('local clock for the digest', () => {
  it('when Berlin is on summer time, then 16:00 UTC reads 18:00 there; in winter it reads 17:00', () => {
    // CEST = UTC+2 from the last Sunday of March to the last Sunday of October (EU rule, common knowledge).
    expect(localClock(new Date('2026-07-01T16:00:00Z'), 'Europe/Berlin')).toEqual({ date: '2026-07-01', minutes: 18 * 60 });
    expect(localClock(new Date('2026-12-01T16:00:00Z'), 'Europe/Berlin')).toEqual({ date: '2026-12-01', minutes: 17 * 60 });
  });

  it('when it is already the next day locally, then the local date is that day', () => {
    expect(localClock(new Date('2026-12-01T23:30:00Z'), 'Pacific/Auckland').date).toBe('2026-12-02');
    expect(localClock(new Date('2026-12-01T03:30:00Z'), 'America/Denver').date).toBe('2026-11-30');
  });

  it('when the time is before, at, inside or after the catch-up window, then the digest is due only at and inside it', () => {
    expect(digestDue(17 * 60 + 59, '18:00', 180)).toBe(false);
    expect(digestDue(18 * 60, '18:00', 180)).toBe(true);
    expect(digestDue(20 * 60 + 59, '18:00', 180)).toBe(true);
    expect(digestDue(21 * 60, '18:00', 180)).toBe(false);
  });
});
