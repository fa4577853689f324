import type Decimal from 'decimal.js';
import { inputError } from '../errors.js';
import { DEFAULT_CACO3_FACTOR, ENDPOINT_PH, EQUIVALENT_WEIGHT, MOLAR_MASS } from './constants.js';
import { Dec, type DecimalValue } from './decimal.js';

export interface TitreInput {
  /** mL of titrant to the endpoint (A). */
  titrantVolumeMl: DecimalValue;
  /** Titrant normality, eq/L = meq/mL (N). */
  titrantNormality: DecimalValue;
  /** Sample volume, mL (V_s). */
  sampleVolumeMl: DecimalValue;
  /** 50,000 (Standard Methods) or 50,044. */
  factor?: DecimalValue;
  /** Titrator correction factor CF (1.01 for USGS digital-titrator cartridges). */
  correctionFactor?: DecimalValue;
}

/** Alkalinity, mg/L as CaCO3 = A × N × CF × factor / V_s [SM 2320 B ¶5; CF per USGS NFM A6.6.5.A]. */
export function alkalinityMgL(input: TitreInput): Decimal {
  const { titrantVolumeMl, titrantNormality, sampleVolumeMl, factor = DEFAULT_CACO3_FACTOR, correctionFactor = 1 } = input;
  return new Dec(titrantVolumeMl).times(titrantNormality).times(correctionFactor).times(factor).div(sampleVolumeMl);
}

/** Alkalinity, meq/L = A × N × CF × 1000 / V_s, independent of the CaCO3 factor [USGS NFM A6.6.5.A]. */
export function alkalinityMeqL(input: Omit<TitreInput, 'factor'>): Decimal {
  return alkalinityMgL({ ...input, factor: 1000 });
}

/** Converts mg/L as CaCO3 to meq/L with 50.04 mg/meq [SM 2320 B; NFM A6.6.5.A]. */
export function mgCaco3ToMeq(mgL: DecimalValue, mgPerMeq: DecimalValue = EQUIVALENT_WEIGHT.CaCO3): Decimal {
  return new Dec(mgL).div(mgPerMeq);
}

/** Converts meq/L to mg/L as CaCO3 with 50.04 mg/meq [SM 2320 B; NFM A6.6.5.A]. */
export function meqToMgCaco3(meqL: DecimalValue, mgPerMeq: DecimalValue = EQUIVALENT_WEIGHT.CaCO3): Decimal {
  return new Dec(meqL).times(mgPerMeq);
}

/** Digital-titrator counts to mL at 800 counts per mL [USGS NFM A6.6.5.A]. */
export function digitalTitratorVolumeMl(counts: DecimalValue, countsPerMl: DecimalValue = 800): Decimal {
  return new Dec(counts).div(countsPerMl);
}

/** mg/L as CaCO3 to mg/L as HCO3− (× 61.017/50.04), valid only below about pH 8.3 [computed from SM 2320 B equivalent weights]. */
export function asBicarbonateIon(mgLAsCaco3: DecimalValue): Decimal {
  return new Dec(mgLAsCaco3).times(MOLAR_MASS.HCO3).div(EQUIVALENT_WEIGHT.CaCO3);
}

/** Sample conditions for which Table 2320:I fixes the total endpoint at pH 4.5. */
export type TotalEndpointCondition = 'routine' | 'automated' | 'silicates_phosphates' | 'industrial_waste';

/** Table 2320:I rows with an expected alkalinity: [mg/L as CaCO3, endpoint pH] [SM 2320 B ¶1]. */
export const TOTAL_ENDPOINT_TABLE: ReadonlyArray<readonly [number, number]> = [
  [30, 4.9],
  [150, 4.6],
  [500, 4.3],
];

/**
 * Recommended total-alkalinity endpoint pH [SM 2320 B ¶1, Table 2320:I].
 *
 * Between the table's rows the pH is interpolated linearly in log10(alkalinity), because the
 * equivalence pH ≈ ½(pK1 − log C_T) is linear in the logarithm of the carbonate present; it is
 * rounded to 0.1 like the table and held at 4.9 below 30 and 4.3 above 500 mg/L (no
 * extrapolation). With no expected alkalinity, or for the listed conditions, it is 4.5.
 */
