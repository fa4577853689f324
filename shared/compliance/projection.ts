import { inputError } from '../errors.js';
import { addDays, assertDate, datesIn, monthOf, monthRange, weekdayOf, weekUnitOf } from './calendar.js';
import { D, meanOf, parseDecimal } from './decimal.js';
import { statusOf, validateLimit } from './evaluate.js';
import { roundDirected, roundToPrecision } from './rounding.js';
import { dailyValues, effectivePart } from './statistics.js';
import type { CalendarOptions, DateRange, Limit, Measurement, Status, Weekday } from './types.js';

/** How often a point is sampled, to count the sampling days still due in a period. */
export type SamplingFrequency =
  | { kind: 'daily' }
  /** On these weekdays (0 = Sunday), e.g. [1, 3, 5] for Monday, Wednesday and Friday. */
  | { kind: 'days_of_week'; days: Weekday[] }
  /** A number of samples per week or month, whenever they fall. */
  | { kind: 'per_period'; count: number };

/**
 * Sampling days due after `after` up to and including `through`; for
 * 'per_period', the count not yet taken (computed here).
 */
export function samplingDaysDue(
  frequency: SamplingFrequency,
  after: string,
  through: string,
  sampledSoFar = 0,
): number {
  assertDate(after, 'after');
  assertDate(through, 'through');
  if (frequency.kind === 'per_period') {
    if (!Number.isInteger(frequency.count) || frequency.count < 0) throw inputError('frequency.count', 'must be a whole number');
    return Math.max(0, frequency.count - sampledSoFar);
  }
  if (through <= after) return 0;
  const dates = datesIn({ start: addDays(after, 1), end: through });
  if (frequency.kind === 'daily') return dates.length;
  if (frequency.kind === 'days_of_week') {
    const days = new Set(frequency.days);
    return dates.filter((d) => days.has(weekdayOf(d))).length;
  }
  throw inputError('frequency.kind', "must be 'daily', 'days_of_week' or 'per_period'");
}

export interface Projection {
  statistic: 'weekly_average' | 'monthly_average';
  bound: Limit['bound'];
  limitValue: string;
  /** Daily values so far. */
  daysSoFar: number;
  remainingSamplingDays: number;
  /** Mean of the daily values so far, unrounded; null with none. */
  currentMean: string | null;
  /** The average at the end of the period if the remaining days equal the current mean, rounded as reported. */
  projectedReported: string | null;
  /** Status of that projected figure against the limit. */
  projectedStatus: Status;
  /** True when the projected figure breaks the limit. */
  crossesLimit: boolean;
  /** The mean the remaining days need (at least, for a minimum; at most, for a maximum), unrounded. */
  requiredMean: string | null;
  /** That figure rounded to the limit's precision toward the safe side. */
  requiredMeanReported: string | null;
  /** False when no remaining results could bring the average within the limit. */
  achievable: boolean;
  sentence: string;
}

/**
 * Project a weekly or monthly average at the current mean of the daily values
 * so far, and the mean the remaining sampling days need (computed here from
 * the 40 CFR 122.2 average: (sum + r·x)/(n + r) against the limit). The needed
 * mean is taken against the limit itself, ignoring the rounding margin, so
 * meeting it always suffices.
 */
