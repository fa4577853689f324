import { describe, expect, it } from 'vitest';
import {
  evaluateLimit,
  evaluateMonth,
  limitErrors,
  monthRange,
  statusOf,
  validateLimit,
  type Limit,
  type Measurement,
} from '@shared/compliance/index.js';
import { InputError } from '@shared/errors.js';
import { makeLimit, makeMeasurement, noon } from './builders.js';

const CHICAGO = { timezone: 'America/Chicago' } as const;
const MARCH = monthRange('2024-03');

/** Readings on consecutive March days at noon. */
function onMarchDays(values: readonly string[], extra: Partial<Measurement> = {}): Measurement[] {
  return values.map((v, i) => makeMeasurement(v, noon(`2024-03-${String(i + 1).padStart(2, '0')}`), extra));
}

describe('domain.md 7a: a pH range 6.0–9.0 compared at one decimal', () => {
  // domain.md 7a (computed here): the ten readings, one per day
  const readings = ['7.12', '6.95', '6.04', '5.94', '7.40', '8.91', '9.05', '7.00', '6.50', '9.04'];
  const pH = { parameter: 'ph', units: 'S.U.', statistic: 'instantaneous', decimals: 1 } as const;

  it.each([
    // mode, reported minimum, reported maximum, exceedances — domain.md 7a
    ['half_up', '5.9', '9.1', 2], // EPA WSG Memo 21: 9.05 → 9.1
    ['half_even', '5.9', '9.0', 1], // SM 1050 B: 9.05 → 9.0
  ] as const)('%s: min %s, max %s, %i exceedances', (mode, lowest, highest, count) => {
    const limits: Limit[] = [
      makeLimit({ ...pH, id: 'pH-min', bound: 'minimum', value: '6.0', roundingMode: mode }),
      makeLimit({ ...pH, id: 'pH-max', bound: 'maximum', value: '9.0', roundingMode: mode }),
    ];
    const result = evaluateMonth(limits, onMarchDays(readings, { parameter: 'ph' }), '2024-03', 'America/Chicago');
    const [min, max] = result.limits;
    expect(min.reported).toBe(lowest);
    expect(max.reported).toBe(highest);
    expect(min.rows).toHaveLength(10);
    expect(result.exceedances).toHaveLength(count);
    expect(min.exceedanceCount + max.exceedanceCount).toBe(count);
    expect(result.exceedances.find((e) => e.limitId === 'pH-min')?.reported).toBe('5.9');
  });

  it('reports every rounded reading in order', () => {
    const limit = makeLimit({ ...pH, bound: 'maximum', value: '9.0' });
    const rows = evaluateLimit(limit, onMarchDays(readings, { parameter: 'ph' }), MARCH, CHICAGO);
    // domain.md 7a, half-up column
    expect(rows.map((r) => r.reported)).toEqual(['7.1', '7.0', '6.0', '5.9', '7.4', '8.9', '9.1', '7.0', '6.5', '9.0']);
    expect(rows.map((r) => r.status)).toEqual([
      'within', 'within', 'within', 'within', 'within', 'near', 'exceeded', 'within', 'within', 'near',
    ]);
  });

  it('takes the extreme of the day for a daily pH limit, never the mean (domain.md 7.1, common practice)', () => {
    const day = ['2024-03-05T08:00:00-06:00', '2024-03-05T12:00:00-06:00', '2024-03-05T16:00:00-06:00'];
    const ms = ['8.0', '8.5', '9.2'].map((v, i) => makeMeasurement(v, day[i], { parameter: 'ph' }));
    const max = makeLimit({ ...pH, statistic: 'daily', bound: 'maximum', value: '9.0' });
    const min = makeLimit({ ...pH, statistic: 'daily', bound: 'minimum', value: '6.0' });
    // the mean 8.57 would pass; the day's highest reading, 9.2, does not
    expect(evaluateLimit(max, ms, MARCH, CHICAGO)[0]).toMatchObject({ reported: '9.2', status: 'exceeded', sampleCount: 3 });
    expect(evaluateLimit(min, ms, MARCH, CHICAGO)[0]).toMatchObject({ reported: '8.0', status: 'within' });
  });
});

