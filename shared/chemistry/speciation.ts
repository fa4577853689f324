import type Decimal from 'decimal.js';
import { inputError } from '../errors.js';
import { CACO3_FACTOR_STANDARD_METHODS, CACO3_MG_PER_EQ, MOLAR_MASS, kelvin } from './constants.js';
import { Dec, type DecimalValue } from './decimal.js';

// ---------------------------------------------------------------------------------------------
// Temperature-dependent constants (T in kelvin, log = log10)
// ---------------------------------------------------------------------------------------------

/** Temperatures over which the constants are published as valid (1 atm) [Plummer and Busenberg 1982]. */
export const CONSTANTS_VALID_RANGE_C = { min: 0, max: 90 } as const;

export const CONSTANTS_SOURCE =
  'Plummer and Busenberg 1982, Geochim. Cosmochim. Acta 46:1011 (K1, K2, KH, Ksp calcite); Harned and Robinson 1940 (Kw)';

/** log K1, H2CO3* ⇌ H+ + HCO3− [Plummer and Busenberg 1982]. */
export function logK1(temperatureC: number): number {
  const t = kelvin(temperatureC);
  return -356.3094 - 0.06091964 * t + 21834.37 / t + 126.8339 * Math.log10(t) - 1684915 / (t * t);
}

/** log K2, HCO3− ⇌ H+ + CO3²− [Plummer and Busenberg 1982]. */
export function logK2(temperatureC: number): number {
  const t = kelvin(temperatureC);
  return -107.8871 - 0.03252849 * t + 5151.79 / t + 38.92561 * Math.log10(t) - 563713.9 / (t * t);
}

/** log KH, CO2(g) ⇌ CO2(aq) [Plummer and Busenberg 1982]. */
export function logKH(temperatureC: number): number {
  const t = kelvin(temperatureC);
  return 108.3865 + 0.01985076 * t - 6919.53 / t - 40.45154 * Math.log10(t) + 669365 / (t * t);
}

/** log Ksp of calcite [Plummer and Busenberg 1982]. */
export function logKspCalcite(temperatureC: number): number {
  const t = kelvin(temperatureC);
  return -171.9065 - 0.077993 * t + 2839.319 / t + 71.595 * Math.log10(t);
}

/** log Kw = −4470.99/T + 6.0875 − 0.01706 T [Harned and Robinson 1940, via Stumm and Morgan]. */
export function logKw(temperatureC: number): number {
  const t = kelvin(temperatureC);
  return -4470.99 / t + 6.0875 - 0.01706 * t;
}

export interface CarbonateConstants {
  temperatureC: number;
  logK1: number;
  logK2: number;
  logKH: number;
  logKspCalcite: number;
  logKw: number;
}

/** All five log constants at one temperature [Plummer and Busenberg 1982; Harned and Robinson 1940]. */
export function carbonateConstants(temperatureC: number): CarbonateConstants {
  return {
    temperatureC,
    logK1: logK1(temperatureC),
    logK2: logK2(temperatureC),
    logKH: logKH(temperatureC),
    logKspCalcite: logKspCalcite(temperatureC),
    logKw: logKw(temperatureC),
  };
}

// ---------------------------------------------------------------------------------------------
// Hydroxide, carbonate and bicarbonate from P and T
// ---------------------------------------------------------------------------------------------

export type PtCase = 'P=0' | 'P<T/2' | 'P=T/2' | 'P>T/2' | 'P=T';

export interface PtSpecies {
  case: PtCase;
  hydroxide: Decimal;
  carbonate: Decimal;
  bicarbonate: Decimal;
  toleranceMgL: Decimal;
}

/**
 * Tolerance for "P = T/2" and "P = T", mg/L as CaCO3: half of a 0.1 mg/L reporting resolution
 * [common practice: half the reporting resolution].
 */
export const PT_EQUALITY_TOLERANCE_MGL = 0.05;

/**
 * Hydroxide, carbonate and bicarbonate (mg/L as CaCO3) from P and T by the five-case table
 * [SM 2320 B ¶6, Table 2320:II]. P is compared with T/2 and T on unrounded values within
 * `toleranceMgL`; in the equality cases the species take T itself so that they always sum to T.
 */
