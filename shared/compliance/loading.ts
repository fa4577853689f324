import { inputError } from '../errors.js';
import { parseDecimal } from './decimal.js';

/** Converts mg/L × million gallons per day to lb/d: a gallon of water weighs 8.34 lb (common practice). */
export const POUNDS_PER_DAY_FACTOR = '8.34';

/** Mass loading in lb/d = mg/L × MGD × 8.34 (domain.md 7.1, common practice), unrounded. */
export function massLoadingLbPerDay(concentrationMgL: string, flowMgd: string): string {
  const concentration = parseDecimal(concentrationMgL, 'concentrationMgL');
  const flow = parseDecimal(flowMgd, 'flowMgd');
  if (concentration.isNegative()) throw inputError('concentrationMgL', 'cannot be negative');
  if (flow.isNegative()) throw inputError('flowMgd', 'cannot be negative');
  return concentration.times(flow).times(POUNDS_PER_DAY_FACTOR).toString();
}