describe('domain.md 7b: daily minimum 50 and monthly-average minimum 60', () => {
  // domain.md 7b: eight results, one a day
  const results = onMarchDays(['72', '65', '58', '49.6', '81', '66', '70.4', '55']);

  it('rounds 49.6 to 50 before comparing, so the daily minimum holds', () => {
    const daily = makeLimit({ statistic: 'daily', bound: 'minimum', value: '50', decimals: 0 });
    const summary = evaluateMonth([daily], results, '2024-03', 'America/Chicago').limits[0];
    expect(summary.sampleCount).toBe(8); // n = 8
    expect(summary.value).toBe('49.6');
    expect(summary.reported).toBe('50');
    expect(summary.exceedanceCount).toBe(0);
    expect(summary.status).toBe('near'); // computed here: 50 is within 10 % above the minimum
    expect(summary.rows.map((r) => r.reported)).toContain('81'); // max 81
  });

  it('averages the unrounded daily values: 517/8 = 64.625, reported 65, compliant', () => {
    const monthly = makeLimit({ statistic: 'monthly_average', bound: 'minimum', value: '60', decimals: 0 });
    const [row] = evaluateLimit(monthly, results, MARCH, CHICAGO);
    expect(row).toMatchObject({
      periodStart: '2024-03-01',
      periodEnd: '2024-03-31',
      value: '64.625',
      reported: '65',
      sampleCount: 8,
      status: 'near', // computed here: 65 ≤ 66, within 10 % of the minimum, not exceeded
    });
    expect(row.measurementIds).toEqual(results.map((m) => m.resultId));
  });
});

describe('domain.md 7c: results below the reporting limit in an average', () => {
  // domain.md 7c: 3.1, <2.0, 2.6, <2.0 with RL 2.0, one a day; a flagged result carries its RL as value
  const results = [
    makeMeasurement('3.1', noon('2024-03-04'), { parameter: 'hydroxide' }),
    makeMeasurement('2.0', noon('2024-03-05'), { parameter: 'hydroxide', belowReportingLimit: true }),
    makeMeasurement('2.6', noon('2024-03-06'), { parameter: 'hydroxide' }),
    makeMeasurement('2.0', noon('2024-03-07'), { parameter: 'hydroxide', belowReportingLimit: true }),
  ];

  it.each([
    // rule, unrounded, reported — domain.md 7c (permit-specific rule, domain.md 7.4)
    ['zero', '1.425', '1.4'],
    ['limit', '2.425', '2.4'],
    ['half', '1.925', '1.9'],
  ] as const)('counting them as %s gives %s, reported %s', (rule, value, reported) => {
    const limit = makeLimit({
      parameter: 'hydroxide',
      statistic: 'monthly_average',
      bound: 'maximum',
      value: '5.0',
      decimals: 1,
      reportingLimit: '2.0',
      belowReportingLimit: rule,
    });
    expect(evaluateLimit(limit, results, MARCH, CHICAGO)[0]).toMatchObject({ value, reported, sampleCount: 4 });
  });

  it("treats an unflagged result below the limit's reporting limit as below it", () => {
    // same as 7c, but the second result arrives as a bare 1.5 against the permit RL of 2.0
    const bare = results.map((m, i) => (i === 1 ? { ...m, value: '1.5', belowReportingLimit: false } : m));
    const limit = makeLimit({
      parameter: 'hydroxide',
      statistic: 'monthly_average',
      bound: 'maximum',
      value: '5.0',
      decimals: 1,
      reportingLimit: '2.0',
      belowReportingLimit: 'limit',
    });
    expect(evaluateLimit(limit, bare, MARCH, CHICAGO)[0].value).toBe('2.425'); // domain.md 7c, ND = RL
  });

  const allBelow = [
    makeMeasurement('2.0', noon('2024-03-04'), { belowReportingLimit: true }),
    makeMeasurement('2.0', noon('2024-03-05'), { belowReportingLimit: true }),
  ];

  it.each([
    // bound, limit, status — domain.md 7.4 (common practice): "<RL" against a minimum is an
    // exceedance when the RL itself is below the limit
    ['minimum', '5.0', 'exceeded'],
    ['minimum', '2.0', 'within'], // RL not below the limit: no exceedance can be shown
    ['minimum', '1.0', 'within'],
    ['maximum', '1.0', 'within'], // a value below the RL cannot be shown to exceed a maximum
    ['maximum', '5.0', 'within'],
  ] as const)('all below the RL: reported "<RL"; against a %s of %s → %s', (bound, value, status) => {
    for (const rule of ['zero', 'half', 'limit'] as const) {
      const limit = makeLimit({ statistic: 'monthly_average', bound, value, decimals: 1, belowReportingLimit: rule });
      expect(evaluateLimit(limit, allBelow, MARCH, CHICAGO)[0]).toMatchObject({ reported: '<RL', status, sampleCount: 2 });
    }
  });

  it('shows an instantaneous result below the RL as "<RL"', () => {
    const limit = makeLimit({ statistic: 'instantaneous', bound: 'minimum', value: '20', reportingLimit: '5' });
    const rows = evaluateLimit(limit, [makeMeasurement('3', noon('2024-03-04'))], MARCH, CHICAGO);
    expect(rows[0]).toMatchObject({ reported: '<RL', value: '0', status: 'exceeded' }); // RL 5 < 20
  });
});

