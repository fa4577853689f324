import { describe, expect, it } from 'vitest';
import {
  roundDirected,
  roundToDecimals,
  roundToPrecision,
  roundToSignificantFigures,
} from '@shared/compliance/index.js';
import { InputError } from '@shared/errors.js';

describe('roundToSignificantFigures', () => {
  it.each([
    // value, figures, half-up, half-even, source
    ['19.96', 2, '20', '20'], // NC DWR 2015: report at the limit's significant figures; boundary case of issue 6
    // computed here: 19.94 keeps 2 figures as 20, not 19 (the dropped ".94" is above one half)
    ['19.94', 2, '20', '20'],
    ['19.96', 3, '20.0', '20.0'], // computed here: a limit written "20.0" carries 3 figures
    ['19.94', 3, '19.9', '19.9'], // computed here
    ['19.50', 2, '20', '20'], // EPA WSG Memo 21 / SM 1050 B: the tie goes to 20 either way (20 is even)
    ['19.49', 2, '19', '19'], // computed here: just below the 2-figure boundary
    ['64.625', 2, '65', '65'], // domain.md 7b: monthly mean 64.625 reported 65
    ['49.6', 2, '50', '50'], // domain.md 7b: 49.6 reported 50
    ['2.5', 1, '3', '2'], // EPA WSG Memo 21 (5 rounds up) vs SM 1050 B (to even)
    ['3.5', 1, '4', '4'], // SM 1050 B: 3.5 goes to the even 4 as well
    ['125', 2, '130', '120'], // EPA WSG Memo 21 vs SM 1050 B, tie on the tens
    ['0.01225', 3, '0.0123', '0.0122'], // computed here: leading zeros are not significant
    ['1234', 2, '1200', '1200'], // computed here: no exponent notation in a report
    ['9.96', 2, '10', '10'], // computed here: carry into a new digit
    ['1.04', 2, '1.0', '1.0'], // computed here: the kept trailing zero is written
    ['-2.5', 1, '-3', '-2'], // computed here: half-up rounds the magnitude
    ['0', 3, '0', '0'], // computed here
  ] as const)('%s to %i figures: half-up %s, half-even %s', (value, figures, halfUp, halfEven) => {
    expect(roundToSignificantFigures(value, figures, 'half_up')).toBe(halfUp);
    expect(roundToSignificantFigures(value, figures, 'half_even')).toBe(halfEven);
  });

  it('refuses a binary floating-point number, whose tie may already be lost', () => {
    // 9.05 as a double is 9.050000000000000710...; only the decimal string is a true tie.
    expect(() => roundToSignificantFigures(9.05 as unknown as string, 2, 'half_even')).toThrow(InputError);
  });

  it.each([0, 21, 1.5])('refuses %s significant figures', (figures) => {
    expect(() => roundToSignificantFigures('1', figures, 'half_up')).toThrow(InputError);
  });
});

describe('roundToDecimals (domain.md 7a pH readings at one decimal)', () => {
  it.each([
    // reading, half-up, half-even — domain.md check 7a (computed here)
    ['7.12', '7.1', '7.1'],
    ['6.95', '7.0', '7.0'],
    ['6.04', '6.0', '6.0'],
    ['5.94', '5.9', '5.9'],
    ['7.40', '7.4', '7.4'],
    ['8.91', '8.9', '8.9'],
    ['9.05', '9.1', '9.0'],
    ['7.00', '7.0', '7.0'],
    ['6.50', '6.5', '6.5'],
    ['9.04', '9.0', '9.0'],
  ] as const)('%s → half-up %s, half-even %s', (reading, halfUp, halfEven) => {
    expect(roundToDecimals(reading, 1, 'half_up')).toBe(halfUp);
    expect(roundToDecimals(reading, 1, 'half_even')).toBe(halfEven);
  });

  it.each([
    ['-0.04', 1, '0.0'], // computed here: no "-0.0" in a report
    ['812.5', 0, '813'], // EPA WSG Memo 21: 5 rounds up
    ['2.425', 2, '2.43'], // computed here
  ] as const)('%s at %i decimals half-up → %s', (value, decimals, expected) => {
    expect(roundToDecimals(value, decimals, 'half_up')).toBe(expected);
  });

  it('refuses an unknown mode', () => {
    expect(() => roundToDecimals('1.5', 0, 'up' as never)).toThrow(InputError);
  });
});

describe('roundToPrecision and roundDirected', () => {
  it.each([
    ['813.15', { significantFigures: 3 }, '813'], // domain.md 7d
    ['813.15', { decimals: 1 }, '813.2'], // computed here, half-up
  ] as const)('%s at %o → %s', (value, precision, expected) => {
    expect(roundToPrecision(value, precision, 'half_up')).toBe(expected);
  });

  it.each([
    ['61.2', { significantFigures: 2 }, 'up', '62'], // computed here: toward +∞
    ['61.2', { significantFigures: 2 }, 'down', '61'], // computed here: toward −∞
    ['104.99', { decimals: 0 }, 'down', '104'], // computed here
    ['-0.2', { decimals: 0 }, 'up', '0'], // computed here: no "-0"
  ] as const)('%s at %o rounded %s → %s', (value, precision, direction, expected) => {
    expect(roundDirected(value, precision, direction)).toBe(expected);
  });
});
