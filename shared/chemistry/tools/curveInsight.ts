import { modelPh, volumeAtPh, type EquivalenceName, type EquivalencePoint, type TitrationModel } from '../curve';

/**
 * Curve insight: where a fixed endpoint sits on the model curve relative to the steep part
 * around its true equivalence point, and the colour-change ranges of the common indicators.
 */

export type IndicatorKey = 'phenolphthalein' | 'bromcresol_green_methyl_red' | 'methyl_orange';

export interface Indicator {
  key: IndicatorKey;
  name: string;
  /** Transition range, pH. */
  fromPh: number;
  toPh: number;
  /** Colour change from the acid side to the base side. */
  colourChange: string;
  use: string;
}

/** Indicator transition ranges as commonly tabulated [Bishop (ed.), Indicators, 1972, ch. 3; domain.md 9.3]. */
export const INDICATORS: readonly Indicator[] = [
  { key: 'phenolphthalein', name: 'Phenolphthalein', fromPh: 8.2, toPh: 10.0, colourChange: 'colourless → pink', use: 'P alkalinity (pH 8.3)' },
  {
    key: 'bromcresol_green_methyl_red',
    name: 'Bromcresol green–methyl red',
    fromPh: 4.5,
    toPh: 5.2,
    colourChange: 'red/pink → green-blue',
    use: 'T alkalinity at pH 4.5–5.1',
  },
  { key: 'methyl_orange', name: 'Methyl orange', fromPh: 3.1, toPh: 4.4, colourChange: 'red → yellow-orange', use: 'historic "M" alkalinity' },
];

/**
 * The steep part of the curve around an equivalence point: where |dpH/dV| is at least this
 * fraction of its peak there. An endpoint should lie on the steep part of the curve, where a
 * small error in reading the pH moves the volume little [common practice]; the fraction is
 * Titrata's own stated choice: at 3/4 of the peak, a misread pH costs at most 4/3 of the
 * volume it would cost at the inflection.
 */
export const STEEP_FRACTION = 0.75;

export const STEEP_DEFINITION =
  'Steep part: where |dpH/dV| is at least 75 % of its peak near that equivalence point (Titrata’s stated fraction; an endpoint on the steep part is common practice, since a misread pH then moves the volume least).';

// Central difference in pH on the closed-form V(pH); V is smooth, so 1e-4 pH is ample.
const SLOPE_STEP_PH = 1e-4;

/** |dpH/dV| at a pH, pH per mL, from the closed-form volume of the charge balance [curve.ts volumeAtPh; computed here]. */
export function slopeAtPh(model: TitrationModel, pH: number): number | null {
  const above = volumeAtPh(model, pH + SLOPE_STEP_PH);
  const below = volumeAtPh(model, pH - SLOPE_STEP_PH);
  if (above === null || below === null) return null;
  const dv = Math.abs(below - above);
  return dv > 0 ? (2 * SLOPE_STEP_PH) / dv : null;
}

export interface SteepPart {
  equivalence: EquivalenceName;
  /** The peak |dpH/dV| near the equivalence point (pH per mL), and where it is. */
  maxSlope: number;
  peakPh: number;
  peakVolumeMl: number;
  /** The steep part as a pH range (high to low, as the titration runs) and the volumes there. */
  highPh: number;
  lowPh: number;
  highVolumeMl: number;
  lowVolumeMl: number;
}

/** pH at which the bound form of the pair is half the total: [HCO3−] = [H2CO3*] at pK1, [CO3²−] = [HCO3−] at pK2 (concentration constants). */
function halfwayPh(model: TitrationModel, k: number): number {
  return -Math.log10(model.activity.gamma1 * k);
}

const GRID_STEPS = 600;

/**
 * The pH window searched for each peak: between the buffer minima that flank it — pK1 and the
 * start (or pK2) for the carbonate point, the curve at twice the total volume and pK1 (or the
 * start) for the total point [computed here from the carbonate buffer regions, Stumm and Morgan].
 */
