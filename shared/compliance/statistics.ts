import { inputError } from '../errors.js';
import { assertTimezone, instantMs, localDate } from './calendar.js';
import { D, meanOf, parseDecimal, type Dec } from './decimal.js';
import type { DateRange, EntityId, Limit, Measurement } from './types.js';

/** A measurement resolved for one limit: its local date and the figure it counts as. */
export interface PreparedMeasurement {
  resultId: EntityId;
  sampledAt: string;
  /** sampledAt in milliseconds since 1970, for ordering. */
  instant: number;
  /** Facility-local date. */
  date: string;
  /** The figure used in statistics, after the below-reporting-limit rule. */
  counted: Dec;
  belowReportingLimit: boolean;
  /** The reporting limit the result was below, when it was. */
  reportingLimit: Dec | null;
}

/** A statistic over some measurements, before rounding. */
export interface Aggregate {
  value: Dec;
  /** Every measurement behind it was below the reporting limit: report "<RL". */
  allBelowReportingLimit: boolean;
  /** The highest reporting limit among them, for comparing "<RL" with a minimum. */
  reportingLimit: Dec | null;
  measurementIds: EntityId[];
  sampleCount: number;
}

/** A day's value of one limit's parameter at its point. */
export interface DailyValue {
  date: string;
  /** Unrounded. */
  value: string;
  belowReportingLimit: boolean;
  sampleCount: number;
  measurementIds: EntityId[];
}

/** Local-date lookups repeat for every limit at a point; memoise them within one evaluation (one timezone). */
export type LocalDateCache = Map<string, { date: string; instant: number }>;

function sameId(a: EntityId, b: EntityId): boolean {
  return String(a) === String(b);
}

/** True when `date` lies in the limit's effective dates (inclusive). */
export function inEffect(limit: Pick<Limit, 'effectiveFrom' | 'effectiveTo'>, date: string): boolean {
  return date >= limit.effectiveFrom && (limit.effectiveTo == null || date <= limit.effectiveTo);
}

/** The part of `range` inside the limit's effective dates, or null if none. */
export function effectivePart(limit: Pick<Limit, 'effectiveFrom' | 'effectiveTo'>, range: DateRange): DateRange | null {
  const start = range.start < limit.effectiveFrom ? limit.effectiveFrom : range.start;
  const end = limit.effectiveTo != null && limit.effectiveTo < range.end ? limit.effectiveTo : range.end;
  return start <= end ? { start, end } : null;
}

/**
 * The figure a result counts as: itself, or for a result below the reporting
 * limit 0, RL/2 or RL as the limit says (domain.md 7.4, permit-specific).
 */
function countedValue(value: Dec, belowRl: boolean, rl: Dec | null, limit: Limit): Dec {
  if (!belowRl || rl === null) return value;
  if (limit.belowReportingLimit === 'zero') return new D(0);
  if (limit.belowReportingLimit === 'half') return rl.dividedBy(2);
  return rl;
}

/**
 * The measurements of the limit's point and parameter on days the limit is in
 * effect, with local dates and below-reporting-limit substitution applied.
 * A result flagged below the RL carries its RL as its value; an unflagged
 * result numerically below the limit's reportingLimit is treated as below it.
 */
export function prepareMeasurements(
  limit: Limit,
  measurements: readonly Measurement[],
  timezone: string,
  cache: LocalDateCache = new Map(),
): PreparedMeasurement[] {
  assertTimezone(timezone);
  const permitRl = limit.reportingLimit == null ? null : parseDecimal(limit.reportingLimit, 'reportingLimit');
  const out: PreparedMeasurement[] = [];
  measurements.forEach((m, i) => {
    if (!sameId(m.pointId, limit.pointId) || m.parameter !== limit.parameter) return;
    let when = cache.get(m.sampledAt);
    if (when === undefined) {
      const field = `measurements.${i}.sampledAt`;
      when = { date: localDate(m.sampledAt, timezone, field), instant: instantMs(m.sampledAt, field) };
      cache.set(m.sampledAt, when);
    }
    const { date, instant } = when;
    if (!inEffect(limit, date)) return;
    const value = parseDecimal(m.value, `measurements.${i}.value`);
    if (m.belowReportingLimit && value.isNegative()) {
      throw inputError(`measurements.${i}.value`, 'a reporting limit cannot be negative');
    }
    let belowRl = m.belowReportingLimit === true;
    let rl: Dec | null = belowRl ? value : null;
    if (!belowRl && permitRl !== null && value.lessThan(permitRl)) {
      belowRl = true;
      rl = permitRl;
    }
    out.push({
      resultId: m.resultId,
      sampledAt: m.sampledAt,
      instant,
      date,
      counted: countedValue(value, belowRl, rl, limit),
      belowReportingLimit: belowRl,
      reportingLimit: rl,
    });
  });
  return out;
}

