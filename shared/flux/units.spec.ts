import { convertFlux } from './units';

describe('flux unit conversion (IUPAC conventional molar masses C 12.011, CO2 44.009 g mol⁻¹)', () => {
  it('converts 1 µmol m⁻² s⁻¹ to 1.0377504 g C m⁻² d⁻¹ and 0.1584324 g CO2 m⁻² h⁻¹ (REFERENCES.md §7)', () => {
    expect(convertFlux(1, 'g_c_m2_d')).toBeCloseTo(1.0377504, 7);
    expect(convertFlux(1, 'g_co2_m2_h')).toBeCloseTo(0.1584324, 7);
    expect(convertFlux(1, 'mg_co2_m2_h')).toBeCloseTo(158.4324, 4);
  });

  it('is linear, so a negative flux stays negative', () => {
    expect(convertFlux(-2.5, 'g_c_m2_d')).toBeCloseTo(-2.594376, 6);
    expect(convertFlux(3.2, 'umol_m2_s')).toBe(3.2);
  });
});
