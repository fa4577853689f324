import { describe, expect, it } from 'vitest';
import { formatDecimalPlaces, formatSignificant, roundHalfEven, roundHalfUp, toApiNumber, toSignificant } from '@shared/chemistry/rounding';

describe('rounding for display and reports (SM 1050 B; EPA Water Supply Guidance Memo 21)', () => {
  it.each([
    // pH readings compared at one decimal: half-up (EPA WSG Memo 21) vs half-even (SM 1050 B).
    [7.12, '7.1', '7.1'],
    [6.95, '7.0', '7.0'],
    [6.04, '6.0', '6.0'],
    [5.94, '5.9', '5.9'],
    [8.91, '8.9', '8.9'],
    [9.05, '9.1', '9.0'],
    [9.04, '9.0', '9.0'],
    [2.45, '2.5', '2.4'],
    [-2.45, '-2.5', '-2.4'],
  ])('%f → half-up %s, half-even %s (EPA WSG Memo 21; SM 1050 B)', (value, up, even) => {
    expect(roundHalfUp(value, 1).toFixed(1)).toBe(up);
    expect(roundHalfEven(value, 1).toFixed(1)).toBe(even);
  });

  it('1.005 rounds half-up to 1.01 although its binary double (1.00499999…) rounds to 1.00 (decimal arithmetic; EPA WSG Memo 21)', () => {
    expect((1.005).toFixed(2)).toBe('1.00');
    expect(roundHalfUp(1.005, 2).toString()).toBe('1.01');
  });

  it.each([
    [64.625, 2, 'half-up', '65'],
    [49.6, 2, 'half-up', '50'],
    [0.099520, 4, 'half-up', '0.09952'],
    [124.5, 3, 'half-even', '124'],
    [125.5, 3, 'half-even', '126'],
    [813.15, 3, 'half-up', '813'],
  ] as const)('%f to %i significant figures (%s) → %s (SM 1050 B)', (value, sig, mode, expected) => {
    expect(toSignificant(value, sig, mode).toString()).toBe(expected);
  });

  it('display text keeps trailing zeros: 124 → "124.0", 0.0995 with 4 significant → "0.09950", 1.925 → "1.9" half-even', () => {
    expect(formatDecimalPlaces(124, 1)).toBe('124.0');
    expect(formatSignificant(0.0995, 4)).toBe('0.09950');
    expect(formatSignificant(1.925, 2, 'half-even')).toBe('1.9');
    expect(formatSignificant(0, 3)).toBe('0.00');
    expect(formatSignificant(12345, 3)).toBe('12300');
  });

  it('API numbers carry 6 significant figures', () => {
    expect(toApiNumber('8.809523809523809523')).toBe(8.80952);
    expect(toApiNumber(125)).toBe(125);
  });
});
