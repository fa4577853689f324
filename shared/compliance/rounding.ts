import Decimal from 'decimal.js';
import { inputError } from '../errors.js';
import { D, parseDecimal, type Dec } from './decimal.js';
import type { Precision, RoundingMode } from './types.js';

/** A decimal as a string ("19.96") or a decimal.js value; binary floats are refused. */
export type DecimalInput = string | Decimal;

const DECIMAL_ROUNDING: Record<RoundingMode, Decimal.Rounding> = {
  // Ties go away from zero: "5 through 9 round up" on the magnitude.
  half_up: Decimal.ROUND_HALF_UP,
  // Ties go to the even neighbour.
  half_even: Decimal.ROUND_HALF_EVEN,
};

function toDec(value: DecimalInput | number, field: string): Dec {
  if (typeof value === 'string') return parseDecimal(value, field);
  if (typeof value === 'number') {
    // A binary float may already sit off a tie (9.05 is 9.0500000000000007...).
    throw inputError(field, 'must be a decimal string, not a binary floating-point number');
  }
  return new D(value);
}

function checkMode(mode: RoundingMode): Decimal.Rounding {
  const rounding = DECIMAL_ROUNDING[mode];
  if (rounding === undefined) throw inputError('roundingMode', "must be 'half_up' or 'half_even'");
  return rounding;
}

/** Round to N significant figures, half-up (EPA Water Supply Guidance Memo 21) or half-even (SM 1050 B). */
export function roundToSignificantFigures(value: DecimalInput, figures: number, mode: RoundingMode): string {
  if (!Number.isInteger(figures) || figures < 1 || figures > 20) {
    throw inputError('significantFigures', 'must be a whole number from 1 to 20');
  }
  const rounding = checkMode(mode);
  const d = toDec(value, 'value');
  return writeSignificant(d.toSignificantDigits(figures, rounding), figures);
}

// Write out every kept figure ("1.0", not "1") but never in exponent form ("1200", not "1.2e+3").
function writeSignificant(rounded: Dec, figures: number): string {
  if (rounded.isZero()) return '0';
  return rounded.toFixed(Math.max(0, figures - 1 - rounded.e));
}

function dropNegativeZero(text: string): string {
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text;
}

/** Round to N decimal places, half-up (EPA Water Supply Guidance Memo 21) or half-even (SM 1050 B). */
export function roundToDecimals(value: DecimalInput, decimals: number, mode: RoundingMode): string {
  if (!Number.isInteger(decimals) || decimals < 0 || decimals > 20) {
    throw inputError('decimals', 'must be a whole number from 0 to 20');
  }
  const rounding = checkMode(mode);
  const d = toDec(value, 'value');
  // -0.0 carries no information a report should show.
  return dropNegativeZero(d.toFixed(decimals, rounding));
}

/** Round a statistic to a limit's precision before comparing it with the limit (NYSDEC DMR Manual; NC DWR 2015). */
export function roundToPrecision(value: DecimalInput, precision: Precision, mode: RoundingMode): string {
  if (precision.significantFigures !== undefined) {
    return roundToSignificantFigures(value, precision.significantFigures, mode);
  }
  if (precision.decimals !== undefined) return roundToDecimals(value, precision.decimals, mode);
  throw inputError('significantFigures', 'give significantFigures or decimals');
}

/**
 * Round in a stated direction (up = toward +∞, down = toward −∞) at a limit's
 * precision; used where a figure must err to the safe side (computed here).
 */
export function roundDirected(value: DecimalInput, precision: Precision, direction: 'up' | 'down'): string {
  const d = toDec(value, 'value');
  const rounding = direction === 'up' ? Decimal.ROUND_CEIL : Decimal.ROUND_FLOOR;
  if (precision.decimals !== undefined) return dropNegativeZero(d.toFixed(precision.decimals, rounding));
  const figures = precision.significantFigures;
  if (figures === undefined) throw inputError('significantFigures', 'give significantFigures or decimals');
  return writeSignificant(d.toSignificantDigits(figures, rounding), figures);
}
