import type Decimal from 'decimal.js';
import { inputError } from '../errors.js';
import { DEFAULT_CACO3_FACTOR, EQUIVALENT_WEIGHT } from './constants.js';
import { Dec, type DecimalValue } from './decimal.js';

/** Acid normality against a Na2CO3 solution: N = A × B / (53.00 × C) [SM 2320 B ¶3]. */
export function acidNormalityFromNa2co3Solution(input: {
  /** A: g Na2CO3 per litre of standard solution. */
  na2co3GramsPerL: DecimalValue;
  /** B: mL of Na2CO3 solution titrated. */
  na2co3VolumeMl: DecimalValue;
  /** C: mL of acid used. */
  acidVolumeMl: DecimalValue;
  equivalentWeight?: DecimalValue;
}): Decimal {
  const eq = input.equivalentWeight ?? EQUIVALENT_WEIGHT.Na2CO3StandardMethods;
  return new Dec(input.na2co3GramsPerL).times(input.na2co3VolumeMl).div(new Dec(eq).times(input.acidVolumeMl));
}

/** Acid normality from Na2CO3 weighed directly: N = m(g) × 1000 / (52.994 × V_acid) [computed from SM 2320 B ¶3 stoichiometry]. */
export function acidNormalityFromNa2co3Mass(input: {
  na2co3Grams: DecimalValue;
  acidVolumeMl: DecimalValue;
  equivalentWeight?: DecimalValue;
}): Decimal {
  const eq = input.equivalentWeight ?? EQUIVALENT_WEIGHT.Na2CO3;
  return new Dec(input.na2co3Grams).times(1000).div(new Dec(eq).times(input.acidVolumeMl));
}

/** NaOH normality against a KHP solution: N = A × B / (204.2 × C) [SM 2310 B ¶3]. */
export function baseNormalityFromKhpSolution(input: {
  /** A: g KHP per litre. */
  khpGramsPerL: DecimalValue;
  /** B: mL of KHP solution titrated. */
  khpVolumeMl: DecimalValue;
  /** C: mL of NaOH used. */
  baseVolumeMl: DecimalValue;
  equivalentWeight?: DecimalValue;
}): Decimal {
  const eq = input.equivalentWeight ?? EQUIVALENT_WEIGHT.KHPStandardMethods;
  return new Dec(input.khpGramsPerL).times(input.khpVolumeMl).div(new Dec(eq).times(input.baseVolumeMl));
}

/** NaOH normality from KHP weighed directly: N = m(g) × 1000 / (204.22 × V) [SM 2310 B ¶3, direct-weighing form]. */
export function baseNormalityFromKhpMass(input: { khpGrams: DecimalValue; baseVolumeMl: DecimalValue; equivalentWeight?: DecimalValue }): Decimal {
  const eq = input.equivalentWeight ?? EQUIVALENT_WEIGHT.KHP;
  return new Dec(input.khpGrams).times(1000).div(new Dec(eq).times(input.baseVolumeMl));
}

/** Normality after dilution: N2 = N1 × V1 / V2 [SM 2320 B ¶3, 0.02 N from 0.1 N]. */
export function dilutedNormality(input: { stockNormality: DecimalValue; stockVolumeMl: DecimalValue; finalVolumeMl: DecimalValue }): Decimal {
  return new Dec(input.stockNormality).times(input.stockVolumeMl).div(input.finalVolumeMl);
}

/** mg CaCO3 equivalent to 1.00 mL of titrant: N × factor / 1000 (0.02 N → 1.00 mg) [SM 2320 B ¶3]. */
export function caco3MgPerMlTitrant(normality: DecimalValue, factor: DecimalValue = DEFAULT_CACO3_FACTOR): Decimal {
  return new Dec(normality).times(factor).div(1000);
}

export interface ReplicateStatistics {
  n: number;
  mean: Decimal;
  /** Sample standard deviation (n − 1). */
  standardDeviation: Decimal;
  /** SD / mean × 100. */
  relativeStandardDeviationPercent: Decimal;
}

/** Mean, sample SD (n − 1) and RSD % of replicate standardisations [SM 1020 B; common practice]. */
export function replicateStatistics(values: readonly DecimalValue[]): ReplicateStatistics {
  if (values.length < 2) throw inputError('replicates', 'at least two replicates are needed');
  const xs = values.map((v) => new Dec(v));
  const n = xs.length;
  const mean = xs.reduce((a, b) => a.plus(b), new Dec(0)).div(n);
  const ss = xs.reduce((a, x) => a.plus(x.minus(mean).pow(2)), new Dec(0));
  const standardDeviation = ss.div(n - 1).sqrt();
  if (mean.isZero()) throw inputError('replicates', 'the mean is zero, so no relative standard deviation exists');
  return { n, mean, standardDeviation, relativeStandardDeviationPercent: standardDeviation.div(mean).times(100).abs() };
}

/** Replicate acceptance criterion, RSD %: 0.5 (the loose end of 0.2–0.5 %) [common practice]. */
export const STANDARDIZATION_RSD_LIMIT_PERCENT = 0.5;

/** Replicates accepted when their RSD is at most the limit (0.5 % by default) [common practice]. */
export function replicatesAccepted(stats: ReplicateStatistics, limitPercent: DecimalValue = STANDARDIZATION_RSD_LIMIT_PERCENT): boolean {
  return stats.relativeStandardDeviationPercent.lte(limitPercent);
}
