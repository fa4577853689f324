import { InputError, inputError } from '../errors.js';
import {
  assertDate,
  assertRange,
  assertTimezone,
  datesIn,
  localDate,
  monthOf,
  monthRange,
  monthsFor,
  weekOptions,
  weekUnitOf,
  weekUnitsFor,
  type WeekUnit,
} from './calendar.js';
import { D, isDecimalString, parseDecimal, type Dec } from './decimal.js';
import { roundToPrecision } from './rounding.js';
import {
  averageAggregate,
  dailyAggregate,
  effectivePart,
  groupByDate,
  prepareMeasurements,
  singleAggregate,
  type Aggregate,
  type LocalDateCache,
  type PreparedMeasurement,
} from './statistics.js';
import {
  BELOW_RL_RULES,
  BOUNDS,
  PARAMETERS,
  ROUNDING_MODES,
  STATISTICS,
  type CalendarOptions,
  type DateRange,
  type EvaluationOptions,
  type ExceedanceRecord,
  type Limit,
  type LimitMonthSummary,
  type Measurement,
  type MonthEvaluation,
  type PeriodRow,
  type Status,
} from './types.js';

const DEFAULT_NEAR_FRACTION = '0.1';

/**
 * Field errors of a limit, empty when it is acceptable; pH limits may not be
 * averages, because pH is not averaged arithmetically (domain.md 7.1).
 */
export function limitErrors(limit: Limit): Record<string, string> {
  const errors: Record<string, string> = {};
  if (!PARAMETERS.includes(limit.parameter)) errors.parameter = `must be one of ${PARAMETERS.join(', ')}`;
  if (!STATISTICS.includes(limit.statistic)) errors.statistic = `must be one of ${STATISTICS.join(', ')}`;
  if (!BOUNDS.includes(limit.bound)) errors.bound = "must be 'minimum' or 'maximum'";
  if (!ROUNDING_MODES.includes(limit.roundingMode)) errors.roundingMode = "must be 'half_up' or 'half_even'";
  if (!BELOW_RL_RULES.includes(limit.belowReportingLimit)) {
    errors.belowReportingLimit = "must be 'zero', 'half' or 'limit'";
  }
  if (limit.parameter === 'ph') {
    if (limit.units !== 'S.U.') errors.units = 'pH limits are in S.U.';
    if (limit.statistic === 'weekly_average' || limit.statistic === 'monthly_average') {
      errors.statistic = 'pH is not averaged arithmetically; use an instantaneous or daily minimum or maximum';
    }
  } else if (limit.units !== 'mg/L as CaCO3') {
    errors.units = 'alkalinity, acidity and their species are in mg/L as CaCO3';
  }
  if (!isDecimalString(limit.value)) errors.value = 'must be a decimal number written as a string';
  else if (limit.parameter === 'ph' && (new D(limit.value).lessThan(0) || new D(limit.value).greaterThan(14))) {
    errors.value = 'a pH limit lies between 0 and 14';
  }
  const wholeIn = (n: unknown, low: number, high: number) => Number.isInteger(n) && (n as number) >= low && (n as number) <= high;
  const hasFigures = limit.significantFigures != null;
  const hasDecimals = limit.decimals != null;
  if (hasFigures === hasDecimals) errors.significantFigures = 'give either significantFigures or decimals';
  else if (hasFigures && !wholeIn(limit.significantFigures, 1, 20)) errors.significantFigures = 'must be a whole number from 1 to 20';
  else if (hasDecimals && !wholeIn(limit.decimals, 0, 20)) errors.decimals = 'must be a whole number from 0 to 20';
  if (limit.reportingLimit != null) {
    if (!isDecimalString(limit.reportingLimit) || new D(limit.reportingLimit).isNegative()) {
      errors.reportingLimit = 'must be a non-negative decimal number written as a string';
    }
  }
  for (const field of ['effectiveFrom', 'effectiveTo'] as const) {
    const date = limit[field];
    if (field === 'effectiveTo' && date == null) continue;
    try {
      assertDate(date as string, field);
    } catch (e) {
      if (e instanceof InputError) Object.assign(errors, e.fields);
      else throw e;
    }
  }
  if (!errors.effectiveFrom && !errors.effectiveTo && limit.effectiveTo != null && limit.effectiveTo < limit.effectiveFrom) {
    errors.effectiveTo = 'must not be before effectiveFrom';
  }
  return errors;
}

/** Throw an InputError listing every unacceptable field of a limit. */
export function validateLimit(limit: Limit): void {
  const errors = limitErrors(limit);
  const fields = Object.keys(errors);
  if (fields.length > 0) throw new InputError(`limit ${String(limit.id)}: ${fields.map((f) => `${f} ${errors[f]}`).join('; ')}`, errors);
}

/**
 * Status of a reported statistic against a limit: the rounded figure is
 * compared (domain.md 7.3); "<RL" against a minimum is an exceedance when the
 * reporting limit is itself below the limit (domain.md 7.4, common practice).
 */