export function projectAverage(
  limit: Limit,
  dailyValuesSoFar: readonly string[],
  remainingSamplingDays: number,
  options: { nearFraction?: string } = {},
): Projection {
  validateLimit(limit);
  if (limit.statistic !== 'weekly_average' && limit.statistic !== 'monthly_average') {
    throw inputError('statistic', 'only weekly and monthly averages can be projected');
  }
  if (!Number.isInteger(remainingSamplingDays) || remainingSamplingDays < 0) {
    throw inputError('remainingSamplingDays', 'must be a whole number, 0 or more');
  }
  const statistic = limit.statistic;
  const what = statistic === 'monthly_average' ? 'monthly average' : 'weekly average';
  const unit = ` ${limit.units}`;
  const limitValue = parseDecimal(limit.value, 'limit.value');
  const values = dailyValuesSoFar.map((v, i) => parseDecimal(v, `dailyValues.${i}`));
  const n = values.length;
  const r = remainingSamplingDays;
  const base = {
    statistic,
    bound: limit.bound,
    limitValue: limit.value,
    daysSoFar: n,
    remainingSamplingDays: r,
  };
  // the limit as written (a stored DECIMAL "60.0000" reads 60)
  const against = `against a ${limit.bound} of ${limitValue.toString()}${unit}`;

  if (n === 0) {
    return {
      ...base,
      currentMean: null,
      projectedReported: null,
      projectedStatus: 'no_data',
      crossesLimit: false,
      requiredMean: r > 0 ? limitValue.toString() : null,
      requiredMeanReported: r > 0 ? roundToPrecision(limitValue, limit, limit.roundingMode) : null,
      achievable: r > 0,
      sentence: `No daily values yet, so the ${what} cannot be projected ${against}.`,
    };
  }

  const mean = meanOf(values);
  const projectedReported = roundToPrecision(mean, limit, limit.roundingMode);
  const projectedStatus = statusOf(projectedReported, limit, { nearFraction: options.nearFraction });
  const crossesLimit = projectedStatus === 'exceeded';
  let sentence = `At the current mean the ${what} will be ${projectedReported}${unit} ${against}.`;

  let requiredMean: string | null = null;
  let requiredMeanReported: string | null = null;
  let achievable = !crossesLimit;
  if (r > 0) {
    const sum = values.reduce((s, v) => s.plus(v), new D(0));
    const needed = limitValue.times(n + r).minus(sum).dividedBy(r);
    requiredMean = needed.toString();
    const safe = limit.bound === 'minimum' ? 'up' : 'down';
    requiredMeanReported = roundDirected(needed, limit, safe);
    // Concentrations cannot be negative, so a maximum needing a negative mean is out of reach.
    achievable = limit.bound === 'minimum' || !needed.isNegative();
    const days = r === 1 ? 'the 1 sampling day still due' : `the ${r} sampling days still due`;
    if (!achievable) {
      sentence += ` Even results of 0 on ${days} would leave it above the maximum.`;
    } else if (limit.bound === 'minimum' && needed.lessThanOrEqualTo(0)) {
      sentence += ` Any results on ${days} keep it at or above the minimum.`;
    } else {
      const direction = limit.bound === 'minimum' ? 'at least' : 'at most';
      sentence += ` To meet the limit, ${days} must average ${direction} ${requiredMeanReported}${unit}.`;
    }
  } else if (crossesLimit) {
    sentence += ' No sampling days remain in the period.';
  }

  return {
    ...base,
    currentMean: mean.toString(),
    projectedReported,
    projectedStatus,
    crossesLimit,
    requiredMean,
    requiredMeanReported,
    achievable,
    sentence,
  };
}

export interface LimitProjection extends Projection {
  /** The week or month being projected. */
  periodStart: string;
  periodEnd: string;
}

/**
 * Project the week or month of `asOf` for an average limit from the results up
 * to and including `asOf`, counting sampling days due after it (computed here).
 */
export function projectLimit(
  limit: Limit,
  measurements: readonly Measurement[],
  asOf: string,
  frequency: SamplingFrequency,
  options: CalendarOptions & { nearFraction?: string },
): LimitProjection {
  validateLimit(limit);
  assertDate(asOf, 'asOf');
  let unit: DateRange;
  if (limit.statistic === 'monthly_average') unit = monthRange(monthOf(asOf));
  else if (limit.statistic === 'weekly_average') unit = weekUnitOf(asOf, options);
  else throw inputError('statistic', 'only weekly and monthly averages can be projected');
  const inForce = effectivePart(limit, unit);
  if (!inForce) throw inputError('asOf', 'the limit is not in force in this period');
  const soFar = asOf < inForce.start ? null : { start: inForce.start, end: asOf < inForce.end ? asOf : inForce.end };
  const days = soFar ? dailyValues(limit, measurements, soFar, options.timezone) : [];
  const dueFrom = soFar ? soFar.end : addDays(inForce.start, -1);
  const due = samplingDaysDue(frequency, dueFrom, inForce.end, days.length);
  return {
    ...projectAverage(
      limit,
      days.map((d) => d.value),
      due,
      { nearFraction: options.nearFraction },
    ),
    periodStart: unit.start,
    periodEnd: unit.end,
  };
}