function highest(values: readonly (Dec | null)[]): Dec | null {
  let top: Dec | null = null;
  for (const v of values) if (v !== null && (top === null || v.greaterThan(top))) top = v;
  return top;
}

/** One measurement as an aggregate (an instantaneous value). */
export function singleAggregate(m: PreparedMeasurement): Aggregate {
  return {
    value: m.counted,
    allBelowReportingLimit: m.belowReportingLimit,
    reportingLimit: m.reportingLimit,
    measurementIds: [m.resultId],
    sampleCount: 1,
  };
}

/**
 * A day's value: the arithmetic mean of the day's measurements (40 CFR 122.2
 * "daily discharge", concentration limits). pH is not averaged (domain.md 7.1):
 * its daily value is the day's lowest reading for a minimum and highest for a
 * maximum (common practice).
 */
export function dailyAggregate(limit: Limit, day: readonly PreparedMeasurement[]): Aggregate {
  let value: Dec;
  if (limit.parameter === 'ph') {
    value = day[0].counted;
    for (const m of day) {
      if (limit.bound === 'minimum' ? m.counted.lessThan(value) : m.counted.greaterThan(value)) value = m.counted;
    }
  } else {
    value = meanOf(day.map((m) => m.counted));
  }
  return {
    value,
    allBelowReportingLimit: day.every((m) => m.belowReportingLimit),
    reportingLimit: highest(day.map((m) => m.reportingLimit)),
    measurementIds: day.map((m) => m.resultId),
    sampleCount: day.length,
  };
}

/** Mean of daily values: 40 CFR 122.2 "average monthly" (and weekly) discharge limitation. */
export function averageAggregate(days: readonly Aggregate[]): Aggregate {
  return {
    value: meanOf(days.map((d) => d.value)),
    allBelowReportingLimit: days.every((d) => d.allBelowReportingLimit),
    reportingLimit: highest(days.map((d) => d.reportingLimit)),
    measurementIds: days.flatMap((d) => d.measurementIds),
    sampleCount: days.reduce((n, d) => n + d.sampleCount, 0),
  };
}

/** Group prepared measurements by local date, in date order, then by instant within a day. */
export function groupByDate(prepared: readonly PreparedMeasurement[]): Map<string, PreparedMeasurement[]> {
  const sorted = [...prepared].sort(
    (a, b) => (a.date < b.date ? -1 : a.date > b.date ? 1 : a.instant - b.instant),
  );
  const byDate = new Map<string, PreparedMeasurement[]>();
  for (const m of sorted) {
    const list = byDate.get(m.date);
    if (list) list.push(m);
    else byDate.set(m.date, [m]);
  }
  return byDate;
}

/** Daily values of a limit's parameter at its point over a date range (40 CFR 122.2 "daily discharge"). */
export function dailyValues(
  limit: Limit,
  measurements: readonly Measurement[],
  range: DateRange,
  timezone: string,
): DailyValue[] {
  const prepared = prepareMeasurements(limit, measurements, timezone).filter(
    (m) => m.date >= range.start && m.date <= range.end,
  );
  return [...groupByDate(prepared)].map(([date, day]) => {
    const agg = dailyAggregate(limit, day);
    return {
      date,
      value: agg.value.toString(),
      belowReportingLimit: agg.allBelowReportingLimit,
      sampleCount: agg.sampleCount,
      measurementIds: agg.measurementIds,
    };
  });
}

/** Arithmetic mean of decimal strings, unrounded (40 CFR 122.2: sum divided by number). */
export function arithmeticMean(values: readonly string[]): string {
  if (values.length === 0) throw inputError('values', 'need at least one value');
  return meanOf(values.map((v, i) => parseDecimal(v, `values.${i}`))).toString();
}