export function statusOf(
  reported: string,
  limit: Pick<Limit, 'bound' | 'value'>,
  options: { reportingLimit?: string | null; nearFraction?: string } = {},
): Exclude<Status, 'no_data'> {
  const limitValue = parseDecimal(limit.value, 'limit.value');
  if (reported === '<RL') {
    if (limit.bound === 'maximum') return 'within';
    if (options.reportingLimit == null) throw inputError('reportingLimit', 'is needed to judge "<RL" against a minimum');
    // The true value lies below the RL; if the RL is below the limit so is the value.
    return parseDecimal(options.reportingLimit, 'reportingLimit').lessThan(limitValue) ? 'exceeded' : 'within';
  }
  const r = parseDecimal(reported, 'reported');
  const margin = parseDecimal(options.nearFraction ?? DEFAULT_NEAR_FRACTION, 'nearFraction').times(limitValue.abs());
  if (limit.bound === 'minimum') {
    if (r.lessThan(limitValue)) return 'exceeded';
    return r.lessThanOrEqualTo(limitValue.plus(margin)) ? 'near' : 'within';
  }
  if (r.greaterThan(limitValue)) return 'exceeded';
  return r.greaterThanOrEqualTo(limitValue.minus(margin)) ? 'near' : 'within';
}

interface Resolved {
  timezone: string;
  calendar: Required<CalendarOptions>;
  nearFraction: string;
}

function resolveOptions(options: EvaluationOptions): Resolved {
  if (!options || typeof options !== 'object') throw inputError('options', 'must give at least the timezone');
  assertTimezone(options.timezone);
  const nearFraction = options.nearFraction ?? DEFAULT_NEAR_FRACTION;
  const fraction = parseDecimal(nearFraction, 'nearFraction');
  if (fraction.isNegative() || fraction.greaterThanOrEqualTo(1)) throw inputError('nearFraction', 'must be at least 0 and below 1');
  const { weekStartsOn, rule } = weekOptions(options);
  const calendar: Required<CalendarOptions> = { timezone: options.timezone, weekStartsOn, weekMonthRule: rule };
  return { timezone: options.timezone, calendar, nearFraction };
}

function rowFrom(limit: Limit, range: DateRange, agg: Aggregate, nearFraction: string): PeriodRow {
  const reported = agg.allBelowReportingLimit ? '<RL' : roundToPrecision(agg.value, limit, limit.roundingMode);
  return {
    periodStart: range.start,
    periodEnd: range.end,
    statistic: limit.statistic,
    value: agg.value.toString(),
    reported,
    sampleCount: agg.sampleCount,
    bound: limit.bound,
    limitValue: limit.value,
    status: statusOf(reported, limit, { reportingLimit: agg.reportingLimit?.toString() ?? null, nearFraction }),
    measurementIds: agg.measurementIds,
  };
}

function noDataRow(limit: Limit, range: DateRange): PeriodRow {
  return {
    periodStart: range.start,
    periodEnd: range.end,
    statistic: limit.statistic,
    value: null,
    reported: null,
    sampleCount: 0,
    bound: limit.bound,
    limitValue: limit.value,
    status: 'no_data',
    measurementIds: [],
  };
}

function averageRows(
  limit: Limit,
  units: readonly DateRange[],
  byDate: Map<string, PreparedMeasurement[]>,
  nearFraction: string,
): PeriodRow[] {
  const rows: PeriodRow[] = [];
  for (const unit of units) {
    const part = effectivePart(limit, unit);
    if (!part) continue; // the limit is not in force in this period at all
    const days = datesIn(part)
      .map((date) => byDate.get(date))
      .filter((day): day is PreparedMeasurement[] => day !== undefined)
      .map((day) => dailyAggregate(limit, day));
    rows.push(days.length === 0 ? noDataRow(limit, part) : rowFrom(limit, part, averageAggregate(days), nearFraction));
  }
  return rows;
}

function evaluatePrepared(limit: Limit, prepared: PreparedMeasurement[], period: DateRange, resolved: Resolved): PeriodRow[] {
  const { nearFraction, calendar } = resolved;
  const inPeriod = (m: PreparedMeasurement) => m.date >= period.start && m.date <= period.end;
  switch (limit.statistic) {
    case 'instantaneous':
    case 'daily': {
      const byDate = groupByDate(prepared.filter(inPeriod));
      const rows: PeriodRow[] = [];
      for (const [date, day] of byDate) {
        if (limit.statistic === 'daily') {
          rows.push(rowFrom(limit, { start: date, end: date }, dailyAggregate(limit, day), nearFraction));
          continue;
        }
        for (const m of day) {
          rows.push({ ...rowFrom(limit, { start: date, end: date }, singleAggregate(m), nearFraction), sampledAt: m.sampledAt });
        }
      }
      if (rows.length > 0) return rows;
      const part = effectivePart(limit, period);
      return part ? [noDataRow(limit, part)] : [];
    }
    case 'weekly_average': {
      const units = weekUnitsFor(period, calendar);
      return averageRows(limit, units, groupByDate(prepared), nearFraction);
    }
    case 'monthly_average': {
      const units = monthsFor(period).map((month) => monthRange(month));
      return averageRows(limit, units, groupByDate(prepared), nearFraction);
    }
  }
}

