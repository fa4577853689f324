/**
 * Fixed constants of the alkalinity and acidity methods. Temperature-dependent equilibrium
 * constants are functions in speciation.ts.
 */

/** CaCO3 factor as Standard Methods writes it: 50 mg/meq × 1000 mL/L [SM 2320 B ¶5]. */
export const CACO3_FACTOR_STANDARD_METHODS = 50_000 as const;
/** CaCO3 factor from the exact equivalent weight (50.04 mg/meq), offered as a laboratory setting [computed from SM 2320 B]. */
export const CACO3_FACTOR_EQUIVALENT_WEIGHT = 50_044 as const;
/** The factors a result may be computed with; the default is the Standard Methods one. */
export const CACO3_FACTORS = [CACO3_FACTOR_STANDARD_METHODS, CACO3_FACTOR_EQUIVALENT_WEIGHT] as const;
export type Caco3Factor = (typeof CACO3_FACTORS)[number];
export const DEFAULT_CACO3_FACTOR: Caco3Factor = CACO3_FACTOR_STANDARD_METHODS;

/** Molar masses, g/mol (= mg/mmol) [SM 2320 B; USGS NFM A6.6.5]. */
export const MOLAR_MASS = {
  CaCO3: 100.09,
  Na2CO3: 105.99,
  KHP: 204.22,
  HCO3: 61.017,
  CO3: 60.009,
  OH: 17.007,
  CO2: 44.01,
  NaOH: 40.0,
} as const;

/** Equivalent weights, g/eq (= mg/meq) [SM 2320 B; SM 2310 B; NFM A6.6.5.A]. */
export const EQUIVALENT_WEIGHT = {
  /** 100.09 / 2; 1 meq/L of alkalinity = 50.04 mg/L as CaCO3 [SM 2320 B; NFM A6.6.5.A]. */
  CaCO3: 50.04,
  /** As written in the solution-standardisation formula N = A×B/(53.00×C) [SM 2320 B ¶3]. */
  Na2CO3StandardMethods: 53.0,
  /** 105.988 / 2 for the direct-weighing form; with 52.99 check 5c would read 0.10002 N. */
  Na2CO3: 52.994,
  /** As written in N = A×B/(204.2×C) [SM 2310 B ¶3]. */
  KHPStandardMethods: 204.2,
  /** KHP is monoprotic: equivalent weight = molar mass [SM 2310 B]. */
  KHP: 204.22,
} as const;

/** mg CaCO3 per equivalent, the eq/L ↔ mg/L as CaCO3 conversion of the equilibrium method [NFM 6.6.5.B; SM 2330]. */
export const CACO3_MG_PER_EQ = 50_040 as const;
/** mg CaCO3 per mole (calcium hardness ↔ mol/L) [SM 2330]. */
export const CACO3_MG_PER_MOL = 100_090 as const;

/** Endpoint pH values fixed by the methods [SM 2320 B; SM 2310 B; 40 CFR 136.3 Table IB]. */
export const ENDPOINT_PH = {
  phenolphthalein: 8.3,
  routineTotal: 4.5,
  mineralAcidity: 3.7,
  totalAcidity: 8.3,
} as const;

/** 0 °C in kelvin. */
export const KELVIN_OFFSET = 273.15;
/** Molar gas constant, J/(mol·K) (CODATA 2018, exact). */
export const GAS_CONSTANT = 8.314462618;
/** Faraday constant, C/mol (CODATA 2018, exact). */
export const FARADAY = 96485.33212;

/** Absolute temperature T = t(°C) + 273.15 [SI definition of the kelvin]. */
export function kelvin(temperatureC: number): number {
  return temperatureC + KELVIN_OFFSET;
}