describe('the rounding boundary of issue 6: a minimum of 20 mg/L', () => {
  it.each([
    // value, precision, reported, status — NC DWR 2015 / NYSDEC DMR Manual: round to the limit's
    // figures, then compare; expected figures computed here
    ['19.96', { significantFigures: 2 }, '20', 'near'],
    ['19.94', { significantFigures: 2 }, '20', 'near'], // 19.94 keeps two figures as 20, not 19
    ['19.5', { significantFigures: 2 }, '20', 'near'], // the lowest figure that still reports 20
    ['19.49', { significantFigures: 2 }, '19', 'exceeded'],
    ['19.96', { significantFigures: 3 }, '20.0', 'near'], // a limit of 20.0: three figures
    ['19.94', { significantFigures: 3 }, '19.9', 'exceeded'],
  ] as const)('%s at %o → %s, %s', (value, precision, reported, status) => {
    for (const roundingMode of ['half_up', 'half_even'] as const) {
      const limit = makeLimit({ statistic: 'daily', bound: 'minimum', value: '20', roundingMode, ...precision });
      const [row] = evaluateLimit(limit, [makeMeasurement(value, noon('2024-03-04'))], MARCH, CHICAGO);
      expect(row.reported).toBe(reported);
      expect(row.status).toBe(status);
      expect(row.value).toBe(value); // the unrounded figure is kept
    }
  });
});

describe('several samples in one day (40 CFR 122.2 "daily discharge": the mean of the day)', () => {
  const times = ['2024-03-05T07:00:00-06:00', '2024-03-05T12:00:00-06:00', '2024-03-05T17:00:00-06:00'];
  const samples = ['120', '80', '91'].map((v, i) => makeMeasurement(v, times[i]));

  it('averages the day: (120 + 80 + 91)/3 = 97, below the daily maximum of 100', () => {
    const daily = makeLimit({ statistic: 'daily', bound: 'maximum', value: '100', significantFigures: 3 });
    const rows = evaluateLimit(daily, samples, MARCH, CHICAGO);
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({
      periodStart: '2024-03-05',
      periodEnd: '2024-03-05',
      value: '97',
      reported: '97.0',
      sampleCount: 3,
      status: 'near', // computed here: 97 ≥ 90
      measurementIds: samples.map((m) => m.resultId),
    });
  });

  it('judges each sample against an instantaneous maximum: only the 120 exceeds', () => {
    const inst = makeLimit({ statistic: 'instantaneous', bound: 'maximum', value: '100', significantFigures: 3 });
    const rows = evaluateLimit(inst, samples, MARCH, CHICAGO);
    expect(rows.map((r) => [r.reported, r.status])).toEqual([
      ['120', 'exceeded'],
      ['80.0', 'within'],
      ['91.0', 'near'],
    ]);
    expect(rows[0].sampledAt).toBe(times[0]);
  });
});