/**
 * Evaluate one limit over a local date range: a row per measurement
 * (instantaneous), per sampled day (daily, 40 CFR 122.2 "daily discharge"),
 * per calendar week or per calendar month (averages of daily values, 40 CFR
 * 122.2), each rounded to the limit's precision before comparison (NYSDEC DMR
 * Manual; NC DWR 2015). Weekly and monthly periods are whole: pass the
 * measurements of any week that starts before `period`.
 */
export function evaluateLimit(
  limit: Limit,
  measurements: readonly Measurement[],
  period: DateRange,
  options: EvaluationOptions,
): PeriodRow[] {
  validateLimit(limit);
  assertRange(period);
  const resolved = resolveOptions(options);
  return evaluatePrepared(limit, prepareMeasurements(limit, measurements, resolved.timezone), period, resolved);
}

const SEVERITY: Record<Status, number> = { no_data: 0, within: 1, near: 2, exceeded: 3 };

/** Positive when row a is more adverse than row b for this bound. */
function adversity(bound: Limit['bound'], a: PeriodRow, b: PeriodRow): number {
  const bySeverity = SEVERITY[a.status] - SEVERITY[b.status];
  if (bySeverity !== 0 || a.value === null || b.value === null) return bySeverity;
  // "<RL" sits below every detected figure: worst for a minimum, best for a maximum.
  const figure = (row: PeriodRow): Dec => (row.reported === '<RL' ? new D(-Infinity) : new D(row.value as string));
  const diff = figure(a).comparedTo(figure(b));
  return bound === 'minimum' ? -diff : diff;
}

function summarise(limit: Limit, rows: PeriodRow[]): LimitMonthSummary {
  let worst: PeriodRow | null = null;
  for (const row of rows) if (worst === null || adversity(limit.bound, row, worst) > 0) worst = row;
  return {
    limitId: limit.id,
    pointId: limit.pointId,
    parameter: limit.parameter,
    statistic: limit.statistic,
    bound: limit.bound,
    limitValue: limit.value,
    units: limit.units,
    value: worst?.value ?? null,
    reported: worst?.reported ?? null,
    sampleCount: rows.reduce((n, r) => n + r.sampleCount, 0),
    status: worst?.status ?? 'no_data',
    exceedanceCount: rows.filter((r) => r.status === 'exceeded').length,
    rows,
  };
}

/**
 * Evaluate every limit for a calendar month: one summary per limit in force
 * that month (its most adverse value, its status and exceedance count, and its
 * rows) and the exceedance records (40 CFR 122.2; domain.md 7.2). Under
 * 'week_end_month' pass the results of the week that starts in the month before.
 */
export function evaluateMonth(
  limits: readonly Limit[],
  measurements: readonly Measurement[],
  month: string,
  timezone: string,
  options: Omit<EvaluationOptions, 'timezone'> = {},
): MonthEvaluation {
  const period = monthRange(month);
  const resolved = resolveOptions({ ...options, timezone });
  const cache: LocalDateCache = new Map();
  const summaries: LimitMonthSummary[] = [];
  const exceedances: ExceedanceRecord[] = [];
  for (const limit of limits) {
    validateLimit(limit);
    if (!effectivePart(limit, period)) continue; // not in force this month
    const prepared = prepareMeasurements(limit, measurements, timezone, cache);
    const rows = evaluatePrepared(limit, prepared, period, resolved);
    const summary = summarise(limit, rows);
    summaries.push(summary);
    for (const row of rows) {
      if (row.status !== 'exceeded') continue;
      exceedances.push({
        limitId: limit.id,
        pointId: limit.pointId,
        parameter: limit.parameter,
        statistic: limit.statistic,
        bound: limit.bound,
        periodStart: row.periodStart,
        periodEnd: row.periodEnd,
        value: row.value as string,
        reported: row.reported as string,
        limitValue: limit.value,
        units: limit.units,
        measurementIds: row.measurementIds,
      });
    }
  }
  return { month, timezone, limits: summaries, exceedances };
}

/** The periods one result touches, so that only they are re-evaluated. */
export interface AffectedPeriods {
  /** Facility-local date of the sample. */
  day: string;
  /** The weekly averaging period holding that day, under the week rule. */
  week: WeekUnit;
  /** Calendar month of the day. */
  month: string;
  /** Every month whose evaluation changes: the day's month and the month its week is reported in. */
  months: string[];
}

/**
 * The local day, weekly period and months a new or amended result touches
 * (40 CFR 122.2 calendar day, week and month in the facility's timezone).
 */
export function affectedPeriods(
  sampledAt: string,
  timezone: string,
  options: Omit<CalendarOptions, 'timezone'> = {},
): AffectedPeriods {
  const day = localDate(sampledAt, timezone);
  const week = weekUnitOf(day, options);
  const month = monthOf(day);
  const months = week.month === month ? [month] : [month, week.month].sort();
  return { day, week, month, months };
}
