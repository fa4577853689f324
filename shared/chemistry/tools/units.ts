/** Unit conversions for the tools: US customary and SI side by side. */

/** US gallon in litres, exact by definition [NIST Handbook 44, Appendix C]. */
export const LITRES_PER_US_GALLON = 3.785411784;
/** 1 MGD = 10⁶ US gal/d = 3785.411784 m³/d [from the exact gallon]. */
export const M3_PER_DAY_PER_MGD = LITRES_PER_US_GALLON * 1000;
/** Pound in kilograms, exact by definition [NIST Handbook 44, Appendix C]. */
export const KG_PER_LB = 0.45359237;
/**
 * lb/d = mg/L × MGD × 8.34, the operators' factor (8.345 exactly; 8.34 reads 0.05 % low)
 * [common practice; domain.md 7.1].
 */
export const LB_PER_MG_PER_MGL = 8.34;

/** Flow in MGD to m³/d [exact gallon, NIST Handbook 44]. */
export function mgdToM3PerDay(mgd: number): number {
  return mgd * M3_PER_DAY_PER_MGD;
}

/** Flow in m³/d to MGD [exact gallon, NIST Handbook 44]. */
export function m3PerDayToMgd(m3PerDay: number): number {
  return m3PerDay / M3_PER_DAY_PER_MGD;
}

/** Feed rate, kg/d = mg/L × m³/d ÷ 1000 (1 mg/L = 1 g/m³) [SI]. */
export function feedKgPerDay(doseMgL: number, flowM3PerDay: number): number {
  return (doseMgL * flowM3PerDay) / 1000;
}

/** Feed rate, lb/d = mg/L × MGD × 8.34 [common practice; domain.md 7.1]. */
export function feedLbPerDay(doseMgL: number, flowMgd: number): number {
  return doseMgL * flowMgd * LB_PER_MG_PER_MGL;
}

/** °F to °C [definition of the Fahrenheit scale]. */
export function fahrenheitToCelsius(f: number): number {
  return ((f - 32) * 5) / 9;
}

/** °C to °F [definition of the Fahrenheit scale]. */
export function celsiusToFahrenheit(c: number): number {
  return (c * 9) / 5 + 32;
}

export interface Flow {
  mgd: number;
  m3PerDay: number;
  /** The unit the flow was given in. */
  given: 'mgd' | 'm3PerDay';
}

/** The flow in both units from whichever was given; null when neither [exact gallon, NIST Handbook 44]. */
export function flowOf(input: { flowMgd?: number; flowM3PerDay?: number }): Flow | null {
  if (input.flowMgd !== undefined) return { mgd: input.flowMgd, m3PerDay: mgdToM3PerDay(input.flowMgd), given: 'mgd' };
  if (input.flowM3PerDay !== undefined) return { mgd: m3PerDayToMgd(input.flowM3PerDay), m3PerDay: input.flowM3PerDay, given: 'm3PerDay' };
  return null;
}

export interface FeedRate {
  kgPerDay: number;
  lbPerDay: number;
}

/** A dose at a flow, as kg/d (SI) and lb/d (8.34 factor) [SI; common practice]. */
export function feedRate(doseMgL: number, flow: Flow): FeedRate {
  return { kgPerDay: feedKgPerDay(doseMgL, flow.m3PerDay), lbPerDay: feedLbPerDay(doseMgL, flow.mgd) };
}
