import Decimal from 'decimal.js';
import { inputError } from '../errors.js';

/**
 * The compliance engine's own Decimal constructor. A clone keeps our precision
 * and notation settings from leaking into (or being changed by) other code that
 * uses the global decimal.js constructor.
 */
export const D = Decimal.clone({
  // Means of a month of daily values need far fewer than 30 digits; the margin
  // keeps repeated division from ever touching a rounding boundary.
  precision: 30,
  rounding: Decimal.ROUND_HALF_EVEN,
  // Plain notation: a stored figure should never read "1e-7".
  toExpNeg: -40,
  toExpPos: 40,
});
export type Dec = InstanceType<typeof D>;

const DECIMAL_PATTERN = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

/** True when `text` is a finite decimal number written as a string (no binary floats). */
export function isDecimalString(text: unknown): text is string {
  return typeof text === 'string' && DECIMAL_PATTERN.test(text.trim());
}

/** Parse a decimal string or throw an InputError naming `field`. */
export function parseDecimal(text: unknown, field: string): Dec {
  if (!isDecimalString(text)) throw inputError(field, 'must be a decimal number written as a string');
  return new D(text.trim());
}

/** Arithmetic mean of one or more decimals; the caller guarantees a non-empty list. */
export function meanOf(values: readonly Dec[]): Dec {
  let sum = new D(0);
  for (const v of values) sum = sum.plus(v);
  return sum.dividedBy(values.length);
}
