/**
 * The compliance engine's data shapes. Every figure is a decimal string so that
 * a stored or compared value never depends on binary floating point.
 * Calendar dates ("YYYY-MM-DD") are local dates in the facility's timezone;
 * instants ("2024-03-01T05:30:00Z") carry their own offset.
 */

/** Database ids arrive as numbers or strings; the engine compares them as strings. */
export type EntityId = string | number;

export const PARAMETERS = [
  'total_alkalinity',
  'phenolphthalein_alkalinity',
  'acidity',
  'ph',
  'bicarbonate',
  'carbonate',
  'hydroxide',
] as const;
export type Parameter = (typeof PARAMETERS)[number];

export const STATISTICS = ['instantaneous', 'daily', 'weekly_average', 'monthly_average'] as const;
export type Statistic = (typeof STATISTICS)[number];

export const BOUNDS = ['minimum', 'maximum'] as const;
export type Bound = (typeof BOUNDS)[number];

export const UNITS = ['mg/L as CaCO3', 'S.U.'] as const;
export type Units = (typeof UNITS)[number];

export const ROUNDING_MODES = ['half_up', 'half_even'] as const;
/** half_up: EPA Water Supply Guidance Memo 21 (5–9 round up); half_even: SM 1050 B. */
export type RoundingMode = (typeof ROUNDING_MODES)[number];

export const BELOW_RL_RULES = ['zero', 'half', 'limit'] as const;
/** How a result below the reporting limit counts in an average: 0, RL/2 or RL (domain.md 7.4). */
export type BelowReportingLimitRule = (typeof BELOW_RL_RULES)[number];

/** A limit states its precision either as significant figures or as decimal places, never both. */
export type Precision =
  | { significantFigures: number; decimals?: undefined }
  | { decimals: number; significantFigures?: undefined };

/** One permit limit. A range (pH 6.0–9.0) is two limits, a minimum and a maximum. */
export type Limit = Precision & {
  id: EntityId;
  pointId: EntityId;
  parameter: Parameter;
  statistic: Statistic;
  bound: Bound;
  /** The limit, e.g. "60" or "6.0". */
  value: string;
  units: Units;
  roundingMode: RoundingMode;
  /**
   * The permit's reporting limit. A result numerically below it is treated as
   * below the reporting limit at this value.
   */
  reportingLimit?: string | null;
  belowReportingLimit: BelowReportingLimitRule;
  /** First local date the limit applies. */
  effectiveFrom: string;
  /** Last local date the limit applies (inclusive); null while open-ended. */
  effectiveTo: string | null;
};

/** One approved result at a monitoring point. */
export interface Measurement {
  resultId: EntityId;
  pointId: EntityId;
  parameter: Parameter;
  /** The result; for a result reported below the reporting limit, the reporting limit it was reported against. */
  value: string;
  belowReportingLimit?: boolean;
  /** ISO 8601 instant with "Z" or an offset. */
  sampledAt: string;
}

/** 'week_end_month': a week belongs to the month in which it ends; 'split': a straddling week is cut at the month boundary. */
export type WeekMonthRule = 'week_end_month' | 'split';

/** 0 = Sunday … 6 = Saturday, as in Date.prototype.getUTCDay. */
export type Weekday = 0 | 1 | 2 | 3 | 4 | 5 | 6;

export interface CalendarOptions {
  /** IANA timezone of the facility, e.g. "America/Chicago". */
  timezone: string;
  /** First day of the calendar week; default 0 (Sunday). */
  weekStartsOn?: Weekday;
  /** Default 'week_end_month'. */
  weekMonthRule?: WeekMonthRule;
}

export interface EvaluationOptions extends CalendarOptions {
  /**
   * How close to the limit, on the safe side, counts as 'near', as a fraction
   * of the limit's magnitude; default "0.1" (10 %).
   */
  nearFraction?: string;
}

/** Inclusive range of local dates. */
export interface DateRange {
  start: string;
  end: string;
}

export type Status = 'within' | 'near' | 'exceeded' | 'no_data';

/** One evaluated period (a measurement, a day, a week or a month) of one limit. */
export interface PeriodRow {
  /** First local date of the period (inclusive). */
  periodStart: string;
  /** Last local date of the period (inclusive). */
  periodEnd: string;
  statistic: Statistic;
  /** The statistic before rounding, or null without data. */
  value: string | null;
  /** The statistic rounded to the limit's precision, "<RL", or null without data. */
  reported: string | null;
  sampleCount: number;
  bound: Bound;
  limitValue: string;
  status: Status;
  measurementIds: EntityId[];
  /** Only on instantaneous rows: the instant of the single measurement. */
  sampledAt?: string;
}

export interface ExceedanceRecord {
  limitId: EntityId;
  pointId: EntityId;
  parameter: Parameter;
  statistic: Statistic;
  bound: Bound;
  periodStart: string;
  periodEnd: string;
  value: string;
  reported: string;
  limitValue: string;
  units: Units;
  measurementIds: EntityId[];
}

/** One limit's result for a month, for the Compliance view and the monthly report. */
export interface LimitMonthSummary {
  limitId: EntityId;
  pointId: EntityId;
  parameter: Parameter;
  statistic: Statistic;
  bound: Bound;
  limitValue: string;
  units: Units;
  /** The most adverse row's unrounded value (for a monthly average, the average itself). */
  value: string | null;
  /** The most adverse row's reported value. */
  reported: string | null;
  /** Measurements behind the rows. */
  sampleCount: number;
  /** The most severe status of any row. */
  status: Status;
  exceedanceCount: number;
  /** Every measurement (instantaneous), day (daily), week (weekly) or the month (monthly). */
  rows: PeriodRow[];
}

export interface MonthEvaluation {
  month: string;
  timezone: string;
  limits: LimitMonthSummary[];
  exceedances: ExceedanceRecord[];
}
