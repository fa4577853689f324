import { CACO3_MG_PER_MOL } from './constants.js';
import { equilibriumSpeciation, type CarbonateConstants } from './speciation.js';

export interface LangelierApproximation {
  A: number;
  B: number;
  C: number;
  D: number;
  pHs: number;
  lsi: number;
}

/**
 * LSI approximation: pHs = (9.3 + A + B) − (C + D), A = (log TDS − 1)/10,
 * B = −13.12 log(t + 273) + 34.55 (273 as published), C = log Ca hardness − 0.4,
 * D = log alkalinity [Roberge 2008, eqs 8.26–8.31; usually credited to Carrier 1965].
 */
export function langelierApproximate(input: {
  pH: number;
  temperatureC: number;
  tdsMgL: number;
  /** Calcium hardness, mg/L as CaCO3. */
  calciumHardnessMgL: number;
  /** Total alkalinity, mg/L as CaCO3. */
  alkalinityMgL: number;
}): LangelierApproximation {
  const A = (Math.log10(input.tdsMgL) - 1) / 10;
  const B = -13.12 * Math.log10(input.temperatureC + 273) + 34.55;
  const C = Math.log10(input.calciumHardnessMgL) - 0.4;
  const D = Math.log10(input.alkalinityMgL);
  const pHs = 9.3 + A + B - (C + D);
  return { A, B, C, D, pHs, lsi: input.pH - pHs };
}

export interface LangelierExact {
  ionicStrength: number;
  /** Debye–Hückel A used for γ (SM 2330 B temperature form). */
  debyeHuckelA: number;
  /** pfm = −log γ1 (Davies). */
  pfm: number;
  /** pK2 − pKs(calcite). */
  pK2MinusPKs: number;
  pCa: number;
  pHco3: number;
  pHs: number;
  lsi: number;
  /** log({Ca²+}{CO3²−}/Ksp) with the same constants; equals the LSI. */
  calciteSaturationIndex: number;
  constants: CarbonateConstants;
}

/**
 * Exact LSI: pHs = pK2 − pKs + p[Ca²+] + p[HCO3−] + 5 pfm, [HCO3−] from alkalinity by the
 * equilibrium method, γ by Davies [SM 2330 B; Langelier 1936; Plummer and Busenberg 1982].
 */
export function langelierExact(input: {
  pH: number;
  temperatureC: number;
  calciumHardnessMgL: number;
  alkalinityMgL: number;
  ionicStrength: number;
}): LangelierExact {
  const species = equilibriumSpeciation({
    pH: input.pH,
    totalAlkalinityMgL: input.alkalinityMgL,
    temperatureC: input.temperatureC,
    ionicStrength: input.ionicStrength,
  });
  const { constants, activity } = species;
  const calcium = input.calciumHardnessMgL / CACO3_MG_PER_MOL;
  const pfm = -Math.log10(activity.gamma1);
  const pK2MinusPKs = -constants.logK2 + constants.logKspCalcite;
  const pCa = -Math.log10(calcium);
  const pHco3 = -Math.log10(species.molar.bicarbonate);
  const pHs = pK2MinusPKs + pCa + pHco3 + 5 * pfm;
  const calciteSaturationIndex =
    Math.log10(activity.gamma2 * calcium * activity.gamma2 * species.molar.carbonate) - constants.logKspCalcite;
  return {
    ionicStrength: activity.ionicStrength,
    debyeHuckelA: activity.debyeHuckelA,
    pfm,
    pK2MinusPKs,
    pCa,
    pHco3,
    pHs,
    lsi: input.pH - pHs,
    calciteSaturationIndex,
    constants,
  };
}

/** Ryznar stability index RSI = 2 pHs − pH [Ryznar 1944]. */
export function ryznarIndex(pHs: number, pH: number): number {
  return 2 * pHs - pH;
}

export type LsiTendency = 'deposits_caco3' | 'saturated' | 'dissolves_caco3';

/** Sign of the LSI: positive deposits CaCO3, negative dissolves it [Langelier 1936; SM 2330 A]. */
export function lsiTendency(lsi: number): LsiTendency {
  if (lsi > 0) return 'deposits_caco3';
  if (lsi < 0) return 'dissolves_caco3';
  return 'saturated';
}

export type RsiTendency = 'scaling' | 'little_scale' | 'no_protective_film' | 'corrosive';

/** RSI bands: < 6 scaling, 6–7 little scale, > 7 no protective CaCO3 film, > 8 mild-steel corrosion likely [Ryznar 1944; NACE]. */
export function rsiTendency(rsi: number): RsiTendency {
  if (rsi < 6) return 'scaling';
  if (rsi <= 7) return 'little_scale';
  if (rsi <= 8) return 'no_protective_film';
  return 'corrosive';
}
