import { describe, expect, it } from 'vitest';
import {
  affectedPeriods,
  calendarWeek,
  localDate,
  monthRange,
  monthsFor,
  weekUnitOf,
  weekUnitsFor,
} from '@shared/compliance/index.js';
import { InputError } from '@shared/errors.js';

describe('localDate: the facility-local calendar day of an instant', () => {
  it.each([
    // instant, zone, local date — 40 CFR 122.2 "calendar day", taken in the facility's zone; offsets computed here
    ['2024-03-02T05:30:00Z', 'America/Chicago', '2024-03-01'], // 23:30 CST, UTC already the next day
    ['2024-03-02T05:59:59Z', 'America/Chicago', '2024-03-01'], // 23:59:59 CST
    ['2024-03-02T06:00:00Z', 'America/Chicago', '2024-03-02'], // 00:00 CST
    ['2024-03-01T23:30:00-06:00', 'America/Chicago', '2024-03-01'], // the same instant written with its offset
    ['2024-03-11T04:30:00Z', 'America/Chicago', '2024-03-10'], // 23:30 CDT on the spring-forward day
    ['2024-11-04T05:30:00Z', 'America/Chicago', '2024-11-03'], // 23:30 CST on the fall-back day
    ['2024-04-01T04:30:00Z', 'America/Chicago', '2024-03-31'], // 23:30 CDT: still March
    ['2024-06-30T12:30:00Z', 'Pacific/Auckland', '2024-07-01'], // 00:30 NZST: already July
    ['2024-03-02T05:30:00Z', 'UTC', '2024-03-02'],
    ['2024-03-02T05:59:59.999999Z', 'America/Chicago', '2024-03-01'], // microseconds, as a database may give them
    ['2024-03-02T11:29:00+05:30', 'America/Chicago', '2024-03-01'], // 05:59 UTC = 23:59 CST
    ['2024-03-02T11:30:00+05:30', 'America/Chicago', '2024-03-02'], // 06:00 UTC = 00:00 CST
  ] as const)('%s in %s is %s', (instant, zone, expected) => {
    expect(localDate(instant, zone)).toBe(expected);
  });

  it.each([
    ['2024-03-01T23:30:00', 'America/Chicago'], // no offset: ambiguous
    ['2024-03-01', 'America/Chicago'],
    ['2024-03-01T24:00:00Z', 'America/Chicago'],
    ['2024-02-30T12:00:00Z', 'America/Chicago'], // not a real date
    ['2024-03-01T12:00:00Z', 'America/Chicagoo'], // not a zone
  ])('refuses %s in %s', (instant, zone) => {
    expect(() => localDate(instant, zone)).toThrow(InputError);
  });
});

describe('calendar weeks and months', () => {
  it.each([
    // date, week start, expected week — computed here (2024-03-01 is a Friday)
    ['2024-03-01', 0, '2024-02-25', '2024-03-02'],
    ['2024-03-01', 1, '2024-02-26', '2024-03-03'],
    ['2024-03-03', 0, '2024-03-03', '2024-03-09'], // a Sunday starts its own week
    ['2024-03-03', 1, '2024-02-26', '2024-03-03'], // a Sunday ends a Monday week
  ] as const)('%s with weeks from day %i: %s to %s', (date, start, from, to) => {
    expect(calendarWeek(date, start)).toEqual({ start: from, end: to });
  });

  it.each([
    ['2024-02', '2024-02-01', '2024-02-29'], // leap year
    ['2023-02', '2023-02-01', '2023-02-28'],
    ['2024-12', '2024-12-01', '2024-12-31'],
  ])('month %s runs %s to %s', (month, start, end) => {
    expect(monthRange(month)).toEqual({ start, end });
  });

  it('lists the months a range overlaps', () => {
    expect(monthsFor({ start: '2023-12-15', end: '2024-02-01' })).toEqual(['2023-12', '2024-01', '2024-02']);
  });

  it.each([
    // date, rule, unit — 'week_end_month' is common practice (a week belongs to the month it ends in)
    ['2024-03-01', 'week_end_month', { start: '2024-02-25', end: '2024-03-02', month: '2024-03' }],
    ['2024-02-27', 'week_end_month', { start: '2024-02-25', end: '2024-03-02', month: '2024-03' }],
    ['2024-03-01', 'split', { start: '2024-03-01', end: '2024-03-02', month: '2024-03' }],
    ['2024-02-27', 'split', { start: '2024-02-25', end: '2024-02-29', month: '2024-02' }],
  ] as const)('%s under %s', (date, rule, unit) => {
    expect(weekUnitOf(date, { weekMonthRule: rule })).toEqual(unit);
  });

  it('gives March 2024 five weeks under week_end_month and six pieces under split (Sunday weeks)', () => {
    // computed here: Sundays in March 2024 are the 3rd, 10th, 17th, 24th and 31st
    const march = monthRange('2024-03');
    expect(weekUnitsFor(march, { weekMonthRule: 'week_end_month' }).map((u) => `${u.start}/${u.end}`)).toEqual([
      '2024-02-25/2024-03-02',
      '2024-03-03/2024-03-09',
      '2024-03-10/2024-03-16',
      '2024-03-17/2024-03-23',
      '2024-03-24/2024-03-30',
    ]);
    expect(weekUnitsFor(march, { weekMonthRule: 'split' }).map((u) => `${u.start}/${u.end}`)).toEqual([
      '2024-03-01/2024-03-02',
      '2024-03-03/2024-03-09',
      '2024-03-10/2024-03-16',
      '2024-03-17/2024-03-23',
      '2024-03-24/2024-03-30',
      '2024-03-31/2024-03-31',
    ]);
  });

  it('refuses a week start outside 0–6 and an unknown rule', () => {
    expect(() => weekUnitOf('2024-03-01', { weekStartsOn: 7 as never })).toThrow(InputError);
    expect(() => weekUnitOf('2024-03-01', { weekMonthRule: 'nearest' as never })).toThrow(InputError);
  });
});

describe('affectedPeriods', () => {
  it.each([
    // instant, rule, day, week, months — computed here; America/Chicago, Sunday weeks
    ['2024-04-01T04:30:00Z', 'week_end_month', '2024-03-31', ['2024-03-31', '2024-04-06', '2024-04'], ['2024-03', '2024-04']],
    ['2024-04-01T04:30:00Z', 'split', '2024-03-31', ['2024-03-31', '2024-03-31', '2024-03'], ['2024-03']],
    ['2024-03-13T15:00:00Z', 'week_end_month', '2024-03-13', ['2024-03-10', '2024-03-16', '2024-03'], ['2024-03']],
    ['2024-03-01T04:00:00Z', 'week_end_month', '2024-02-29', ['2024-02-25', '2024-03-02', '2024-03'], ['2024-02', '2024-03']],
  ] as const)('%s under %s', (instant, rule, day, [start, end, weekMonth], months) => {
    const affected = affectedPeriods(instant, 'America/Chicago', { weekMonthRule: rule });
    expect(affected.day).toBe(day);
    expect(affected.week).toEqual({ start, end, month: weekMonth });
    expect(affected.month).toBe(day.slice(0, 7));
    expect(affected.months).toEqual(months);
  });
});
