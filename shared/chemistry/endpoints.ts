import type Decimal from 'decimal.js';
import { inputError } from '../errors.js';
import { ENDPOINT_PH } from './constants.js';
import { Dec } from './decimal.js';

/** One recorded point of a titration: cumulative titrant volume and the pH read there. */
export interface Reading {
  volumeMl: number;
  pH: number;
}

/** Acid titrant makes the pH fall (alkalinity); base makes it rise (acidity). */
export type TitrationDirection = 'falling' | 'rising';

/** Direction of a titration from its first and last readings. */
export function titrationDirection(readings: readonly Reading[]): TitrationDirection {
  if (readings.length < 2) throw inputError('readings', 'at least two readings are needed');
  const first = readings[0].pH;
  const last = readings[readings.length - 1].pH;
  if (first === last) throw inputError('readings', 'the pH does not change between the first and last reading');
  return last < first ? 'falling' : 'rising';
}

export interface FixedPhEndpoint {
  endpointPh: number;
  /** Interpolated volume, mL (exact decimal of the linear interpolation). */
  volumeMl: Decimal;
  /** Index of the reading before the crossing; the endpoint lies up to readings[index + 1]. */
  index: number;
  before: Reading;
  after: Reading;
}

/**
 * Volume at a fixed endpoint pH by linear interpolation between the two readings that bracket
 * it [SM 2320 B; SM 2310 B, volume read off the curve]; never extrapolated [common practice].
 * The first crossing in the titration direction is used.
 */
export function fixedPhEndpoint(
  readings: readonly Reading[],
  endpointPh: number,
  direction: TitrationDirection = titrationDirection(readings),
): FixedPhEndpoint {
  if (readings.length < 2) throw inputError('readings', 'at least two readings are needed');
  const sign = direction === 'falling' ? 1 : -1;
  const notYet = (pH: number) => sign * (pH - endpointPh) > 0;
  const first = readings[0];
  if (first.pH === endpointPh) return { endpointPh, volumeMl: new Dec(first.volumeMl), index: 0, before: first, after: first };
  if (!notYet(first.pH)) {
    throw inputError('readings', `the first reading (pH ${first.pH}) is already past pH ${endpointPh}, so the endpoint is not bracketed`);
  }
  for (let i = 0; i + 1 < readings.length; i++) {
    const a = readings[i];
    const b = readings[i + 1];
    if (notYet(a.pH) && !notYet(b.pH)) {
      const fraction = new Dec(a.pH).minus(endpointPh).div(new Dec(a.pH).minus(b.pH));
      const volumeMl = new Dec(a.volumeMl).plus(fraction.times(new Dec(b.volumeMl).minus(a.volumeMl)));
      return { endpointPh, volumeMl, index: i, before: a, after: b };
    }
  }
  const last = readings[readings.length - 1];
  throw inputError('readings', `the readings never reach pH ${endpointPh} (last reading pH ${last.pH} at ${last.volumeMl} mL); no endpoint is bracketed`);
}

/** pH at a volume by linear interpolation along the readings (for labelling an endpoint). */
export function phAtVolume(readings: readonly Reading[], volumeMl: number): number {
  for (let i = 0; i + 1 < readings.length; i++) {
    const a = readings[i];
    const b = readings[i + 1];
    if (volumeMl >= a.volumeMl && volumeMl <= b.volumeMl) {
      if (b.volumeMl === a.volumeMl) return a.pH;
      return a.pH + ((volumeMl - a.volumeMl) / (b.volumeMl - a.volumeMl)) * (b.pH - a.pH);
    }
  }
  return volumeMl <= readings[0].volumeMl ? readings[0].pH : readings[readings.length - 1].pH;
}

/** First derivative at a midpoint, for plotting on a second axis. */
export interface DerivativePoint {
  /** (V_i + V_i+1)/2, mL. */
  volumeMl: number;
  /** (pH_i + pH_i+1)/2, used to tell the carbonate from the bicarbonate region. */
  pH: number;
  /** ΔpH/ΔV, signed (negative for an acid titration), pH per mL. */
  slope: number;
}

