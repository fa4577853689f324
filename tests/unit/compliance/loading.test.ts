import { describe, expect, it } from 'vitest';
import { massLoadingLbPerDay, roundToSignificantFigures } from '@shared/compliance/index.js';
import { InputError } from '@shared/errors.js';

describe('massLoadingLbPerDay = mg/L × MGD × 8.34', () => {
  it.each([
    // mg/L, MGD, unrounded lb/d, at 3 figures, source
    ['65', '1.50', '813.15', '813'], // domain.md 7d
    ['23.98', '2.0', '399.9864', '400'], // domain.md 8j: 23.98 mg/L NaOH at 2.0 MGD ≈ 400 lb/d
    ['0', '3.2', '0', '0'], // computed here
  ])('%s mg/L at %s MGD → %s lb/d (%s)', (mgL, mgd, lbPerDay, reported) => {
    const load = massLoadingLbPerDay(mgL, mgd);
    expect(load).toBe(lbPerDay);
    expect(roundToSignificantFigures(load, 3, 'half_up')).toBe(reported);
  });

  it('refuses a negative flow', () => {
    expect(() => massLoadingLbPerDay('65', '-1')).toThrow(InputError);
  });
});