describe('a timezone boundary at midnight (America/Chicago)', () => {
  // computed here: 05:30Z on 2 March is 23:30 CST on 1 March
  const samples = [
    makeMeasurement('90', '2024-03-01T14:00:00Z'), // 08:00 CST, 1 March
    makeMeasurement('130', '2024-03-02T05:30:00Z'), // 23:30 CST, 1 March (UTC: 2 March)
    makeMeasurement('70', '2024-03-02T06:30:00Z'), // 00:30 CST, 2 March
  ];
  const daily = makeLimit({ statistic: 'daily', bound: 'maximum', value: '100', significantFigures: 3 });

  it('puts the 23:30 sample in its local day: 1 March averages 110 and exceeds', () => {
    const rows = evaluateLimit(daily, samples, MARCH, CHICAGO);
    expect(rows.map((r) => [r.periodStart, r.value, r.status])).toEqual([
      ['2024-03-01', '110', 'exceeded'],
      ['2024-03-02', '70', 'within'],
    ]);
  });

  it('would read differently in UTC (1 March 90, 2 March 100), which shows the zone is used', () => {
    const rows = evaluateLimit(daily, samples, MARCH, { timezone: 'UTC' });
    expect(rows.map((r) => [r.periodStart, r.value, r.status])).toEqual([
      ['2024-03-01', '90', 'near'],
      ['2024-03-02', '100', 'near'],
    ]);
  });

  it('counts 23:30 local on 31 March in March, though UTC says April', () => {
    const monthly = makeLimit({ statistic: 'monthly_average', bound: 'maximum', value: '100', significantFigures: 3 });
    const lastEvening = [makeMeasurement('50', '2024-04-01T04:30:00Z')]; // 23:30 CDT, 31 March
    expect(evaluateLimit(monthly, lastEvening, MARCH, CHICAGO)[0]).toMatchObject({ value: '50', sampleCount: 1 });
    expect(evaluateLimit(monthly, lastEvening, monthRange('2024-04'), CHICAGO)[0].status).toBe('no_data');
  });
});

describe('a week that crosses a month (Sunday weeks; 25 Feb – 2 Mar 2024)', () => {
  // Mon 26 Feb 110, Wed 28 Feb 120, Fri 1 Mar 80
  const samples = [
    makeMeasurement('110', noon('2024-02-26')),
    makeMeasurement('120', noon('2024-02-28')),
    makeMeasurement('80', noon('2024-03-01')),
  ];
  const weekly = makeLimit({ statistic: 'weekly_average', bound: 'maximum', value: '100', significantFigures: 3 });

  it("week_end_month (common practice): the whole week is March's, (110+120+80)/3 = 103.3 → 103, exceeded", () => {
    const march = evaluateLimit(weekly, samples, MARCH, CHICAGO);
    expect(march).toHaveLength(5);
    expect(march[0]).toMatchObject({
      periodStart: '2024-02-25',
      periodEnd: '2024-03-02',
      reported: '103',
      status: 'exceeded',
      sampleCount: 3,
    });
    expect(march[0].value?.startsWith('103.333333')).toBe(true);
    expect(march.slice(1).every((r) => r.status === 'no_data')).toBe(true);
    // and February does not also report it
    const feb = evaluateLimit(weekly, samples, monthRange('2024-02'), CHICAGO);
    expect(feb.at(-1)).toMatchObject({ periodStart: '2024-02-18', periodEnd: '2024-02-24', status: 'no_data' });
  });

  it('split: February averages 115 (exceeded) and March 80 (within)', () => {
    const options = { ...CHICAGO, weekMonthRule: 'split' } as const;
    const feb = evaluateLimit(weekly, samples, monthRange('2024-02'), options);
    expect(feb.at(-1)).toMatchObject({ periodStart: '2024-02-25', periodEnd: '2024-02-29', value: '115', status: 'exceeded' });
    const march = evaluateLimit(weekly, samples, MARCH, options);
    expect(march[0]).toMatchObject({ periodStart: '2024-03-01', periodEnd: '2024-03-02', value: '80', reported: '80.0', status: 'within' });
  });

  it('averages daily values, not samples: two samples on one day count once', () => {
    // computed here: days 110 and mean(120, 60) = 90 → (110 + 90)/2 = 100, not (110+120+60)/3 = 96.7
    const ms = [
      makeMeasurement('110', noon('2024-03-04')),
      makeMeasurement('120', '2024-03-06T08:00:00-06:00'),
      makeMeasurement('60', '2024-03-06T16:00:00-06:00'),
    ];
    const [, week] = evaluateLimit(weekly, ms, MARCH, CHICAGO);
    expect(week).toMatchObject({ periodStart: '2024-03-03', value: '100', reported: '100', status: 'near' });
  });

  it('honours a Monday week start', () => {
    const rows = evaluateLimit(weekly, samples, MARCH, { ...CHICAGO, weekStartsOn: 1 });
    expect(rows[0]).toMatchObject({ periodStart: '2024-02-26', periodEnd: '2024-03-03' });
  });
});

