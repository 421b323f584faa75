import { AppError } from '../core/errors';
import { parseTemperatureText } from './temperature-log-import';

const base = { timeColumn: 'time', tempColumn: 'soil_5cm', timeZone: 'Europe/Berlin' };

describe('temperature logger files', () => {
  it('when a tab file with ISO times is read, then the instants are kept as written', () => {
    const text = 'time\tsoil_5cm\n2026-05-01T06:00:00+02:00\t8.25\n2026-05-01T07:00:00+02:00\t8.5\n';
    expect(parseTemperatureText({ ...base, text })).toEqual({
      t: ['2026-05-01T04:00:00.000Z', '2026-05-01T05:00:00.000Z'],
      tempC: [8.25, 8.5],
    });
  });

  it('when the autumn hour repeats in local time, then the file order decides which instant each row is', () => {
    // Berlin leaves summer time at 03:00 CEST on 25 October 2026 (EU rule; from memory): 02:30 happens twice.
    const text = 'time;soil_5cm\n25.10.2026 02:00:00;9,5\n25.10.2026 02:30:00;9,4\n25.10.2026 02:00:00;9,4\n25.10.2026 02:30:00;9,3\n';
    const read = parseTemperatureText({ ...base, text });
    expect(read.t).toEqual([
      '2026-10-25T00:00:00.000Z',
      '2026-10-25T00:30:00.000Z',
      '2026-10-25T01:00:00.000Z',
      '2026-10-25T01:30:00.000Z',
    ]);
    expect(read.tempC).toEqual([9.5, 9.4, 9.4, 9.3]);
  });

  it('when lines cannot be read, then nothing is imported and each bad line is named', () => {
    const text = 'time,soil_5cm\n2026-05-01 06:00:00,8.2\nnot a time,8.3\n2026-05-01 08:00:00,warm\n';
    try {
      parseTemperatureText({ ...base, text });
      throw new Error('expected a refusal');
    } catch (err) {
      expect(err).toBeInstanceOf(AppError);
      expect((err as AppError).fields?.map((f) => f.message.split(':')[0])).toEqual(['Line 3', 'Line 4']);
    }
  });

  it('when a hostile file has a huge cell or header, then the refusal quotes it shortened and answers at once', () => {
    for (const text of [`time,soil_5cm\n${' '.repeat(800_000)}x,8.2\n`, `time,${'('.repeat(800_000)}\n2026-05-01 06:00:00,8.2\n`]) {
      const started = Date.now();
      try {
        parseTemperatureText({ ...base, text });
        throw new Error('expected a refusal');
      } catch (err) {
        expect(err).toBeInstanceOf(AppError);
        expect(JSON.stringify({ m: (err as AppError).message, f: (err as AppError).fields }).length).toBeLessThan(2000);
      }
      expect(Date.now() - started).toBeLessThan(500);
    }
  });
});