export function speciesFromPT(
  phenolphthaleinMgL: DecimalValue,
  totalMgL: DecimalValue,
  toleranceMgL: DecimalValue = PT_EQUALITY_TOLERANCE_MGL,
): PtSpecies {
  const p = new Dec(phenolphthaleinMgL);
  const t = new Dec(totalMgL);
  const tol = new Dec(toleranceMgL);
  const zero = new Dec(0);
  if (p.isNegative() && !p.isZero()) throw inputError('phenolphthaleinAlkalinity', 'must be 0 or more');
  if (t.isNegative() && !t.isZero()) throw inputError('totalAlkalinity', 'must be 0 or more');
  if (p.minus(t).gt(tol)) throw inputError('phenolphthaleinAlkalinity', 'must not exceed the total alkalinity');
  const result = (c: PtCase, hydroxide: Decimal, carbonate: Decimal, bicarbonate: Decimal): PtSpecies => ({
    case: c,
    hydroxide,
    carbonate,
    bicarbonate,
    toleranceMgL: tol,
  });
  if (p.isZero()) return result('P=0', zero, zero, t);
  if (p.minus(t).abs().lte(tol)) return result('P=T', t, zero, zero);
  const half = t.div(2);
  if (p.minus(half).abs().lte(tol)) return result('P=T/2', zero, t, zero);
  if (p.lt(half)) return result('P<T/2', zero, p.times(2), t.minus(p.times(2)));
  return result('P>T/2', p.times(2).minus(t), t.minus(p).times(2), zero);
}

// ---------------------------------------------------------------------------------------------
// Ionic strength and activity coefficients
// ---------------------------------------------------------------------------------------------

/** I ≈ 2.5 × 10⁻⁵ × TDS (mg/L) [Langelier 1936, as reproduced in SM 2330]. */
export function ionicStrengthFromTds(tdsMgL: number): number {
  return 2.5e-5 * tdsMgL;
}

/** I ≈ 1.6 × 10⁻⁵ × specific conductance (µS/cm at 25 °C) [Russell 1976]. */
export function ionicStrengthFromConductance(specificConductanceUsCm: number): number {
  return 1.6e-5 * specificConductanceUsCm;
}

/** Dielectric constant of water ε = 60954/(T + 116) − 68.937 [SM 2330 B]. */
export function dielectricConstantWater(temperatureC: number): number {
  return 60954 / (kelvin(temperatureC) + 116) - 68.937;
}

export const DEBYE_HUCKEL_A_SOURCE = 'SM 2330 B: A = 1.82 × 10⁶ (εT)^−1.5, ε = 60954/(T + 116) − 68.937 (0.5108 at 25 °C)';

/** Debye–Hückel A = 1.82 × 10⁶ (εT)^−1.5, 0.5108 at 25 °C [SM 2330 B]. */
export function debyeHuckelA(temperatureC: number): number {
  return 1.82e6 * (dielectricConstantWater(temperatureC) * kelvin(temperatureC)) ** -1.5;
}

/** Davies: log γ = −A z² [√I/(1 + √I) − 0.3 I] [Davies 1962, Ion Association, p. 41]. */
export function daviesLogGamma(ionicStrength: number, charge: number, a: number): number {
  const s = Math.sqrt(ionicStrength);
  return -a * charge * charge * (s / (1 + s) - 0.3 * ionicStrength);
}

export interface ActivityCoefficients {
  ionicStrength: number;
  /** The Debye–Hückel A used (SM 2330 B temperature form). */
  debyeHuckelA: number;
  gamma1: number;
  gamma2: number;
  /** False when I = 0: an ideal solution, all γ = 1. */
  applied: boolean;
}

/** γ1 and γ2 by Davies with A from the SM 2330 B temperature form [Davies 1962; SM 2330 B]. */
export function activityCoefficients(ionicStrength: number, temperatureC: number): ActivityCoefficients {
  const a = debyeHuckelA(temperatureC);
  if (!(ionicStrength > 0)) return { ionicStrength: 0, debyeHuckelA: a, gamma1: 1, gamma2: 1, applied: false };
  const log1 = daviesLogGamma(ionicStrength, 1, a);
  return {
    ionicStrength,
    debyeHuckelA: a,
    gamma1: 10 ** log1,
    // z² = 4, so log γ2 = 4 log γ1.
    gamma2: 10 ** (4 * log1),
    applied: true,
  };
}

// ---------------------------------------------------------------------------------------------
// Equilibrium speciation from pH, temperature and total alkalinity
// ---------------------------------------------------------------------------------------------