describe('statusOf: within, near and exceeded', () => {
  it.each([
    // reported, bound, limit, fraction, status — computed here; "near" = within the margin on the safe side
    ['59', 'minimum', '60', undefined, 'exceeded'],
    ['60', 'minimum', '60', undefined, 'near'],
    ['66', 'minimum', '60', undefined, 'near'],
    ['67', 'minimum', '60', undefined, 'within'],
    ['101', 'maximum', '100', undefined, 'exceeded'],
    ['100', 'maximum', '100', undefined, 'near'],
    ['90', 'maximum', '100', undefined, 'near'],
    ['89', 'maximum', '100', undefined, 'within'],
    ['95', 'maximum', '100', '0.02', 'within'],
    ['61', 'minimum', '60', '0', 'within'],
  ] as const)('%s against a %s of %s (margin %s) → %s', (reported, bound, value, nearFraction, status) => {
    expect(statusOf(reported, { bound, value }, { nearFraction })).toBe(status);
  });
});

describe('evaluateMonth', () => {
  const samples = onMarchDays(['72', '45', '58', '49', '81']);
  const limits: Limit[] = [
    makeLimit({ id: 'daily-min', statistic: 'daily', bound: 'minimum', value: '50', decimals: 0 }),
    makeLimit({ id: 'weekly-min', statistic: 'weekly_average', bound: 'minimum', value: '60', decimals: 0 }),
    makeLimit({ id: 'monthly-min', statistic: 'monthly_average', bound: 'minimum', value: '60', decimals: 0 }),
    makeLimit({ id: 'other-point', pointId: 'P2', statistic: 'daily', bound: 'minimum', value: '50', decimals: 0 }),
    makeLimit({ id: 'expired', statistic: 'daily', bound: 'minimum', value: '50', decimals: 0, effectiveTo: '2024-02-29' }),
  ];
  const result = evaluateMonth(limits, samples, '2024-03', 'America/Chicago');
  const byId = Object.fromEntries(result.limits.map((s) => [s.limitId, s]));

  it('leaves out a limit not in force that month', () => {
    expect(result.limits.map((s) => s.limitId)).toEqual(['daily-min', 'weekly-min', 'monthly-min', 'other-point']);
  });

  it('gives a daily limit its worst value and its count of exceedances', () => {
    // computed here: 45 and 49 fall below 50
    expect(byId['daily-min']).toMatchObject({ reported: '45', status: 'exceeded', exceedanceCount: 2, sampleCount: 5 });
  });

  it('gives a weekly limit each week', () => {
    // computed here: week 25 Feb–2 Mar holds 1–2 Mar (72, 45) → 58.5 → 59 (half-up); 3–9 Mar (58, 49, 81) → 62.67 → 63
    const rows = byId['weekly-min'].rows;
    expect(rows.map((r) => r.reported)).toEqual(['59', '63', null, null, null]);
    expect(rows.map((r) => r.status)).toEqual(['exceeded', 'near', 'no_data', 'no_data', 'no_data']);
  });

  it('gives a monthly limit the average', () => {
    // computed here: (72 + 45 + 58 + 49 + 81)/5 = 61
    expect(byId['monthly-min']).toMatchObject({ value: '61', reported: '61', status: 'near', exceedanceCount: 0 });
  });

  it('reports a limit without data as no_data', () => {
    expect(byId['other-point']).toMatchObject({ status: 'no_data', value: null, reported: null, sampleCount: 0 });
    expect(byId['other-point'].rows).toEqual([expect.objectContaining({ periodStart: '2024-03-01', periodEnd: '2024-03-31' })]);
  });

  it('lists every exceedance with the results behind it', () => {
    expect(result.exceedances.map((e) => [e.limitId, e.periodStart, e.periodEnd, e.reported, e.limitValue])).toEqual([
      ['daily-min', '2024-03-02', '2024-03-02', '45', '50'],
      ['daily-min', '2024-03-04', '2024-03-04', '49', '50'],
      ['weekly-min', '2024-02-25', '2024-03-02', '59', '60'],
    ]);
    expect(result.exceedances[0].measurementIds).toEqual([samples[1].resultId]);
    expect(result.exceedances[2].measurementIds).toEqual([samples[0].resultId, samples[1].resultId]);
  });
});

