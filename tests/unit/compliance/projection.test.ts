import { describe, expect, it } from 'vitest';
import { projectAverage, projectLimit, samplingDaysDue } from '@shared/compliance/index.js';
import { InputError } from '@shared/errors.js';
import { makeLimit, makeMeasurement, noon } from './builders.js';

const monthlyMin60 = makeLimit({ statistic: 'monthly_average', bound: 'minimum', value: '60', significantFigures: 2 });

describe('projectAverage (early warning)', () => {
  it("projects issue 6's example: a current mean of 58 against a minimum of 60", () => {
    // computed here: mean(55, 60, 59) = 58; the 5 days still due need (60·8 − 174)/5 = 61.2, rounded up to 62
    const p = projectAverage(monthlyMin60, ['55', '60', '59'], 5);
    expect(p).toMatchObject({
      currentMean: '58',
      projectedReported: '58',
      projectedStatus: 'exceeded',
      crossesLimit: true,
      requiredMean: '61.2',
      requiredMeanReported: '62',
      achievable: true,
      daysSoFar: 3,
      remainingSamplingDays: 5,
    });
    expect(p.sentence).toBe(
      'At the current mean the monthly average will be 58 mg/L as CaCO3 against a minimum of 60 mg/L as CaCO3.' +
        ' To meet the limit, the 5 sampling days still due must average at least 62 mg/L as CaCO3.',
    );
  });

  it.each([
    // daily values, remaining, limit, expected fields — computed here from (sum + r·x)/(n + r) = limit
    // 92.5 reports 93 at two figures; 105 rounds down to the limit's two figures, 100 (the safe side)
    [['90', '95'], 3, 'maximum', '100', { projectedReported: '93', crossesLimit: false, requiredMean: '105', requiredMeanReported: '100', achievable: true }],
    [['99.6', '100.4'], 2, 'maximum', '100', { projectedReported: '100', crossesLimit: false, requiredMean: '100', achievable: true }],
    [['30', '30'], 1, 'maximum', '10', { crossesLimit: true, requiredMean: '-30', achievable: false }],
    [['80', '90'], 2, 'minimum', '30', { crossesLimit: false, requiredMean: '-25', achievable: true }],
    [['55'], 0, 'minimum', '60', { crossesLimit: true, requiredMean: null, achievable: false }],
  ] as const)('%o with %i days due against a %s of %s', (values, remaining, bound, value, expected) => {
    const limit = makeLimit({ statistic: 'weekly_average', bound, value, significantFigures: 2 });
    expect(projectAverage(limit, values, remaining)).toMatchObject(expected);
  });

  it('says so when no result could keep a maximum', () => {
    const limit = makeLimit({ statistic: 'weekly_average', bound: 'maximum', value: '10', significantFigures: 2 });
    expect(projectAverage(limit, ['30', '30'], 1).sentence).toBe(
      'At the current mean the weekly average will be 30 mg/L as CaCO3 against a maximum of 10 mg/L as CaCO3.' +
        ' Even results of 0 on the 1 sampling day still due would leave it above the maximum.',
    );
  });

  it('cannot project without data', () => {
    const p = projectAverage(monthlyMin60, [], 10);
    expect(p).toMatchObject({ currentMean: null, projectedStatus: 'no_data', crossesLimit: false, requiredMean: '60' });
    expect(p.sentence).toContain('cannot be projected');
  });

  it('refuses a limit that is not an average, and a negative day count', () => {
    expect(() => projectAverage(makeLimit({ statistic: 'daily', bound: 'minimum', value: '50' }), ['1'], 1)).toThrow(InputError);
    expect(() => projectAverage(monthlyMin60, ['1'], -1)).toThrow(InputError);
  });
});

describe('samplingDaysDue', () => {
  it.each([
    // frequency, after, through, taken, expected — computed here (10 March 2024 is a Sunday)
    [{ kind: 'daily' }, '2024-03-10', '2024-03-31', 0, 21],
    [{ kind: 'days_of_week', days: [1, 3, 5] }, '2024-03-10', '2024-03-31', 0, 9],
    [{ kind: 'days_of_week', days: [0] }, '2024-03-10', '2024-03-31', 0, 3], // 17, 24, 31
    [{ kind: 'per_period', count: 12 }, '2024-03-10', '2024-03-31', 4, 8],
    [{ kind: 'per_period', count: 4 }, '2024-03-10', '2024-03-31', 6, 0],
    [{ kind: 'daily' }, '2024-03-31', '2024-03-31', 0, 0],
  ] as const)('%o after %s through %s (%i taken) → %i', (frequency, after, through, taken, expected) => {
    expect(samplingDaysDue(frequency as never, after, through, taken)).toBe(expected);
  });
});

describe('projectLimit', () => {
  it('projects the month from results so far and the daily sampling still due', () => {
    // computed here: 1–10 March at 58 each (mean 58); 21 days due; (60·31 − 580)/21 = 60.952… → 61
    const ms = Array.from({ length: 10 }, (_, i) => makeMeasurement('58', noon(`2024-03-${String(i + 1).padStart(2, '0')}`)));
    const p = projectLimit(monthlyMin60, ms, '2024-03-10', { kind: 'daily' }, { timezone: 'America/Chicago' });
    expect(p).toMatchObject({
      periodStart: '2024-03-01',
      periodEnd: '2024-03-31',
      daysSoFar: 10,
      remainingSamplingDays: 21,
      projectedReported: '58',
      crossesLimit: true,
      requiredMeanReported: '61',
    });
    expect(p.requiredMean?.startsWith('60.95238')).toBe(true);
  });

  it('projects a week that began in the previous month (week_end_month)', () => {
    // computed here: week 25 Feb – 2 Mar; Tue 27 Feb 110 and Thu 29 Feb 104 → 107 against a maximum of 100
    const weekly = makeLimit({ statistic: 'weekly_average', bound: 'maximum', value: '100', significantFigures: 3 });
    const ms = [makeMeasurement('110', noon('2024-02-27')), makeMeasurement('104', noon('2024-02-29'))];
    const p = projectLimit(weekly, ms, '2024-02-29', { kind: 'days_of_week', days: [1, 3, 5] }, { timezone: 'America/Chicago' });
    // Friday 1 March is the one sampling day left; it would need 3·100 − 214 = 86
    expect(p).toMatchObject({ periodStart: '2024-02-25', periodEnd: '2024-03-02', projectedReported: '107', remainingSamplingDays: 1, requiredMean: '86' });
  });
});
