import { inputError } from '../../errors';
import { CACO3_MG_PER_EQ, CACO3_MG_PER_MOL } from '../constants';
import { carbonateWaterModel, createModel, modelPh, type TitrationModel } from '../curve';

/**
 * Calcium carbonate precipitation potential, closed system with ionic strength held constant
 * [SM 2330 definition; DIN 38404-10; procedure of domain.md 8.3, computed here]: find x (mol/L)
 * such that removing x from Ca, 2x from alkalinity (eq/L) and x from C_T leaves the water just
 * saturated, γ2²[Ca][CO3] = Ksp; CCPP = x × 100,090 mg/mol. Positive: would precipitate.
 */

export interface CcppInput {
  pH: number;
  temperatureC: number;
  /** Calcium hardness, mg/L as CaCO3. */
  calciumHardnessMgL: number;
  /** Total alkalinity, mg/L as CaCO3. */
  alkalinityMgL: number;
  ionicStrength: number;
}

export interface CcppResult {
  /** mg/L as CaCO3; positive would precipitate, negative would dissolve. */
  ccppMgL: number;
  /** x, mol/L. */
  precipitatedMolL: number;
  finalPh: number;
  /** mg/L as CaCO3. */
  finalCalciumHardnessMgL: number;
  finalAlkalinityMgL: number;
  initialTotalCarbonateMmolL: number;
  finalTotalCarbonateMmolL: number;
  /** log(γ2²[Ca][CO3]/Ksp) before and after (0 after, within the solver's tolerance). */
  initialSaturationIndex: number;
  finalSaturationIndex: number;
}

/** One water of the closed system after x mol/L of CaCO3 has left it. */
function stateAfter(base: TitrationModel, calciumM: number, alkalinityEqL: number, x: number) {
  const totalCarbonateM = base.totalCarbonateM - x;
  const model = createModel({
    sampleVolumeMl: 1,
    titrant: 'acid',
    titrantNormality: 1,
    temperatureC: base.temperatureC,
    ionicStrength: base.activity.ionicStrength,
    strongBaseEqL: alkalinityEqL - 2 * x,
    totalCarbonateM,
  });
  // No titrant added: modelPh at 0 mL is the pH of this alkalinity and C_T by charge balance.
  const pH = modelPh(model, 0);
  const h = 10 ** -pH / model.activity.gamma1;
  const { k1, k2 } = model;
  const carbonateM = (totalCarbonateM * k1 * k2) / (h * h + k1 * h + k1 * k2);
  const g2 = model.activity.gamma2;
  const saturationIndex = Math.log10(g2 * (calciumM - x) * g2 * carbonateM) - model.constants.logKspCalcite;
  return { pH, saturationIndex, totalCarbonateM };
}

// 200 halvings of a bracket below 1 mol/L leave x known far beyond 0.001 mg/L.
const BISECTION_STEPS = 200;
/** Largest dissolution searched, mol/L (100 g/L as CaCO3): beyond any water this tool is for. */
const MAX_DISSOLVED_M = 1;

/** CCPP by bisection on x, closed system, I constant [SM 2330; DIN 38404-10; domain.md 8.3, computed here]. */
export function calciumCarbonatePrecipitationPotential(input: CcppInput): CcppResult {
  const alkalinityEqL = input.alkalinityMgL / CACO3_MG_PER_EQ;
  const calciumM = input.calciumHardnessMgL / CACO3_MG_PER_MOL;
  const base = carbonateWaterModel({
    sampleVolumeMl: 1,
    titrant: 'acid',
    titrantNormality: 1,
    temperatureC: input.temperatureC,
    ionicStrength: input.ionicStrength,
    initialPh: input.pH,
    alkalinityEqL,
  });
  const at = (x: number) => stateAfter(base, calciumM, alkalinityEqL, x);
  const initial = at(0);
  let lo: number;
  let hi: number;
  if (initial.saturationIndex > 0) {
    // Precipitation cannot remove more than the scarcest of Ca, C_T and half the alkalinity.
    lo = 0;
    hi = Math.min(calciumM, base.totalCarbonateM, alkalinityEqL / 2);
  } else {
    hi = 0;
    lo = -1e-4;
    while (at(lo).saturationIndex < 0) {
      lo *= 2;
      if (-lo > MAX_DISSOLVED_M) throw inputError('pH', 'the water would dissolve more than 100 g/L of CaCO3 before saturating; check the inputs');
    }
  }
  for (let i = 0; i < BISECTION_STEPS && hi - lo > 1e-15; i++) {
    const mid = (lo + hi) / 2;
    // The saturation index falls as x rises: positive means more must precipitate.
    if (at(mid).saturationIndex > 0) lo = mid;
    else hi = mid;
  }
  const x = initial.saturationIndex === 0 ? 0 : (lo + hi) / 2;
  const final = at(x);
  return {
    ccppMgL: x * CACO3_MG_PER_MOL,
    precipitatedMolL: x,
    finalPh: final.pH,
    finalCalciumHardnessMgL: (calciumM - x) * CACO3_MG_PER_MOL,
    finalAlkalinityMgL: (alkalinityEqL - 2 * x) * CACO3_MG_PER_EQ,
    initialTotalCarbonateMmolL: base.totalCarbonateM * 1000,
    finalTotalCarbonateMmolL: final.totalCarbonateM * 1000,
    initialSaturationIndex: initial.saturationIndex,
    finalSaturationIndex: final.saturationIndex,
  };
}
