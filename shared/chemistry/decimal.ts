import Decimal from 'decimal.js';

/**
 * The decimal constructor used for every recorded result. A private clone so that another
 * module calling `Decimal.set()` cannot change how a stored figure is computed; 40 significant
 * digits keep divisions such as A × N × 50,000 / V_s far beyond any reporting resolution.
 */
export const Dec = Decimal.clone({ precision: 40, rounding: Decimal.ROUND_HALF_EVEN, toExpNeg: -40, toExpPos: 40 });

/** A number, numeric string or Decimal accepted wherever a recorded figure is computed. */
export type DecimalValue = Decimal.Value;
