import { H2O_UNITS, savedMapping, suggestMapping, type LoggerMapping } from './logger-mapping';

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
  const saved = { ...base, time: { kind: 'elapsed', column: 0, unit: 's' }, co2: { column: 1, unit: 'µmol/mol (ppm)' },
    h2o: { column: 2, unit: 'mmol/mol (ppt)' }, pressure: null, temp: null, closureId: { column: 3 } };

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
