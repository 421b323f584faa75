import { CO2_UNITS, ELAPSED_UNITS, H2O_UNITS, PRESSURE_UNITS, tempToC } from './logger-mapping';

/**
 * Logger unit factors against NIST Special Publication 811, 2008 edition (Thompson, A., Taylor,
 * B.N., Guide for the Use of the International System of Units (SI)), Appendix B.8 "Factors for
 * units listed alphabetically" and B.9 / §4.2.1.1 (temperature), and the SI prefixes (§4.3 and
 * Table 5: h = 10², µ = 10⁻⁶, n = 10⁻⁹) and percent (§7.10.2: % = 0.01). The table values below
 * are cited from memory of that table, not re-read here:
 *   millimeter of mercury, conventional (mmHg) → pascal: 1.333 224 E+02
 *   millibar (mbar) → pascal: 1.0 E+02 (exact)
 *   degree Fahrenheit → degree Celsius: t/°C = (t/°F − 32)/1.8 (exact)
 *   kelvin → degree Celsius: t/°C = T/K − 273.15 (exact)
 *   minute → second: 6.0 E+01 (exact)
 */
const KPA_PER_PA = 1e-3;

describe('logger unit factors (NIST SP 811, 2008, Appendix B.8)', () => {
  it('pressure: mmHg 1.333 224 E+02 Pa (to the table’s 7 digits), mbar and hPa 1.0 E+02 Pa, Pa', () => {
    expect(Math.abs(PRESSURE_UNITS.mmHg / (133.3224 * KPA_PER_PA) - 1)).toBeLessThan(5e-7);
    expect(PRESSURE_UNITS.mbar).toBeCloseTo(100 * KPA_PER_PA, 15);
    expect(PRESSURE_UNITS.hPa).toBeCloseTo(100 * KPA_PER_PA, 15);
    expect(PRESSURE_UNITS.Pa).toBeCloseTo(KPA_PER_PA, 15);
    expect(PRESSURE_UNITS.kPa).toBe(1);
  });

  it('temperature: °F and K to °C by the exact relations', () => {
    expect(tempToC(32, '°F')).toBeCloseTo(0, 12);
    expect(tempToC(212, '°F')).toBeCloseTo(100, 12);
    expect(tempToC(-40, '°F')).toBeCloseTo(-40, 12);
    expect(tempToC(68, '°F')).toBeCloseTo(20, 12);
    expect(tempToC(293.15, 'K')).toBeCloseTo(20, 12);
    expect(tempToC(20, '°C')).toBe(20);
  });

  it('mole fractions: % H2O = 10 mmol/mol, ppm H2O = 0.001 mmol/mol; ppb CO2 = 0.001 µmol/mol, mmol/mol = 1000 µmol/mol', () => {
    expect(H2O_UNITS['% (mol/mol)']).toBeCloseTo(0.01 / 1e-3, 12);
    expect(H2O_UNITS['ppm (µmol/mol)']).toBeCloseTo(1e-6 / 1e-3, 15);
    expect(CO2_UNITS['ppb (nmol/mol)']).toBeCloseTo(1e-9 / 1e-6, 15);
    expect(CO2_UNITS['mmol/mol']).toBeCloseTo(1e-3 / 1e-6, 9);
  });

  it('elapsed time: min = 60 s, ms = 0.001 s', () => {
    expect(ELAPSED_UNITS.min).toBe(60);
    expect(ELAPSED_UNITS.ms).toBe(0.001);
  });
});
