import dayjs from 'dayjs';
import utc from 'dayjs/plugin/utc.js';
import timezone from 'dayjs/plugin/timezone.js';
import { inputError } from '../errors.js';
import type { CalendarOptions, DateRange, WeekMonthRule, Weekday } from './types.js';

dayjs.extend(utc);
dayjs.extend(timezone);

const DAY_MS = 86_400_000;
const DATE_PATTERN = /^(\d{4})-(\d{2})-(\d{2})$/;
const MONTH_PATTERN = /^(\d{4})-(\d{2})$/;
// An instant must say where it is; "2024-03-01T23:30" alone would be read in the host's zone.
const INSTANT_PATTERN =
  /^(\d{4}-\d{2}-\d{2})T([01]\d|2[0-3]):([0-5]\d)(?::([0-5]\d)(?:\.(\d{1,9}))?)?(Z|([+-])([01]\d|2[0-3]):([0-5]\d))$/i;

const knownZones = new Set<string>();

/** Throw an InputError unless `zone` is an IANA timezone the runtime's Intl knows. */
export function assertTimezone(zone: string, field = 'timezone'): void {
  if (knownZones.has(zone)) return;
  try {
    if (typeof zone !== 'string' || zone === '') throw new RangeError('empty');
    new Intl.DateTimeFormat('en-US', { timeZone: zone });
  } catch {
    throw inputError(field, 'must be an IANA timezone such as America/Chicago');
  }
  knownZones.add(zone);
}

/** Milliseconds since 1970 of an ISO 8601 instant that carries Z or an offset, or an InputError. */
export function instantMs(sampledAt: string, field = 'sampledAt'): number {
  const m = typeof sampledAt === 'string' ? INSTANT_PATTERN.exec(sampledAt) : null;
  if (!m) throw inputError(field, 'must be an ISO 8601 instant with Z or an offset');
  // Built from its parts: Date.parse would roll 30 February into March, and
  // engines differ on more than three fractional digits.
  const [, date, hh, mm, ss, fraction, designator, sign, offH, offM] = m;
  const offsetMinutes = designator.toUpperCase() === 'Z' ? 0 : (sign === '-' ? -1 : 1) * (Number(offH) * 60 + Number(offM));
  return (
    dayNumber(date, field) * DAY_MS +
    ((Number(hh) * 60 + Number(mm) - offsetMinutes) * 60 + Number(ss ?? 0)) * 1000 +
    Number((fraction ?? '').padEnd(3, '0').slice(0, 3))
  );
}

/** The facility-local calendar date of an instant (40 CFR 122.2 "calendar day", in the facility's timezone). */
export function localDate(sampledAt: string, zone: string, field = 'sampledAt'): string {
  const ms = instantMs(sampledAt, field);
  assertTimezone(zone);
  return dayjs(ms).tz(zone).format('YYYY-MM-DD');
}

function dayNumber(date: string, field: string): number {
  const m = DATE_PATTERN.exec(date);
  if (!m) throw inputError(field, 'must be a date written YYYY-MM-DD');
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  const ms = Date.UTC(y, mo - 1, d);
  const back = new Date(ms);
  if (back.getUTCFullYear() !== y || back.getUTCMonth() !== mo - 1 || back.getUTCDate() !== d) {
    throw inputError(field, 'is not a real calendar date');
  }
  return ms / DAY_MS;
}

function dateOf(day: number): string {
  return new Date(day * DAY_MS).toISOString().slice(0, 10);
}

/** Throw an InputError unless `date` is a real YYYY-MM-DD date. */
export function assertDate(date: string, field = 'date'): void {
  dayNumber(date, field);
}

/** The date `days` days after `date` (negative for before); plain calendar arithmetic, no DST involved. */
export function addDays(date: string, days: number): string {
  return dateOf(dayNumber(date, 'date') + days);
}

/** Day of the week of a date, 0 = Sunday. */
export function weekdayOf(date: string): Weekday {
  // 1970-01-01 was a Thursday.
  return ((((dayNumber(date, 'date') + 4) % 7) + 7) % 7) as Weekday;
}

/** "YYYY-MM" of a date. */
export function monthOf(date: string): string {
  return date.slice(0, 7);
}

