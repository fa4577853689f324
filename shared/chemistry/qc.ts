import type Decimal from 'decimal.js';
import { inputError } from '../errors.js';
import { FARADAY, GAS_CONSTANT, MOLAR_MASS, kelvin } from './constants.js';
import { Dec, type DecimalValue } from './decimal.js';

/** Relative percent difference of duplicates: |x1 − x2| / ((x1 + x2)/2) × 100 [common practice; SM 1020 B]. */
export function relativePercentDifference(first: DecimalValue, second: DecimalValue): Decimal {
  const a = new Dec(first);
  const b = new Dec(second);
  const mean = a.plus(b).div(2);
  if (mean.isZero()) throw inputError('duplicates', 'both results are zero, so no RPD exists');
  return a.minus(b).abs().div(mean.abs()).times(100);
}

/** Check-standard (LCS) recovery, % = measured / true × 100 [SM 1020 B; 40 CFR 136.7]. */
export function checkStandardRecovery(measured: DecimalValue, trueValue: DecimalValue): Decimal {
  if (new Dec(trueValue).isZero()) throw inputError('trueValue', 'must not be zero');
  return new Dec(measured).div(trueValue).times(100);
}

/** mg/L Na2CO3 to mg/L as CaCO3: × 100.09/105.99 = × 0.9443 [computed from SM 2320 B molar masses]. */
export function na2co3AsCaco3(na2co3MgL: DecimalValue): Decimal {
  return new Dec(na2co3MgL).times(MOLAR_MASS.CaCO3).div(MOLAR_MASS.Na2CO3);
}

/**
 * Matrix-spike recovery, % = (spiked − unspiked) / added × 100 [40 CFR 136.7; common practice].
 * With both volumes given, the unspiked result is first diluted by V_s/(V_s + V_spike).
 */
export function matrixSpikeRecovery(input: {
  spikedResult: DecimalValue;
  unspikedResult: DecimalValue;
  /** Concentration the spike adds to the spiked sample, same unit. */
  spikeAdded: DecimalValue;
  sampleVolumeMl?: DecimalValue;
  spikeVolumeMl?: DecimalValue;
}): Decimal {
  if (new Dec(input.spikeAdded).isZero()) throw inputError('spikeAdded', 'must not be zero');
  let unspiked = new Dec(input.unspikedResult);
  if (input.sampleVolumeMl !== undefined && input.spikeVolumeMl !== undefined) {
    const vs = new Dec(input.sampleVolumeMl);
    unspiked = unspiked.times(vs).div(vs.plus(input.spikeVolumeMl));
  }
  return new Dec(input.spikedResult).minus(unspiked).div(input.spikeAdded).times(100);
}

/** Spike volumes above 1 % of the sample call for the dilution correction [common practice]. */
export function spikeVolumeNeedsCorrection(sampleVolumeMl: DecimalValue, spikeVolumeMl: DecimalValue): boolean {
  return new Dec(spikeVolumeMl).gt(new Dec(sampleVolumeMl).times(0.01));
}

/** Theoretical electrode slope ln(10)·R·T/F, mV per pH (0.19841 × T) [Nernst equation; CODATA R and F]. */
export function nernstSlopeMvPerPh(temperatureC: number): number {
  return ((Math.LN10 * GAS_CONSTANT * kelvin(temperatureC)) / FARADAY) * 1000;
}

export interface BufferReading {
  pH: number;
  mV: number;
}

export interface ElectrodeCalibration {
  /** |ΔmV / ΔpH|, mV per pH. */
  slopeMvPerPh: number;
  theoreticalSlopeMvPerPh: number;
  /** Measured ÷ theoretical × 100. */
  percentSlope: number;
  /** Electrode potential at pH 7.00, mV (the asymmetry offset). */
  offsetMvAtPh7: number;
  /** Buffer pH difference; at least 3 is advised [EPA SW-846 9040C]. */
  bufferSpan: number;
  /** percentSlope inside the acceptance window. */
  accepted: boolean;
  window: { minPercent: number; maxPercent: number };
}

/** Acceptance window for % slope: 95–105 % [common practice; configurable lab setting]. */
export const ELECTRODE_SLOPE_WINDOW = { minPercent: 95, maxPercent: 105 } as const;

/** Two-buffer pH electrode slope, % of Nernst and offset at pH 7 [EPA SW-846 9040C; Nernst equation]. */
export function electrodeCalibration(
  first: BufferReading,
  second: BufferReading,
  temperatureC: number,
  window: { minPercent: number; maxPercent: number } = ELECTRODE_SLOPE_WINDOW,
): ElectrodeCalibration {
  const span = Math.abs(first.pH - second.pH);
  if (span === 0) throw inputError('buffers', 'the two buffers must differ in pH');
  const signedSlope = (second.mV - first.mV) / (second.pH - first.pH);
  const slopeMvPerPh = Math.abs(signedSlope);
  const theoreticalSlopeMvPerPh = nernstSlopeMvPerPh(temperatureC);
  const percentSlope = (slopeMvPerPh / theoreticalSlopeMvPerPh) * 100;
  return {
    slopeMvPerPh,
    theoreticalSlopeMvPerPh,
    percentSlope,
    offsetMvAtPh7: first.mV + signedSlope * (7 - first.pH),
    bufferSpan: span,
    accepted: percentSlope >= window.minPercent && percentSlope <= window.maxPercent,
    window,
  };
}

/** Maximum holding time for acidity and alkalinity, hours: 14 days [40 CFR 136.3 Table II]. */
export const ALKALINITY_HOLDING_TIME_HOURS = 14 * 24;

export interface HoldingTimeStatus {
  elapsedHours: number;
  limitHours: number;
  /** Collection + limit, ISO 8601 UTC. */
  deadline: string;
  exceeded: boolean;
  /** Hours past the deadline (0 when within). */
  exceededByHours: number;
}

function toMillis(value: Date | string | number, field: string): number {
  const ms = value instanceof Date ? value.getTime() : typeof value === 'number' ? value : Date.parse(value);
  if (!Number.isFinite(ms)) throw inputError(field, 'must be a valid date-time');
  return ms;
}

/**
 * Holding-time status from collection and analysis date-times; days count as 24 h so a
 * daylight-saving change does not move the deadline [40 CFR 136.3 Table II; common practice].
 */
export function holdingTime(
  collectedAt: Date | string | number,
  analyzedAt: Date | string | number,
  limitHours: number = ALKALINITY_HOLDING_TIME_HOURS,
): HoldingTimeStatus {
  const start = toMillis(collectedAt, 'collectedAt');
  const end = toMillis(analyzedAt, 'analyzedAt');
  if (end < start) throw inputError('analyzedAt', 'must not be before collectedAt');
  const elapsedHours = (end - start) / 3_600_000;
  const deadline = start + limitHours * 3_600_000;
  return {
    elapsedHours,
    limitHours,
    deadline: new Date(deadline).toISOString(),
    exceeded: end > deadline,
    exceededByHours: Math.max(0, (end - deadline) / 3_600_000),
  };
}
