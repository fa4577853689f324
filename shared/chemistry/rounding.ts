import Decimal from 'decimal.js';
import { Dec, type DecimalValue } from './decimal.js';

/** `half-up` rounds a trailing 5 away from zero (EPA); `half-even` rounds it to the even digit (SM 1050 B). */
export type RoundingMode = 'half-up' | 'half-even';

function mode(m: RoundingMode): Decimal.Rounding {
  return m === 'half-even' ? Decimal.ROUND_HALF_EVEN : Decimal.ROUND_HALF_UP;
}

/** Rounds to `decimalPlaces`, 5–9 up (away from zero) [EPA Water Supply Guidance Memo 21, 1981]. */
export function roundHalfUp(value: DecimalValue, decimalPlaces: number): Decimal {
  return new Dec(value).toDecimalPlaces(decimalPlaces, Decimal.ROUND_HALF_UP);
}

/** Rounds to `decimalPlaces`, a trailing 5 to the even digit [SM 1050 B]. */
export function roundHalfEven(value: DecimalValue, decimalPlaces: number): Decimal {
  return new Dec(value).toDecimalPlaces(decimalPlaces, Decimal.ROUND_HALF_EVEN);
}

/** Rounds to `significantDigits` significant figures with the given mode [SM 1050 B; EPA WSG Memo 21]. */
export function toSignificant(value: DecimalValue, significantDigits: number, rounding: RoundingMode = 'half-up'): Decimal {
  return new Dec(value).toSignificantDigits(significantDigits, mode(rounding));
}

/** Fixed-point text with trailing zeros kept, e.g. 124 → "124.0" (display only) [SM 1050 B]. */
export function formatDecimalPlaces(value: DecimalValue, decimalPlaces: number, rounding: RoundingMode = 'half-up'): string {
  return new Dec(value).toFixed(decimalPlaces, mode(rounding));
}

/** Text with `significantDigits` significant figures and no exponent, e.g. 0.099520 (display only) [SM 1050 B]. */
export function formatSignificant(value: DecimalValue, significantDigits: number, rounding: RoundingMode = 'half-up'): string {
  const rounded = toSignificant(value, significantDigits, rounding);
  if (rounded.isZero()) return significantDigits > 1 ? `0.${'0'.repeat(significantDigits - 1)}` : '0';
  // Digits after the point needed so the last significant digit shows, trailing zeros included.
  const exponent = rounded.abs().e;
  const places = Math.max(0, significantDigits - 1 - exponent);
  return rounded.toFixed(places);
}

/**
 * The number the calculation API returns: 6 significant figures, far finer than any reporting
 * resolution; the exact decimal string travels beside it for storage [computed here].
 */
export function toApiNumber(value: DecimalValue, significantDigits = 6): number {
  return toSignificant(value, significantDigits, 'half-even').toNumber();
}