describe('effective dates', () => {
  it('counts only days the limit is in force', () => {
    const monthly = makeLimit({ statistic: 'monthly_average', bound: 'maximum', value: '100', significantFigures: 3, effectiveFrom: '2024-03-03' });
    const rows = evaluateLimit(monthly, onMarchDays(['500', '500', '60', '80']), MARCH, CHICAGO);
    // computed here: 1–2 March precede the limit; (60 + 80)/2 = 70
    expect(rows).toEqual([expect.objectContaining({ periodStart: '2024-03-03', periodEnd: '2024-03-31', value: '70' })]);
  });
});

describe('validateLimit', () => {
  it.each([
    // overrides, field in error — pH is not averaged arithmetically (domain.md 7.1)
    [{ parameter: 'ph', units: 'S.U.', statistic: 'monthly_average', bound: 'minimum', value: '6.0' }, 'statistic'],
    [{ parameter: 'ph', units: 'S.U.', statistic: 'weekly_average', bound: 'maximum', value: '9.0' }, 'statistic'],
    [{ parameter: 'ph', units: 'mg/L as CaCO3', statistic: 'instantaneous', bound: 'maximum', value: '9.0' }, 'units'],
    [{ parameter: 'ph', units: 'S.U.', statistic: 'instantaneous', bound: 'maximum', value: '15' }, 'value'],
    [{ units: 'S.U.', statistic: 'daily', bound: 'minimum', value: '50' }, 'units'],
    [{ statistic: 'daily', bound: 'minimum', value: 'fifty' }, 'value'],
    [{ statistic: 'daily', bound: 'minimum', value: '50', significantFigures: 2, decimals: 0 }, 'significantFigures'],
    [{ statistic: 'daily', bound: 'minimum', value: '50', decimals: -1 }, 'decimals'],
    [{ statistic: 'daily', bound: 'minimum', value: '50', reportingLimit: '-1' }, 'reportingLimit'],
    [{ statistic: 'daily', bound: 'minimum', value: '50', effectiveFrom: '2024-03-01', effectiveTo: '2024-02-01' }, 'effectiveTo'],
    [{ statistic: 'daily', bound: 'minimum', value: '50', effectiveFrom: '2024-13-01' }, 'effectiveFrom'],
    [{ statistic: 'hourly', bound: 'minimum', value: '50' }, 'statistic'],
  ])('%o is refused on %s', (overrides, field) => {
    const limit = makeLimit(overrides as never);
    expect(Object.keys(limitErrors(limit))).toContain(field);
    expect(() => validateLimit(limit)).toThrow(InputError);
    expect(() => evaluateLimit(limit, [], MARCH, CHICAGO)).toThrow(InputError);
  });

  it('accepts a pH instantaneous or daily limit', () => {
    for (const statistic of ['instantaneous', 'daily'] as const) {
      expect(limitErrors(makeLimit({ parameter: 'ph', units: 'S.U.', statistic, bound: 'minimum', value: '6.0', decimals: 1 }))).toEqual({});
    }
  });

  it('refuses a measurement written as a float or without an offset, naming it', () => {
    const limit = makeLimit({ statistic: 'daily', bound: 'minimum', value: '50' });
    const bad = [makeMeasurement('50', noon('2024-03-01')), makeMeasurement(50 as never, noon('2024-03-02'))];
    expect(() => evaluateLimit(limit, bad, MARCH, CHICAGO)).toThrow(expect.objectContaining({ fields: { 'measurements.1.value': expect.any(String) } }));
    const local = [makeMeasurement('50', '2024-03-01T12:00:00')];
    expect(() => evaluateLimit(limit, local, MARCH, CHICAGO)).toThrow(InputError);
  });
});
