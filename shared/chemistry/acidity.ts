import type Decimal from 'decimal.js';
import { DEFAULT_CACO3_FACTOR } from './constants.js';
import { Dec, type DecimalValue } from './decimal.js';

export interface PeroxidePretreatment {
  /** C: mL of H2SO4 added before the peroxide step. */
  acidVolumeMl: DecimalValue;
  /** D: normality of that acid. */
  acidNormality: DecimalValue;
}

export interface AcidityInput {
  /** A: mL of NaOH to the endpoint. */
  titrantVolumeMl: DecimalValue;
  /** B: NaOH normality. */
  titrantNormality: DecimalValue;
  sampleVolumeMl: DecimalValue;
  pretreatment?: PeroxidePretreatment;
  factor?: DecimalValue;
}

export interface AcidityResult {
  /** Signed: negative means the sample was net alkaline. */
  acidity: Decimal;
  acidityMeqL: Decimal;
  /** C × D, meq of pretreatment acid subtracted (0 without pretreatment). */
  pretreatmentMeq: Decimal;
  /** True when the result is below zero: report alkalinity (SM 2320) instead. */
  netAlkaline: boolean;
}

/** Acidity, mg/L as CaCO3 = [(A × B) − (C × D)] × 50,000 / V_s, kept signed [SM 2310 B ¶5]. */
export function acidityMgL(input: AcidityInput): AcidityResult {
  const factor = input.factor ?? DEFAULT_CACO3_FACTOR;
  const baseMeq = new Dec(input.titrantVolumeMl).times(input.titrantNormality);
  const pretreatmentMeq = input.pretreatment
    ? new Dec(input.pretreatment.acidVolumeMl).times(input.pretreatment.acidNormality)
    : new Dec(0);
  const netMeq = baseMeq.minus(pretreatmentMeq);
  const acidity = netMeq.times(factor).div(input.sampleVolumeMl);
  return {
    acidity,
    acidityMeqL: netMeq.times(1000).div(input.sampleVolumeMl),
    pretreatmentMeq,
    netAlkaline: acidity.isNegative() && !acidity.isZero(),
  };
}