function peakWindow(model: TitrationModel, point: EquivalencePoint, totalVolumeMl: number): [number, number] {
  const startPh = modelPh(model, 0) - 1e-3;
  const pK1 = halfwayPh(model, model.k1);
  const pK2 = halfwayPh(model, model.k2);
  if (point.name === 'carbonate') return [pK1, Math.min(startPh, pK2)];
  return [modelPh(model, 2 * totalVolumeMl), Math.min(startPh, pK1)];
}

/** Steep part around an equivalence point by a pH grid and golden-section refinement of the slope peak [computed here]. */
export function steepPart(model: TitrationModel, point: EquivalencePoint, totalVolumeMl: number, fraction = STEEP_FRACTION): SteepPart | null {
  const [low, high] = peakWindow(model, point, totalVolumeMl);
  if (!(high > low)) return null;
  const slope = (pH: number) => slopeAtPh(model, pH) ?? 0;
  const step = (high - low) / GRID_STEPS;
  let bestI = 0;
  let best = -1;
  for (let i = 0; i <= GRID_STEPS; i++) {
    const s = slope(low + i * step);
    if (s > best) {
      best = s;
      bestI = i;
    }
  }
  if (!(best > 0)) return null;
  // Golden-section search for the maximum within one grid step either side.
  let a = Math.max(low, low + (bestI - 1) * step);
  let b = Math.min(high, low + (bestI + 1) * step);
  const g = (Math.sqrt(5) - 1) / 2;
  for (let i = 0; i < 60; i++) {
    const c = b - g * (b - a);
    const d = a + g * (b - a);
    if (slope(c) > slope(d)) b = d;
    else a = c;
  }
  const peakPh = (a + b) / 2;
  const maxSlope = Math.max(best, slope(peakPh));
  const threshold = fraction * maxSlope;
  // The slope falls monotonically away from the peak within the window; bisect each side.
  const edge = (inside: number, outside: number) => {
    if (slope(outside) >= threshold) return outside;
    let lo = inside;
    let hi = outside;
    for (let i = 0; i < 60; i++) {
      const mid = (lo + hi) / 2;
      if (slope(mid) >= threshold) lo = mid;
      else hi = mid;
    }
    return (lo + hi) / 2;
  };
  const highPh = edge(peakPh, high);
  const lowPh = edge(peakPh, low);
  return {
    equivalence: point.name,
    maxSlope,
    peakPh,
    peakVolumeMl: volumeAtPh(model, peakPh) ?? point.volumeMl,
    highPh,
    lowPh,
    highVolumeMl: volumeAtPh(model, highPh) ?? 0,
    lowVolumeMl: volumeAtPh(model, lowPh) ?? point.volumeMl,
  };
}

export interface Steepness {
  /** |dpH/dV| at the endpoint, pH per mL. */
  slope: number;
  /** slope ÷ the peak slope near the equivalence point. */
  fractionOfPeak: number;
  /** mL that a 0.1 pH misreading moves the endpoint, at the endpoint. */
  volumePerTenthPhMl: number;
  steep: boolean;
}

/** Whether an endpoint pH lies on the steep part: slope ≥ STEEP_FRACTION × peak [common practice; stated fraction]. */
export function endpointSteepness(model: TitrationModel, endpointPh: number, part: SteepPart, fraction = STEEP_FRACTION): Steepness {
  const slope = slopeAtPh(model, endpointPh) ?? 0;
  const fractionOfPeak = slope / part.maxSlope;
  return { slope, fractionOfPeak, volumePerTenthPhMl: slope > 0 ? 0.1 / slope : Infinity, steep: fractionOfPeak >= fraction };
}

/** Indicators whose transition range contains a pH [Bishop 1972; domain.md 9.3]. */
export function indicatorsAt(pH: number): IndicatorKey[] {
  return INDICATORS.filter((i) => pH >= i.fromPh && pH <= i.toPh).map((i) => i.key);
}
