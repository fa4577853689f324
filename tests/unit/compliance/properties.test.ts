import Decimal from 'decimal.js';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  affectedPeriods,
  evaluateLimit,
  evaluateMonth,
  localDate,
  monthRange,
  roundToDecimals,
  roundToSignificantFigures,
  type Limit,
  type Measurement,
  type PeriodRow,
  type Statistic,
  type WeekMonthRule,
  type Weekday,
} from '@shared/compliance/index.js';
import { makeLimit } from './builders.js';

const ZONES = ['America/Chicago', 'America/New_York', 'America/Los_Angeles', 'Pacific/Honolulu', 'Europe/London', 'Asia/Kolkata', 'Pacific/Auckland', 'UTC'];

/** An integer number of hundredths written as a decimal string, e.g. 4960 → "49.60". */
function hundredths(n: number): string {
  return `${Math.floor(n / 100)}.${String(n % 100).padStart(2, '0')}`;
}

const LOCAL_START_MS = Date.parse('2024-02-01T06:00:00Z'); // 00:00 CST on 1 February
const LOCAL_END_MS = Date.parse('2024-05-01T05:00:00Z'); // 00:00 CDT on 1 May

let serial = 0;
const measurementArb = fc
  .record({
    minute: fc.integer({ min: 0, max: (LOCAL_END_MS - LOCAL_START_MS) / 60_000 - 1 }),
    value: fc.integer({ min: 0, max: 30_000 }),
    belowRl: fc.boolean(),
  })
  .map(
    ({ minute, value, belowRl }): Measurement => ({
      resultId: `R${++serial}`,
      pointId: 'P1',
      parameter: 'total_alkalinity',
      value: hundredths(value),
      belowReportingLimit: belowRl && value % 7 === 0, // a few below the RL
      sampledAt: new Date(LOCAL_START_MS + minute * 60_000).toISOString(),
    }),
  );

describe('rounding against an integer-arithmetic oracle', () => {
  it('roundToDecimals: thousandths to hundredths (EPA WSG Memo 21 half-up; SM 1050 B half-even)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 10_000_000 }), (k) => {
        // oracle, computed here: q = floor(k/10), remainder r; up on r ≥ 5, or on r = 5 with q odd
        const q = Math.floor(k / 10);
        const r = k % 10;
        const up = (r >= 5 ? q + 1 : q) / 100;
        const even = (r > 5 || (r === 5 && q % 2 === 1) ? q + 1 : q) / 100;
        const value = `${Math.floor(k / 1000)}.${String(k % 1000).padStart(3, '0')}`;
        expect(roundToDecimals(value, 2, 'half_up')).toBe(up.toFixed(2));
        expect(roundToDecimals(value, 2, 'half_even')).toBe(even.toFixed(2));
      }),
    );
  });

  it('roundToSignificantFigures on whole numbers', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 99_999_999 }), fc.integer({ min: 1, max: 6 }), (k, figures) => {
        const digits = String(k).length;
        if (digits <= figures) {
          const written = k.toFixed(figures - digits);
          expect(roundToSignificantFigures(String(k), figures, 'half_up')).toBe(written);
          return;
        }
        const scale = 10 ** (digits - figures);
        const q = Math.floor(k / scale);
        const twiceRest = 2 * (k % scale);
        const up = twiceRest >= scale ? q + 1 : q;
        const even = twiceRest > scale || (twiceRest === scale && q % 2 === 1) ? q + 1 : q;
        expect(roundToSignificantFigures(String(k), figures, 'half_up')).toBe(String(up * scale));
        expect(roundToSignificantFigures(String(k), figures, 'half_even')).toBe(String(even * scale));
      }),
    );
  });
});

