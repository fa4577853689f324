/** The compliance engine: pure, runs in the browser and on the server. */
export * from './types.js';
export * from './rounding.js';
export * from './calendar.js';
export {
  arithmeticMean,
  dailyValues,
  effectivePart,
  inEffect,
  type DailyValue,
} from './statistics.js';
export * from './evaluate.js';
export * from './projection.js';
export * from './loading.js';