/** First and last date of a calendar month "YYYY-MM". */
export function monthRange(month: string, field = 'month'): DateRange {
  const m = MONTH_PATTERN.exec(month);
  if (!m || Number(m[2]) < 1 || Number(m[2]) > 12) throw inputError(field, 'must be a month written YYYY-MM');
  const y = Number(m[1]);
  const mo = Number(m[2]);
  const last = new Date(Date.UTC(y, mo, 0)).getUTCDate();
  return { start: `${month}-01`, end: `${month}-${String(last).padStart(2, '0')}` };
}

/** The calendar week (7 days from the configured first weekday) that contains `date`. */
export function calendarWeek(date: string, weekStartsOn: Weekday = 0): DateRange {
  const back = (weekdayOf(date) - weekStartsOn + 7) % 7;
  const start = addDays(date, -back);
  return { start, end: addDays(start, 6) };
}

/** A weekly averaging period and the month it is reported in. */
export interface WeekUnit extends DateRange {
  month: string;
}

/** The week options with their defaults (Sunday; 'week_end_month'), or an InputError. */
export function weekOptions(options: Partial<CalendarOptions>): { weekStartsOn: Weekday; rule: WeekMonthRule } {
  const weekStartsOn = options.weekStartsOn ?? 0;
  if (!Number.isInteger(weekStartsOn) || weekStartsOn < 0 || weekStartsOn > 6) {
    throw inputError('weekStartsOn', 'must be 0 (Sunday) to 6 (Saturday)');
  }
  const rule = options.weekMonthRule ?? 'week_end_month';
  if (rule !== 'week_end_month' && rule !== 'split') {
    throw inputError('weekMonthRule', "must be 'week_end_month' or 'split'");
  }
  return { weekStartsOn, rule };
}

/**
 * The weekly averaging period that contains `date`: the whole calendar week
 * reported in the month it ends in ('week_end_month', common practice), or the
 * part of the week inside the date's month ('split').
 */
export function weekUnitOf(date: string, options: Partial<CalendarOptions> = {}): WeekUnit {
  const { weekStartsOn, rule } = weekOptions(options);
  const week = calendarWeek(date, weekStartsOn);
  if (rule === 'week_end_month') return { ...week, month: monthOf(week.end) };
  const month = monthRange(monthOf(date));
  return {
    start: week.start < month.start ? month.start : week.start,
    end: week.end > month.end ? month.end : week.end,
    month: monthOf(date),
  };
}

function overlaps(a: DateRange, b: DateRange): boolean {
  return a.start <= b.end && b.start <= a.end;
}

/** Every date from range.start to range.end inclusive. */
export function datesIn(range: DateRange): string[] {
  const first = dayNumber(range.start, 'period.start');
  const last = dayNumber(range.end, 'period.end');
  const out: string[] = [];
  for (let d = first; d <= last; d++) out.push(dateOf(d));
  return out;
}

/**
 * The weekly periods to evaluate for a date range: those that overlap it and
 * are reported in a month that overlaps it (so for March under
 * 'week_end_month' the week ending 2 March counts and the week ending 6 April
 * does not).
 */
export function weekUnitsFor(range: DateRange, options: Partial<CalendarOptions> = {}): WeekUnit[] {
  const units: WeekUnit[] = [];
  const seen = new Set<string>();
  // Start a week early so that a week owned by the range's first month but
  // starting before the range is found.
  for (let date = addDays(range.start, -6); date <= addDays(range.end, 6); date = addDays(date, 1)) {
    const unit = weekUnitOf(date, options);
    const key = `${unit.start}/${unit.end}`;
    if (seen.has(key)) continue;
    seen.add(key);
    if (overlaps(unit, range) && overlaps(monthRange(unit.month), range)) units.push(unit);
  }
  return units;
}

/** The calendar months "YYYY-MM" that overlap a date range. */
export function monthsFor(range: DateRange): string[] {
  const months: string[] = [];
  for (let month = monthOf(range.start); month <= monthOf(range.end); month = monthOf(addDays(monthRange(month).end, 1))) {
    months.push(month);
  }
  return months;
}

/** Validate an inclusive local date range. */
export function assertRange(range: DateRange, field = 'period'): void {
  if (!range || typeof range !== 'object') throw inputError(field, 'must be {start, end}');
  assertDate(range.start, `${field}.start`);
  assertDate(range.end, `${field}.end`);
  if (range.end < range.start) throw inputError(`${field}.end`, 'must not be before the start');
}