interface PairSlope {
  /** Index of the first reading of the pair. */
  index: number;
  volumeMl: number;
  pH: number;
  slope: number;
}

function pairSlopes(readings: readonly Reading[]): PairSlope[] {
  const out: PairSlope[] = [];
  for (let i = 0; i + 1 < readings.length; i++) {
    const a = readings[i];
    const b = readings[i + 1];
    const dv = b.volumeMl - a.volumeMl;
    // Two readings at one volume carry no slope; skip rather than divide by zero.
    if (dv === 0) continue;
    out.push({ index: i, volumeMl: (a.volumeMl + b.volumeMl) / 2, pH: (a.pH + b.pH) / 2, slope: (b.pH - a.pH) / dv });
  }
  return out;
}

/** Drops binary noise such as 1.2000000000000002 from plotted values (12 significant digits). */
const clean = (x: number) => Number(x.toPrecision(12));

/** Slope ΔpH/ΔV of each pair of readings at its midpoint volume [USGS NFM A6.6.4.B]. */
export function derivativeSeries(readings: readonly Reading[]): DerivativePoint[] {
  return pairSlopes(readings).map(({ volumeMl, pH, slope }) => ({ volumeMl: clean(volumeMl), pH: clean(pH), slope: clean(slope) }));
}

export type InflectionRegion = 'carbonate' | 'bicarbonate';

/**
 * Midpoint-pH windows searched for each inflection: the carbonate endpoint lies between pK1 and
 * pK2 (6.35–10.33 at 25 °C), the bicarbonate endpoint below pK1 [computed from Plummer and
 * Busenberg 1982 constants; NFM A6.6.4.B].
 */
export const INFLECTION_WINDOWS: Record<InflectionRegion, { minPh: number; maxPh: number }> = {
  carbonate: { minPh: 6.35, maxPh: 10.33 },
  bicarbonate: { minPh: 0, maxPh: 6.35 },
};

/** Relative closeness at which two slopes count as the same maximum. */
export const TIE_RELATIVE_TOLERANCE = 1e-9;

export interface InflectionEndpoint {
  region: InflectionRegion;
  /** Endpoint volume, mL: the midpoint of largest |ΔpH/ΔV|, or the mean of the first and last tied midpoints. */
  volumeMl: Decimal;
  /** pH interpolated along the readings at that volume. */
  pH: number;
  /** The largest |ΔpH/ΔV|, pH per mL. */
  maxSlope: number;
  /** Midpoint volumes that share the largest slope (one unless there is a tie). */
  tiedMidpointsMl: number[];
}

/**
 * Inflection-point endpoint: the midpoint with the largest |ΔpH/ΔV|; ties average the first and
 * last tied midpoints [USGS NFM A6.6.4.B; tie rule common practice]. The carbonate endpoint is
 * sought only when the first reading is above pH 8.3 [IUPAC Gold Book 09038: P = 0 at or below
 * 8.3]. The endpoint volume is the exact decimal mean of the tied midpoints. Returns null when
 * the window holds no slope.
 */
export function inflectionEndpoint(
  readings: readonly Reading[],
  region: InflectionRegion,
  window: { minPh: number; maxPh: number } = INFLECTION_WINDOWS[region],
): InflectionEndpoint | null {
  if (readings.length < 2) throw inputError('readings', 'at least two readings are needed');
  if (region === 'carbonate' && !(readings[0].pH > ENDPOINT_PH.phenolphthalein)) return null;
  const candidates = pairSlopes(readings).filter((s) => s.pH > window.minPh && s.pH < window.maxPh);
  if (candidates.length === 0) return null;
  const max = Math.max(...candidates.map((c) => Math.abs(c.slope)));
  if (max === 0) return null;
  // Slopes within a part in 10^9 of the maximum count as tied: readings rounded to 0.01 pH tie
  // exactly in decimal but not always in binary, nor after volumes are scaled or converted.
  const tied = candidates.filter((c) => Math.abs(c.slope) >= max * (1 - TIE_RELATIVE_TOLERANCE));
  const midpoint = (c: PairSlope) => new Dec(readings[c.index].volumeMl).plus(readings[c.index + 1].volumeMl).div(2);
  const volumeMl = midpoint(tied[0]).plus(midpoint(tied[tied.length - 1])).div(2);
  return {
    region,
    volumeMl,
    pH: phAtVolume(readings, volumeMl.toNumber()),
    maxSlope: clean(max),
    tiedMidpointsMl: tied.map((t) => clean(t.volumeMl)),
  };
}

