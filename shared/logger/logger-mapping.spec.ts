import { H2O_UNITS, mappingFits, plainExportMapping, savedMapping, suggestMapping, type LoggerMapping } from './logger-mapping';

const base = { delimiter: ',', decimalComma: false, headerRow: 0 } as const;
const guess = (headers: string[]) => suggestMapping(headers, base, 'UTC')!;

describe('column guesses from header names', () => {
  it('when a column is named "report", "obs" or "port", then none of them is taken for the closure id', () => {
    for (const name of ['report', 'obs', 'port', 'Report No', 'label']) {
      expect(guess(['timestamp', 'co2_ppm', name]).closureId).toBeNull();
    }
  });

  it('when a column is named with our word closure, then it is the closure id; our plain name wins over it', () => {
    expect(guess(['timestamp', 'co2_ppm', 'Closure no']).closureId).toEqual({ column: 2 });
    expect(guess(['timestamp', 'closure_label', 'co2_ppm', 'closure_id']).closureId).toEqual({ column: 3 });
  });

  it('when water vapour is guessed, then its unit is mmol/mol, the unit the engine works in', () => {
    expect(guess(['time_s', 'co2_ppm', 'h2o_mmol_mol']).h2o).toEqual({ column: 2, unit: 'mmol/mol' });
    expect(H2O_UNITS['mmol/mol']).toBe(1);
    expect(Object.keys(H2O_UNITS).some((u) => /ppt/.test(u))).toBe(false);
  });
});

describe('mappings saved on the device', () => {
  const saved = {
    ...base,
    time: { kind: 'elapsed', column: 0, unit: 's' },
    co2: { column: 1, unit: 'µmol/mol (ppm)' },
    h2o: { column: 2, unit: 'mmol/mol (ppt)' },
    pressure: null,
    temp: null,
    closureId: { column: 3 },
  };

  it('when a saved mapping names water vapour in mmol/mol by its earlier label, then it reads as mmol/mol and keeps its closure id column', () => {
    const m = savedMapping(saved)!;
    expect(m.h2o).toEqual({ column: 2, unit: 'mmol/mol' });
    expect(m.closureId).toEqual({ column: 3 });
  });

  it('when nothing was saved, then there is no mapping; a current one is returned as it is', () => {
    expect(savedMapping(null)).toBeNull();
    const current = { ...saved, h2o: { column: 2, unit: '% (mol/mol)' } } as LoggerMapping;
    expect(savedMapping(current)).toBe(current);
  });
});

describe('when a saved mapping is used without asking', () => {
  const headers = ['Zeit', 'CO2', 'H2O', 'Temp'];
  const layout = { ...base, headers };
  const saved: LoggerMapping = {
    ...base,
    time: { kind: 'timestamp', column: 0, format: 'DD.MM.YYYY HH:mm:ss', timeZone: 'Europe/Berlin' },
    co2: { column: 1, unit: 'µmol/mol (ppm)' },
    h2o: null,
    pressure: null,
    temp: { column: 3, unit: '°C' },
    closureId: null,
    headers,
  };

  it('when the file has the same delimiter, header row and header names, then the saved mapping fits', () => {
    expect(mappingFits(saved, layout)).toBe(true);
    expect(mappingFits(saved, { ...layout, headers: headers.map((h) => ` ${h} `) })).toBe(true);
  });

  it('when the names, their number, the delimiter or the header row differ, then it does not fit', () => {
    expect(mappingFits(saved, { ...layout, headers: ['Zeit', 'CO2', 'H2O', 'Cell_T'] })).toBe(false);
    expect(mappingFits(saved, { ...layout, headers: [...headers, 'Extra'] })).toBe(false);
    expect(mappingFits(saved, { ...layout, delimiter: ';' })).toBe(false);
    expect(mappingFits(saved, { ...layout, headerRow: 2 })).toBe(false);
    expect(mappingFits(null, layout)).toBe(false);
  });

  it('when an older mapping kept no header names, then it fits only while every mapped column exists', () => {
    const old = { ...saved, headers: undefined };
    expect(mappingFits(old, { ...layout, headers: ['a', 'b', 'c', 'd'] })).toBe(true);
    expect(mappingFits(old, { ...layout, headers: ['a', 'b', 'c'] })).toBe(false);
  });

  it('when every header is one of our plain export names, then the file needs no mapping; any other name needs the crew', () => {
    const m = plainExportMapping(['timestamp', 'co2_ppm', 'h2o_mmol_mol', 'pressure_kpa', 'temp_c'], base, 'Europe/Berlin');
    expect(m).toMatchObject({ time: { kind: 'timestamp', column: 0, timeZone: 'Europe/Berlin' }, co2: { column: 1 }, temp: { column: 4 } });
    expect(plainExportMapping(['timestamp', 'co2_ppm', 'Cell_Temp'], base, 'UTC')).toBeNull();
    expect(plainExportMapping(['Zeit', 'CO2'], base, 'UTC')).toBeNull();
  });
});
