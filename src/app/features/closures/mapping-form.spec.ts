import type { LoggerMapping } from '../../../../shared/logger';
import { mappingForm, mappingOf, mappingValue } from './mapping-form';

const layout = { delimiter: ';', decimalComma: true, headerRow: 2 } as const;
const headers = ['timestamp', 'co2_ppm', 'h2o_mmol_mol', 'pressure_kpa', 'temp_c', 'closure_id'];

describe('the column mapping as a typed form', () => {
  it('when a saved timestamp mapping is shown and read back unchanged, then it is the same mapping', () => {
    const saved: LoggerMapping = {
      ...layout,
      time: { kind: 'timestamp', column: 0, format: 'DD.MM.YYYY HH:mm:ss', timeZone: 'Europe/Berlin' },
      co2: { column: 1, unit: 'mmol/mol', dry: true },
      h2o: { column: 2, unit: '% (mol/mol)' },
      pressure: { column: 3, unit: 'hPa' },
      temp: { column: 4, unit: 'K' },
      closureId: { column: 5 },
      headers,
    };
    const form = mappingForm();
    form.setValue(mappingValue(saved, 'UTC'));
    expect(mappingOf(form.getRawValue(), layout, headers)).toEqual(saved);
  });

  it('when an elapsed-time mapping without optional columns is shown, then the columns read "not in this file" and come back as none; a timestamp would start in the site zone', () => {
    const saved: LoggerMapping = {
      ...layout,
      time: { kind: 'elapsed', column: 0, unit: 'min' },
      co2: { column: 1, unit: 'µmol/mol (ppm)' },
      h2o: null,
      pressure: null,
      temp: null,
      closureId: null,
      headers,
    };
    const v = mappingValue(saved, 'Pacific/Auckland');
    expect(v).toMatchObject({ h2oColumn: -1, pressureColumn: -1, tempColumn: -1, closureIdColumn: -1, co2Dry: false });
    expect(v.timeZone).toBe('Pacific/Auckland');
    // "Already dry" unticked leaves the field out, as a mapping that never had it.
    expect(mappingOf(v, layout, headers)).toEqual(saved);
    expect(mappingOf({ ...v, timeKind: 'timestamp' }, layout, headers).time).toEqual({
      kind: 'timestamp',
      column: 0,
      format: 'YYYY-MM-DD HH:mm:ss',
      timeZone: 'Pacific/Auckland',
    });
  });
});