describe('localDate agrees with Intl directly (dayjs utc + timezone plugins under Node 20)', () => {
  it('for any instant 2000–2040 in several zones', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: Date.parse('2000-01-01T00:00:00Z'), max: Date.parse('2040-12-31T00:00:00Z') }),
        fc.constantFrom(...ZONES),
        (ms, zone) => {
          const parts = new Intl.DateTimeFormat('en-US', { timeZone: zone, year: 'numeric', month: '2-digit', day: '2-digit' }).formatToParts(new Date(ms));
          const get = (type: string) => parts.find((p) => p.type === type)?.value;
          expect(localDate(new Date(ms).toISOString(), zone)).toBe(`${get('year')}-${get('month')}-${get('day')}`);
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe('statistics', () => {
  const period = { start: '2024-02-01', end: '2024-04-30' };
  const options = { timezone: 'America/Chicago' };

  it('a monthly average lies between the lowest and highest daily value (40 CFR 122.2: a mean of daily values)', () => {
    fc.assert(
      fc.property(fc.array(measurementArb, { minLength: 1, maxLength: 40 }), fc.constantFrom('zero', 'half', 'limit'), (ms, rule) => {
        const common = { bound: 'maximum', value: '100', significantFigures: 3, belowReportingLimit: rule } as const;
        const daily = evaluateLimit(makeLimit({ ...common, statistic: 'daily' }), ms, period, options);
        const monthly = evaluateLimit(makeLimit({ ...common, statistic: 'monthly_average' }), ms, period, options);
        for (const month of monthly.filter((r) => r.value !== null)) {
          const days = daily.filter((d) => d.periodStart >= month.periodStart && d.periodEnd <= month.periodEnd).map((d) => new Decimal(d.value!));
          const avg = new Decimal(month.value!);
          expect(avg.greaterThanOrEqualTo(Decimal.min(...days))).toBe(true);
          expect(avg.lessThanOrEqualTo(Decimal.max(...days))).toBe(true);
          expect(month.sampleCount).toBe(daily.filter((d) => d.periodStart >= month.periodStart && d.periodEnd <= month.periodEnd).reduce((n, d) => n + d.sampleCount, 0));
        }
      }),
    );
  });

  it("adding one result changes only the rows of its day, week and month (affectedPeriods)", () => {
    const keyOf = (r: PeriodRow) => (r.statistic === 'instantaneous' ? `${r.periodStart}|${String(r.measurementIds[0])}` : `${r.periodStart}/${r.periodEnd}`);
    fc.assert(
      fc.property(
        fc.array(measurementArb, { minLength: 1, maxLength: 30 }),
        measurementArb,
        fc.constantFrom<Statistic>('instantaneous', 'daily', 'weekly_average', 'monthly_average'),
        fc.constantFrom<WeekMonthRule>('week_end_month', 'split'),
        fc.integer({ min: 0, max: 6 }),
        (baseline, added, statistic, weekMonthRule, weekStartsOn) => {
          const calendar = { ...options, weekMonthRule, weekStartsOn: weekStartsOn as Weekday };
          const limit: Limit = makeLimit({ statistic, bound: 'minimum', value: '60', significantFigures: 2 });
          const before = new Map(evaluateLimit(limit, baseline, period, calendar).map((r) => [keyOf(r), r]));
          const after = new Map(evaluateLimit(limit, [...baseline, added], period, calendar).map((r) => [keyOf(r), r]));
          const touched = affectedPeriods(added.sampledAt, options.timezone, calendar);
          const unit =
            statistic === 'weekly_average' ? touched.week : statistic === 'monthly_average' ? monthRange(touched.month) : { start: touched.day, end: touched.day };
          const changed = [...new Set([...before.keys(), ...after.keys()])].filter(
            (k) => JSON.stringify(before.get(k)) !== JSON.stringify(after.get(k)),
          );
          for (const key of changed) {
            const row = (after.get(key) ?? before.get(key))!;
            expect([row.periodStart, row.periodEnd]).toEqual([unit.start, unit.end]);
          }
          // and the touched row, when the period shows it, gained exactly the one result
          const touchedRow = [...after.values()].find((r) => r.periodStart === unit.start && r.periodEnd === unit.end && r.measurementIds.includes(added.resultId));
          if (touchedRow && statistic !== 'instantaneous') {
            const old = before.get(keyOf(touchedRow));
            expect(touchedRow.sampleCount).toBe((old?.sampleCount ?? 0) + 1);
          }
        },
      ),
      { numRuns: 200 },
    );
  });

  it('the order results arrive in does not matter', () => {
    const limits = [
      makeLimit({ id: 'a', statistic: 'daily', bound: 'minimum', value: '60', significantFigures: 2 }),
      makeLimit({ id: 'b', statistic: 'weekly_average', bound: 'maximum', value: '200', significantFigures: 3 }),
      makeLimit({ id: 'c', statistic: 'monthly_average', bound: 'minimum', value: '60', significantFigures: 2 }),
    ];
    const normalise = (ms: Measurement[]) => {
      const result = evaluateMonth(limits, ms, '2024-03', 'America/Chicago');
      return JSON.stringify(result, (k, v) => (k === 'measurementIds' ? [...v].sort() : v));
    };
    fc.assert(
      fc.property(
        fc.array(measurementArb, { minLength: 1, maxLength: 25 }).chain((ms) => fc.tuple(fc.constant(ms), fc.shuffledSubarray(ms, { minLength: ms.length }))),
        ([ms, shuffled]) => {
          expect(normalise(shuffled)).toBe(normalise(ms));
        },
      ),
    );
  });
});
