/**
 * Compliance engine timing: one month of a large facility (12 points × 4 parameters × 31
 * days, two results a day) and a full re-evaluation of 1, 12 and 60 months of such data.
 */
import { evaluateMonth } from '../../shared/compliance/evaluate.js';
import type { Limit, Measurement, Parameter } from '../../shared/compliance/types.js';

const PARAMS: Parameter[] = ['total_alkalinity', 'phenolphthalein_alkalinity', 'bicarbonate', 'ph'];

function limitsFor(points: number): Limit[] {
  const out: Limit[] = [];
  let id = 1;
  for (let p = 1; p <= points; p++) {
    for (const parameter of PARAMS) {
      const base = { pointId: p, parameter, roundingMode: 'half_up' as const, belowReportingLimit: 'zero' as const, effectiveFrom: '2020-01-01', effectiveTo: null };
      if (parameter === 'ph') {
        out.push({ ...base, id: id++, statistic: 'instantaneous', bound: 'minimum', value: '6.0', units: 'S.U.', decimals: 1 });
        out.push({ ...base, id: id++, statistic: 'instantaneous', bound: 'maximum', value: '9.0', units: 'S.U.', decimals: 1 });
      } else {
        out.push({ ...base, id: id++, statistic: 'daily', bound: 'minimum', value: '50', units: 'mg/L as CaCO3', significantFigures: 2 });
        out.push({ ...base, id: id++, statistic: 'monthly_average', bound: 'minimum', value: '60', units: 'mg/L as CaCO3', significantFigures: 2 });
      }
    }
  }
  return out;
}

/** Deterministic measurements: two a day per point and parameter, starting 2022-01-01 UTC. */
function measurementsFor(points: number, months: number): Measurement[] {
  const out: Measurement[] = [];
  let seed = 7;
  const rnd = () => ((seed = (seed * 16807) % 2147483647) / 2147483647);
  const start = Date.UTC(2022, 0, 1);
  const end = Date.UTC(2022, months, 1);
  let id = 1;
  for (let t = start; t < end; t += 43_200_000) {
    for (let p = 1; p <= points; p++) {
      for (const parameter of PARAMS) {
        const value = parameter === 'ph' ? (6.5 + rnd() * 2).toFixed(2) : (45 + rnd() * 40).toFixed(1);
        out.push({ resultId: id++, pointId: p, parameter, value, sampledAt: new Date(t + 13 * 3_600_000).toISOString() });
      }
    }
  }
  return out;
}

const monthKeys = (n: number) => Array.from({ length: n }, (_, i) => `${2022 + Math.floor(i / 12)}-${String((i % 12) + 1).padStart(2, '0')}`);

function timeMs(fn: () => void, runs = 5): number {
  fn();
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t = performance.now();
    fn();
    times.push(performance.now() - t);
  }
  return Math.round(times.sort((a, b) => a - b)[Math.floor(runs / 2)] * 10) / 10;
}

export function complianceTimings() {
  const limits = limitsFor(12);
  const oneMonth = measurementsFor(12, 1);
  const month = timeMs(() => evaluateMonth(limits, oneMonth, '2022-01', 'America/Denver'));
  const growth = [1, 12, 60].map((months) => {
    const data = measurementsFor(12, months);
    const keys = monthKeys(months);
    // A full re-evaluation evaluates every month against only that month's window of data.
    const byMonth = new Map<string, Measurement[]>();
    for (const m of data) {
      const k = m.sampledAt.slice(0, 7);
      (byMonth.get(k) ?? byMonth.set(k, []).get(k)!).push(m);
    }
    const ms = timeMs(() => {
      for (const k of keys) evaluateMonth(limits, byMonth.get(k) ?? [], k, 'America/Denver');
    }, 3);
    return { months, results: data.length, totalMs: ms, msPerMonth: Math.round((ms / months) * 10) / 10 };
  });
  return { limits: limits.length, monthResults: oneMonth.length, monthMs: month, growth };
}
