import { describe, expect, it } from 'vitest';
import { ALKALINITY_CHEMICALS, alkalinityDose, chemicalPerAlkalinity, type AlkalinityChemical } from '@shared/chemistry/tools/alkalinityDose';
import { calculateAlkalinityDose } from '@shared/chemistry/tools/service';
import { celsiusToFahrenheit, fahrenheitToCelsius, feedKgPerDay, feedLbPerDay, flowOf, m3PerDayToMgd, mgdToM3PerDay } from '@shared/chemistry/tools/units';
import { InputError } from '@shared/errors';

describe('mg of chemical per mg/L alkalinity as CaCO3 = equivalent weight ÷ 50.04 (domain.md 8.5, computed from equivalent weights)', () => {
  it.each([
    ['caustic_soda', 'NaOH', 0.799],
    ['soda_ash', 'Na2CO3', 1.059],
    ['lime', 'Ca(OH)2', 0.74],
    ['quicklime', 'CaO', 0.56],
    ['sodium_bicarbonate', 'NaHCO3', 1.679],
    ['magnesium_hydroxide', 'Mg(OH)2', 0.583],
  ] as Array<[AlkalinityChemical, string, number]>)('%s (%s) → %f (domain.md 8.5 table)', (chemical, formula, factor) => {
    expect(ALKALINITY_CHEMICALS[chemical].formula).toBe(formula);
    expect(chemicalPerAlkalinity(chemical)).toBeCloseTo(factor, 3);
  });
});

describe('dose and feed rate (domain.md 8.5, 7.1)', () => {
  it('8j: +30 mg/L at 2.0 MGD with 50 % NaOH → 23.98 mg/L NaOH, 400 lb/d of 100 % = 800 lb/d of 50 % (domain.md 8j)', () => {
    const r = calculateAlkalinityDose({ chemical: 'caustic_soda', alkalinityIncrease: 30, purityPercent: 50, flowMgd: 2.0 });
    expect(r.dose.pureMgL).toBeCloseTo(23.98, 2);
    expect(r.dose.productMgL).toBeCloseTo(47.96, 2);
    expect(r.feed?.pure.lbPerDay).toBeCloseTo(400, 0);
    expect(r.feed?.product.lbPerDay).toBeCloseTo(800, 0);
    // SI: 23.98 g/m³ × 7570.82 m³/d ÷ 1000 = 181.55 kg/d
    expect(r.feed?.pure.kgPerDay).toBeCloseTo(181.55, 1);
  });

  it('the same flow given in m³/d gives the same feed (2.0 MGD = 7570.823568 m³/d, exact US gallon 3.785411784 L)', () => {
    const us = calculateAlkalinityDose({ chemical: 'caustic_soda', alkalinityIncrease: 30, flowMgd: 2.0 });
    const si = calculateAlkalinityDose({ chemical: 'caustic_soda', alkalinityIncrease: 30, flowM3PerDay: 7570.823568 });
    expect(si.feed?.pure.kgPerDay).toBeCloseTo(us.feed?.pure.kgPerDay ?? NaN, 3);
    expect(si.feed?.pure.lbPerDay).toBeCloseTo(us.feed?.pure.lbPerDay ?? NaN, 3);
    expect(si.flow?.given).toBe('m3PerDay');
  });

  it('current and target alkalinity give the increase: 50 → 80 is +30 (domain.md 8.5)', () => {
    const r = calculateAlkalinityDose({ chemical: 'soda_ash', currentAlkalinity: 50, targetAlkalinity: 80 });
    expect(r.alkalinityIncrease).toBe(30);
    expect(r.dose.pureMgL).toBeCloseTo((30 * 52.99) / 50.04, 3);
    expect(r.feed).toBeNull();
  });

  it('every dose carries handling cautions and the permit/local-codes line (product.md cautions)', () => {
    for (const chemical of Object.keys(ALKALINITY_CHEMICALS) as AlkalinityChemical[]) {
      const r = calculateAlkalinityDose({ chemical, alkalinityIncrease: 10 });
      expect(r.cautions.length).toBeGreaterThanOrEqual(3);
      expect(r.cautions.join(' ')).toMatch(/permit, local codes and licensed practice govern/);
    }
    expect(calculateAlkalinityDose({ chemical: 'caustic_soda', alkalinityIncrease: 10 }).cautions.join(' ')).toMatch(/corrosive/);
    expect(calculateAlkalinityDose({ chemical: 'quicklime', alkalinityIncrease: 10 }).cautions.join(' ')).toMatch(/heat/);
  });

  it('purity divides the pure dose: 10 mg/L of hydrated lime at 93 % is 10.753 mg/L of product', () => {
    const d = alkalinityDose({ chemical: 'lime', alkalinityIncrease: (10 * 50.04) / 37.05, purityPercent: 93 });
    expect(d.pureMgL).toBeCloseTo(10, 9);
    expect(d.productMgL).toBeCloseTo(10 / 0.93, 9);
  });

  it.each([
    ['no increase given', { chemical: 'lime' }, 'alkalinityIncrease'],
    ['a target not above the current', { chemical: 'lime', currentAlkalinity: 80, targetAlkalinity: 60 }, 'targetAlkalinity'],
    ['both an increase and a target', { chemical: 'lime', alkalinityIncrease: 10, currentAlkalinity: 80, targetAlkalinity: 90 }, 'currentAlkalinity'],
    ['an unknown chemical', { chemical: 'potash', alkalinityIncrease: 10 }, 'chemical'],
    ['a purity above 100 %', { chemical: 'lime', alkalinityIncrease: 10, purityPercent: 120 }, 'purityPercent'],
    ['a flow in both units', { chemical: 'lime', alkalinityIncrease: 10, flowMgd: 1, flowM3PerDay: 3785 }, 'flowM3PerDay'],
  ])('rejects %s', (_n, body, field) => {
    try {
      calculateAlkalinityDose(body as never);
      throw new Error('expected an InputError');
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      expect((e as InputError).fields).toHaveProperty(field);
    }
  });
});

describe('unit conversions (NIST Handbook 44 exact gallon and pound; 8.34 common practice)', () => {
  it('1 MGD = 3785.411784 m³/d and back', () => {
    expect(mgdToM3PerDay(1)).toBeCloseTo(3785.411784, 9);
    expect(m3PerDayToMgd(3785.411784)).toBeCloseTo(1, 12);
    expect(flowOf({ flowM3PerDay: 10_000 })?.mgd).toBeCloseTo(2.641721, 6);
    expect(flowOf({})).toBeNull();
  });

  it('7d: 65 mg/L at 1.50 MGD = 813 lb/d (domain.md 7d); kg/d = mg/L × m³/d ÷ 1000', () => {
    expect(feedLbPerDay(65, 1.5)).toBeCloseTo(813.15, 6);
    expect(feedKgPerDay(10, 1000)).toBe(10);
  });

  it('77 °F = 25 °C; 32 °F = 0 °C', () => {
    expect(fahrenheitToCelsius(77)).toBeCloseTo(25, 12);
    expect(fahrenheitToCelsius(32)).toBe(0);
    expect(celsiusToFahrenheit(10)).toBeCloseTo(50, 12);
  });
});