export interface GranPoint {
  volumeMl: number;
  pH: number;
  /** F1 = (V_s + V_t) × 10^−pH, mL·mol/L. */
  f1: number;
}

export interface GranResult {
  slope: number;
  intercept: number;
  r: number;
  rSquared: number;
  n: number;
  /** −intercept / slope, mL. */
  equivalenceVolumeMl: number;
  /** slope / N, near 1/γ1 when the titration is sound; only when the normality is given. */
  slopeToNormalityRatio: number | null;
  minPh: number;
  maxPh: number;
  points: GranPoint[];
}

/**
 * Default Gran window, pH 3.0–4.0. The method text says about 4.5 down to 3.0; just past the
 * equivalence CO2 still adds H+ (K1·C_T/{H+} is about 9 % of {H+} at pH 4.0 in a 2.3 mM
 * carbonate water and 1 % at pH 3.5), which bends F1, so points above pH 4.0 are left out
 * unless asked for [computed here with the closed-system carbonate model of curve.ts; NFM A6.6.4.C].
 */
export const GRAN_WINDOW = { minPh: 3.0, maxPh: 4.0 } as const;

/** Minimum number of points for a Gran fit to be reported. */
export const GRAN_MIN_POINTS = 3;

/**
 * Gran F1 = (V_s + V_t) × 10^−pH, least-squares line over points past the bicarbonate endpoint
 * in the window; V_eq = −intercept/slope [USGS NFM A6.6.4.C; Gran's method]. Returns null with
 * fewer than three points or a slope that does not rise.
 */
export function granEndpoint(
  readings: readonly Reading[],
  sampleVolumeMl: number,
  options: { minPh?: number; maxPh?: number; titrantNormality?: number } = {},
): GranResult | null {
  const minPh = options.minPh ?? GRAN_WINDOW.minPh;
  const maxPh = options.maxPh ?? GRAN_WINDOW.maxPh;
  const start = readings.findIndex((r) => r.pH <= maxPh);
  if (start < 0) return null;
  const points: GranPoint[] = readings
    .slice(start)
    .filter((r) => r.pH >= minPh && r.pH <= maxPh)
    .map((r) => ({ volumeMl: r.volumeMl, pH: r.pH, f1: (sampleVolumeMl + r.volumeMl) * 10 ** -r.pH }));
  const n = points.length;
  if (n < GRAN_MIN_POINTS) return null;
  let mx = 0;
  let my = 0;
  for (const p of points) {
    mx += p.volumeMl;
    my += p.f1;
  }
  mx /= n;
  my /= n;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (const p of points) {
    const dx = p.volumeMl - mx;
    const dy = p.f1 - my;
    sxx += dx * dx;
    sxy += dx * dy;
    syy += dy * dy;
  }
  if (sxx === 0 || syy === 0) return null;
  const slope = sxy / sxx;
  if (!(slope > 0)) return null;
  const intercept = my - slope * mx;
  const r = sxy / Math.sqrt(sxx * syy);
  return {
    slope,
    intercept,
    r,
    rSquared: r * r,
    n,
    equivalenceVolumeMl: -intercept / slope,
    slopeToNormalityRatio: options.titrantNormality ? slope / options.titrantNormality : null,
    minPh,
    maxPh,
    points,
  };
}
