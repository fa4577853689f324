import { classify, DIGESTER_BANDS, type Band } from './bands';

/**
 * Anaerobic digester volatile-acids/alkalinity ratio: VA (mg/L as acetic acid) ÷ alkalinity
 * (mg/L as CaCO3) [Gerardi 2003 for the concept; common practice]. Not to be mixed with FOS/TAC
 * or IA/PA, which use other endpoints.
 */

/** VA/alkalinity ratio [Gerardi 2003; common practice]. */
export function volatileAcidsAlkalinityRatio(volatileAcidsMgL: number, alkalinityMgL: number): number {
  return volatileAcidsMgL / alkalinityMgL;
}

/** Alkalinity that would bring the ratio down to `targetRatio` at the same VA: VA ÷ target [from the ratio's definition]. */
export function alkalinityForRatio(volatileAcidsMgL: number, targetRatio: number): number {
  return volatileAcidsMgL / targetRatio;
}

export type RatioTrend = 'rising' | 'falling' | 'steady' | 'unknown';

/**
 * Trend of the ratio over the last three results (two earlier and the current): rising when
 * each is higher than the one before, falling when each is lower [common practice: a rising
 * trend is the early warning, pH changes last; Gerardi 2003].
 */
export function ratioTrend(previousRatios: readonly number[], current: number): RatioTrend {
  const series = [...previousRatios.slice(-2), current];
  if (series.length < 3) return 'unknown';
  const steps = series.slice(1).map((v, i) => v - series[i]);
  if (steps.every((d) => d > 0)) return 'rising';
  if (steps.every((d) => d < 0)) return 'falling';
  return 'steady';
}

export interface DigesterHealth {
  ratio: number;
  band: Band<'stable' | 'watch' | 'act'>;
  trend: RatioTrend;
  /** Alkalinity for the target ratio at the same VA, mg/L as CaCO3, and how much more that is. */
  alkalinityForTarget: number;
  additionalAlkalinity: number;
}

/** Ratio, band, trend and the alkalinity for a target ratio [Gerardi 2003; common practice]. */
export function digesterHealth(input: {
  volatileAcidsMgL: number;
  alkalinity: number;
  previousRatios?: readonly number[];
  targetRatio: number;
}): DigesterHealth {
  const ratio = volatileAcidsAlkalinityRatio(input.volatileAcidsMgL, input.alkalinity);
  const alkalinityForTarget = alkalinityForRatio(input.volatileAcidsMgL, input.targetRatio);
  return {
    ratio,
    band: classify(DIGESTER_BANDS, ratio),
    trend: ratioTrend(input.previousRatios ?? [], ratio),
    alkalinityForTarget,
    additionalAlkalinity: Math.max(0, alkalinityForTarget - input.alkalinity),
  };
}
