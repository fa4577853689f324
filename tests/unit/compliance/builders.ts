import type { Limit, Measurement } from '@shared/compliance/index.js';

/** A limit with the fields a test does not care about filled in. */
export function makeLimit(overrides: Partial<Limit> & Pick<Limit, 'statistic' | 'bound' | 'value'>): Limit {
  const base = {
    id: 'L1',
    pointId: 'P1',
    parameter: 'total_alkalinity',
    units: 'mg/L as CaCO3',
    roundingMode: 'half_up',
    belowReportingLimit: 'zero',
    effectiveFrom: '2020-01-01',
    effectiveTo: null,
  } as const;
  const precision = overrides.significantFigures === undefined && overrides.decimals === undefined ? { significantFigures: 2 } : {};
  return { ...base, ...precision, ...overrides } as Limit;
}

let counter = 0;

/** A measurement at point P1; `sampledAt` is written with its offset. */
export function makeMeasurement(
  value: string,
  sampledAt: string,
  overrides: Partial<Measurement> = {},
): Measurement {
  counter += 1;
  return {
    resultId: `R${counter}`,
    pointId: 'P1',
    parameter: 'total_alkalinity',
    value,
    sampledAt,
    ...overrides,
  };
}

/** Noon at the facility on a date, written with a fixed Central offset (noon CST is 13:00 CDT: same date). */
export function noon(date: string): string {
  return `${date}T12:00:00-06:00`;
}
