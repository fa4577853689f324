// Money math for invoices: integer cents, checked against hand-computed examples (common practice).
import { describe, expect, it } from 'vitest';
import { addDays, centsToDecimal, decimalToCents, formatMoney, invoiceState, lineAmountCents, sumCents } from '../../../shared/billing/money.js';

describe('money in integer cents (common practice)', () => {
  it.each([
    // count × unit price, checked by hand
    [3, 2450, 7350], // 3 × $24.50 = $73.50
    [2, 3875, 7750], // 2 × $38.75 = $77.50
    [7, 1999, 13993], // 7 × $19.99 = $139.93
    [3, 10, 30], // 3 × $0.10 = $0.30 (0.1 * 3 in floating point is 0.30000000000000004)
    [0, 2450, 0],
  ])('%i × %i cents = %i cents', (count, unit, expected) => {
    expect(lineAmountCents(count, unit)).toBe(expected);
  });

  it('sums lines exactly and formats from cents without floating point', () => {
    // $73.50 + $77.50 + $15.00 = $166.00 (by hand)
    expect(sumCents([7350, 7750, 1500])).toBe(16600);
    expect(formatMoney(16600, 'usd')).toBe('$166.00');
    expect(formatMoney(123456789, 'usd')).toBe('$1,234,567.89');
    expect(centsToDecimal(5)).toBe('0.05');
    expect(decimalToCents('24.5')).toBe(2450);
    expect(decimalToCents('0.1')).toBe(10);
    expect(decimalToCents('1.005')).toBeNull();
    expect(() => lineAmountCents(2, 12.5)).toThrow(RangeError);
  });

  it('shows an open invoice past its due date as overdue', () => {
    expect(invoiceState('open', '2026-11-30', '2026-12-01')).toBe('overdue');
    expect(invoiceState('open', '2026-12-01', '2026-12-01')).toBe('open');
    expect(invoiceState('paid', '2026-11-30', '2026-12-01')).toBe('paid');
  });
});

describe('due dates', () => {
  it.each([
    ['2026-12-02', 30, '2027-01-01'], // across a year end (by hand)
    ['2028-02-15', 14, '2028-02-29'], // leap year
    ['2026-03-01', 0, '2026-03-01'],
  ])('%s + %i days = %s (common practice)', (from, days, due) => {
    expect(addDays(from, days)).toBe(due);
  });
});
