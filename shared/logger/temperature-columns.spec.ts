import { suggestMapping } from './logger-mapping';
import { guessLayout } from './logger-text';
import { temperatureColumns, temperatureKind } from './temperature-columns';

describe('Temperature columns of a logger file', () => {
  it('names chamber, internal and unclear temperature columns from their headers', () => {
    expect(temperatureKind('Chamber Temp (C)')).toBe('chamber');
    expect(temperatureKind('air_temp')).toBe('chamber');
    expect(temperatureKind('temp_c')).toBe('chamber');
    expect(temperatureKind('Cell temperature')).toBe('internal');
    expect(temperatureKind('IRGA_T')).toBe('internal');
    expect(temperatureKind('Temp')).toBe('unknown');
    expect(temperatureKind('co2_ppm')).toBeNull();
  });

  it('when a file has only the analyzer’s cell temperature, then the guess leaves the chamber temperature empty and lists the column with its range', () => {
    const text = 'time_s,co2_ppm,cell_temp\n0,420.1,51.2\n1,420.6,51.0\n2,421.0,50.9\n';
    const layout = guessLayout(text);
    const m = suggestMapping(layout.headers, layout, 'UTC')!;
    expect(m.temp).toBeNull();
    expect(temperatureColumns(text, layout)).toEqual([{ column: 2, header: 'cell_temp', kind: 'internal', min: 50.9, max: 51.2 }]);
  });

  it('when a file has a chamber air column beside the cell temperature, then the chamber one is guessed whatever the order', () => {
    const text = 'time_s;co2_ppm;Temp;T_cell;T_air\n0;420,1;21,5;51,2;18,4\n1;420,6;21,6;51,0;18,5\n';
    const layout = guessLayout(text);
    expect(suggestMapping(layout.headers, layout, 'UTC')!.temp).toEqual({ column: 4, unit: '°C' });
    expect(temperatureColumns(text, layout).map((c) => [c.header, c.kind, c.min, c.max])).toEqual([
      ['Temp', 'unknown', 21.5, 21.6],
      ['T_cell', 'internal', 51, 51.2],
      ['T_air', 'chamber', 18.4, 18.5],
    ]);
  });
});