export function recommendedTotalEndpointPh(expectedAlkalinityMgL?: number, condition?: TotalEndpointCondition): number {
  if (condition !== undefined || expectedAlkalinityMgL === undefined || !(expectedAlkalinityMgL > 0)) {
    return ENDPOINT_PH.routineTotal;
  }
  const table = TOTAL_ENDPOINT_TABLE;
  const first = table[0];
  const last = table[table.length - 1];
  if (expectedAlkalinityMgL <= first[0]) return first[1];
  if (expectedAlkalinityMgL >= last[0]) return last[1];
  for (let i = 0; i < table.length - 1; i++) {
    const [a0, p0] = table[i];
    const [a1, p1] = table[i + 1];
    if (expectedAlkalinityMgL <= a1) {
      const f = Math.log10(expectedAlkalinityMgL / a0) / Math.log10(a1 / a0);
      return Math.round((p0 + f * (p1 - p0)) * 10) / 10;
    }
  }
  return last[1];
}

export interface TwoPointInput {
  sampleVolumeMl: DecimalValue;
  titrantNormality: DecimalValue;
  /** pH at the first recorded point, 4.3–4.7 by the method. */
  firstEndpointPh: number;
  /** B: mL to the first recorded pH. */
  volumeToFirstEndpointMl: DecimalValue;
  /** C: total mL to the pH 0.30 lower. */
  volumeToSecondEndpointMl: DecimalValue;
  /** The pH actually read at C; checked against firstEndpointPh − 0.30 when given. */
  secondEndpointPh?: number;
  factor?: DecimalValue;
}

export interface TwoPointResult {
  /** 2B − C, mL: the equivalence volume the method infers. */
  equivalenceVolumeMl: Decimal;
  totalAlkalinity: Decimal;
  totalAlkalinityMeqL: Decimal;
  /** The pH the second reading should have: first − 0.30. */
  secondEndpointPh: number;
}

/** The pH drop between the two readings of the low-alkalinity method [SM 2320 B ¶4d]. */
export const TWO_POINT_PH_DROP = 0.3;
/** Allowed deviation from the 0.30 drop: two steps of a 0.01-pH meter display [common practice]. */
export const TWO_POINT_PH_TOLERANCE = 0.02;

/** Low-alkalinity method: T = (2B − C) × N × 50,000 / V_s, second pH 0.30 below the first [SM 2320 B ¶4d and ¶5]. */
export function lowAlkalinityTwoPoint(input: TwoPointInput): TwoPointResult {
  const b = new Dec(input.volumeToFirstEndpointMl);
  const c = new Dec(input.volumeToSecondEndpointMl);
  const expectedSecond = Math.round((input.firstEndpointPh - TWO_POINT_PH_DROP) * 100) / 100;
  if (input.secondEndpointPh !== undefined) {
    const drop = input.firstEndpointPh - input.secondEndpointPh;
    if (Math.abs(drop - TWO_POINT_PH_DROP) > TWO_POINT_PH_TOLERANCE + 1e-9) {
      throw inputError(
        'lowAlkalinity.secondEndpointPh',
        `must be 0.30 pH below the first endpoint (${expectedSecond} ± ${TWO_POINT_PH_TOLERANCE}); the readings differ by ${drop.toFixed(2)}`,
      );
    }
  }
  if (!c.gt(b)) {
    throw inputError('lowAlkalinity.volumeToSecondEndpointMl', 'must be greater than volumeToFirstEndpointMl (volumes are cumulative)');
  }
  const equivalenceVolumeMl = b.times(2).minus(c);
  if (!equivalenceVolumeMl.gt(0)) {
    throw inputError(
      'lowAlkalinity.volumeToSecondEndpointMl',
      `2B − C is ${equivalenceVolumeMl.toString()} mL; the second reading is too far past the first for a 0.30 pH drop`,
    );
  }
  const base = { titrantVolumeMl: equivalenceVolumeMl, titrantNormality: input.titrantNormality, sampleVolumeMl: input.sampleVolumeMl };
  return {
    equivalenceVolumeMl,
    totalAlkalinity: alkalinityMgL({ ...base, factor: input.factor }),
    totalAlkalinityMeqL: alkalinityMeqL(base),
    secondEndpointPh: input.secondEndpointPh ?? expectedSecond,
  };
}
