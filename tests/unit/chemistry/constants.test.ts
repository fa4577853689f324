import { describe, expect, it } from 'vitest';
import {
  CACO3_FACTOR_EQUIVALENT_WEIGHT,
  CACO3_FACTOR_STANDARD_METHODS,
  CACO3_MG_PER_EQ,
  CACO3_MG_PER_MOL,
  ENDPOINT_PH,
  EQUIVALENT_WEIGHT,
  MOLAR_MASS,
  kelvin,
} from '@shared/chemistry/constants';

describe('method constants', () => {
  it.each([
    ['CaCO3 factor (SM 2320 B)', CACO3_FACTOR_STANDARD_METHODS, 50000],
    ['CaCO3 factor from 50.04 mg/meq, the laboratory option (computed from SM 2320 B)', CACO3_FACTOR_EQUIVALENT_WEIGHT, 50044],
    ['CaCO3 equivalent weight, mg/meq (SM 2320 B; NFM A6.6.5.A)', EQUIVALENT_WEIGHT.CaCO3, 50.04],
    ['mg CaCO3 per eq of the equilibrium method (NFM 6.6.5.B)', CACO3_MG_PER_EQ, 50040],
    ['mg CaCO3 per mol (SM 2330)', CACO3_MG_PER_MOL, 100090],
    ['Na2CO3 equivalent weight in the solution formula (SM 2320 B ¶3)', EQUIVALENT_WEIGHT.Na2CO3StandardMethods, 53.0],
    ['KHP equivalent weight in the solution formula (SM 2310 B ¶3)', EQUIVALENT_WEIGHT.KHPStandardMethods, 204.2],
    ['P endpoint pH (SM 2320 B)', ENDPOINT_PH.phenolphthalein, 8.3],
    ['routine T endpoint pH (40 CFR 136.3 Table IB)', ENDPOINT_PH.routineTotal, 4.5],
    ['mineral acidity endpoint pH (SM 2310 B)', ENDPOINT_PH.mineralAcidity, 3.7],
    ['total acidity endpoint pH (SM 2310 B)', ENDPOINT_PH.totalAcidity, 8.3],
  ])('%s = %f', (_name, value, expected) => {
    expect(value).toBe(expected);
  });

  it('CaCO3 takes 2 H+, so its equivalent weight is half its molar mass, 100.09/2 → 50.04 (SM 2320 B)', () => {
    expect(Math.abs(MOLAR_MASS.CaCO3 / 2 - EQUIVALENT_WEIGHT.CaCO3)).toBeLessThan(0.01);
  });

  it('Na2CO3 takes 2 H+ to reach H2CO3 and KHP gives 1: equivalent weights 105.99/2 and 204.22 (SM 2320 B ¶3; SM 2310 B ¶3)', () => {
    expect(Math.abs(MOLAR_MASS.Na2CO3 / 2 - EQUIVALENT_WEIGHT.Na2CO3)).toBeLessThan(0.005);
    expect(EQUIVALENT_WEIGHT.KHP).toBe(MOLAR_MASS.KHP);
  });

  it('T(K) = t(°C) + 273.15', () => {
    expect(kelvin(25)).toBeCloseTo(298.15, 12);
    expect(kelvin(0)).toBe(273.15);
  });
});