export interface EquilibriumInput {
  pH: number;
  /** Total alkalinity, mg/L as CaCO3. */
  totalAlkalinityMgL: number;
  temperatureC?: number;
  /** 0 or absent: ideal solution. */
  ionicStrength?: number;
  /** mg CaCO3 per equivalent for eq/L ↔ mg/L (50,040; pass the result's factor for consistency). */
  caco3MgPerEq?: number;
}

export interface EquilibriumSpecies {
  alkalinityEqL: number;
  /** r = [CO3²−]/[HCO3−]. */
  carbonateToBicarbonateRatio: number;
  /** mol/L. */
  molar: {
    hydrogen: number;
    hydroxide: number;
    bicarbonate: number;
    carbonate: number;
    carbonicAcid: number;
    totalCarbonate: number;
  };
  /** mg/L as CaCO3; hydroxide + carbonate + bicarbonate − hydrogen = T. */
  asCaco3: { hydroxide: number; carbonate: number; bicarbonate: number; hydrogen: number };
  /** mg/L as the ion itself (carbonic acid as CO2). */
  asIon: { hydroxide: number; carbonate: number; bicarbonate: number; carbonDioxide: number };
  activity: ActivityCoefficients;
  constants: CarbonateConstants;
  caco3MgPerEq: number;
}

/**
 * Species from pH, temperature and total alkalinity, carbonate the only weak base:
 * [OH−] = Kw/({H+}γ1), r = K2γ1/({H+}γ2), [HCO3−] = (Alk − [OH−] + [H+])/(1 + 2r)
 * [USGS NFM 6.6.5.B; SM 2330]. Carbonate as CaCO3 uses 2 × caco3MgPerEq so the species sum to T.
 */
export function equilibriumSpeciation(input: EquilibriumInput): EquilibriumSpecies {
  const temperatureC = input.temperatureC ?? 25;
  const caco3MgPerEq = input.caco3MgPerEq ?? CACO3_MG_PER_EQ;
  const constants = carbonateConstants(temperatureC);
  const activity = activityCoefficients(input.ionicStrength ?? 0, temperatureC);
  const { gamma1, gamma2 } = activity;
  const hActivity = 10 ** -input.pH;
  const alk = input.totalAlkalinityMgL / caco3MgPerEq;
  const hydroxide = 10 ** constants.logKw / (hActivity * gamma1);
  const hydrogen = hActivity / gamma1;
  const r = (10 ** constants.logK2 * gamma1) / (hActivity * gamma2);
  const bicarbonate = (alk - hydroxide + hydrogen) / (1 + 2 * r);
  if (bicarbonate < 0) {
    throw inputError(
      'totalAlkalinity',
      `is lower than the hydroxide alone at pH ${input.pH} (${(hydroxide * caco3MgPerEq).toPrecision(4)} mg/L as CaCO3); check the pH and alkalinity`,
    );
  }
  const carbonate = r * bicarbonate;
  const carbonicAcid = (bicarbonate * hActivity * gamma1) / 10 ** constants.logK1;
  return {
    alkalinityEqL: alk,
    carbonateToBicarbonateRatio: r,
    molar: {
      hydrogen,
      hydroxide,
      bicarbonate,
      carbonate,
      carbonicAcid,
      totalCarbonate: carbonicAcid + bicarbonate + carbonate,
    },
    asCaco3: {
      hydroxide: hydroxide * caco3MgPerEq,
      carbonate: carbonate * 2 * caco3MgPerEq,
      bicarbonate: bicarbonate * caco3MgPerEq,
      hydrogen: hydrogen * caco3MgPerEq,
    },
    asIon: {
      hydroxide: hydroxide * MOLAR_MASS.OH * 1000,
      carbonate: carbonate * MOLAR_MASS.CO3 * 1000,
      bicarbonate: bicarbonate * MOLAR_MASS.HCO3 * 1000,
      carbonDioxide: carbonicAcid * MOLAR_MASS.CO2 * 1000,
    },
    activity,
    constants,
    caco3MgPerEq,
  };
}

/** Hydroxide, mg/L as CaCO3 ≈ 50,000 × 10^(pH − pKw), no activity correction [SM 2320 B ¶6]. */
export function hydroxideFromPh(pH: number, temperatureC = 25, factor: number = CACO3_FACTOR_STANDARD_METHODS): number {
  return factor * 10 ** (pH + logKw(temperatureC));
}
