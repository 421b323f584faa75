import { instantsForWallTime, readTimestamp, wallTimeMs } from './zoned-time';

// Zone rules (EU summer time ends/starts at 01:00 UTC on the last Sunday of October/March) are
// those of the IANA tz database as the runtime's Intl gives them.
describe('timestamps in a site time zone', () => {
  it('when a wall time falls in the hour the clocks skip in spring, then it is refused with a reason', () => {
    const r = readTimestamp('2025-03-30 02:30:00', 'YYYY-MM-DD HH:mm:ss', 'Europe/Berlin');
    expect(r.ok).toBe(false);
    expect(!r.ok && r.message).toMatch(/does not exist in Europe\/Berlin/);
  });

  it('when a wall time falls in the repeated autumn hour, then both instants exist and the previous row picks one', () => {
    const wall = wallTimeMs('2025-10-26 02:30:00', 'YYYY-MM-DD HH:mm:ss')!;
    expect(instantsForWallTime(wall, 'Europe/Berlin').map((t) => new Date(t).toISOString())).toEqual([
      '2025-10-26T00:30:00.000Z',
      '2025-10-26T01:30:00.000Z',
    ]);
    const afterChange = readTimestamp('2025-10-26 02:30:00', 'YYYY-MM-DD HH:mm:ss', 'Europe/Berlin', Date.parse('2025-10-26T01:20:00Z'));
    expect(afterChange).toEqual({ ok: true, ms: Date.parse('2025-10-26T01:30:00Z') });
  });

  it('when a day-first format names 31 February, then the row is refused instead of rolling into March', () => {
    expect(readTimestamp('31.02.2025 10:00:00', 'DD.MM.YYYY HH:mm:ss', 'UTC').ok).toBe(false);
  });

  it('when seconds carry a decimal comma, then the fraction is kept', () => {
    expect(readTimestamp('2025-06-01 12:00:01,5', 'YYYY-MM-DD HH:mm:ss', 'UTC')).toEqual({
      ok: true,
      ms: Date.parse('2025-06-01T12:00:01.500Z'),
    });
  });

  it('when a time carries its own offset, then the zone is not applied again', () => {
    expect(readTimestamp('2025-06-01T12:00:00+02:00', 'ISO-8601 with offset', 'America/Chicago')).toEqual({
      ok: true,
      ms: Date.parse('2025-06-01T10:00:00Z'),
    });
  });
});

describe('wall times without seconds', () => {
  it('when a logger drops zero seconds, then "YYYY-MM-DD HH:mm" reads as HH:mm:00 in the zone', () => {
    // Berlin is UTC+2 in July (CEST): EU summer-time rule (common knowledge, from memory).
    expect(readTimestamp('2026-07-01 00:00', 'YYYY-MM-DD HH:mm:ss', 'Europe/Berlin')).toEqual({
      ok: true,
      ms: Date.UTC(2026, 5, 30, 22, 0, 0),
    });
    expect(readTimestamp('2026-07-01 00', 'YYYY-MM-DD HH:mm:ss', 'Europe/Berlin').ok).toBe(false);
  });
});
