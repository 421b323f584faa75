import { pgDay } from './pg-day';

describe('pgDay', () => {
  it('when the driver gives a date as local midnight, then the day is read from its local fields', () => {
    // node-postgres parses `date` as new Date(y, m, d): local midnight of the process's zone.
    expect(pgDay(new Date(2026, 5, 14))).toBe('2026-06-14');
    expect(pgDay(new Date(2026, 11, 31))).toBe('2026-12-31');
  });

  it('when the value is already text (a cast in SQL), then its day part is kept', () => {
    expect(pgDay('2026-06-14')).toBe('2026-06-14');
  });
});
