import { describe, expect, it } from 'vitest';
import { langelierApproximate, langelierExact, lsiTendency, rsiTendency, ryznarIndex } from '@shared/chemistry/corrosion';
import { ionicStrengthFromTds } from '@shared/chemistry/speciation';

const water = { pH: 7.8, temperatureC: 25, calciumHardnessMgL: 200, alkalinityMgL: 150 };

describe('Langelier index, approximation (Roberge 2008, eqs 8.26–8.31)', () => {
  it('8e: pH 7.80, 25 °C, TDS 500, Ca 200, alk 150 → A 0.16990, B 2.08828, C 1.90103, D 2.17609, pHs 7.481, LSI +0.32, RSI 7.16', () => {
    const r = langelierApproximate({ ...water, tdsMgL: 500 });
    expect(r.A).toBeCloseTo(0.1699, 5);
    expect(r.B).toBeCloseTo(2.08828, 5);
    expect(r.C).toBeCloseTo(1.90103, 5);
    expect(r.D).toBeCloseTo(2.17609, 5);
    expect(r.pHs).toBeCloseTo(7.481, 3);
    expect(r.lsi).toBeCloseTo(0.32, 2);
    expect(ryznarIndex(r.pHs, 7.8)).toBeCloseTo(7.16, 2);
  });

  it('B uses 273, not 273.15, exactly as published (Roberge 2008)', () => {
    expect(langelierApproximate({ ...water, tdsMgL: 500 }).B).toBeCloseTo(-13.12 * Math.log10(298) + 34.55, 12);
  });
});

describe('Langelier index, exact form (SM 2330 B)', () => {
  it('8f: same water, I 0.0125, A 0.5108, pfm 0.04945 → pK2 − pKs 1.8490, p[Ca] 2.6993, p[HCO3] 2.5269, pHs 7.323, LSI +0.48, calcite SI +0.477', () => {
    const r = langelierExact({ ...water, ionicStrength: ionicStrengthFromTds(500) });
    expect(r.ionicStrength).toBeCloseTo(0.0125, 10);
    expect(r.debyeHuckelA).toBeCloseTo(0.5108, 4);
    expect(r.pfm).toBeCloseTo(0.04945, 5);
    expect(r.pK2MinusPKs).toBeCloseTo(1.849, 3);
    // −log(200/100,090) = 2.69936; the reference quotes it cut to 2.6993.
    expect(Math.abs(r.pCa - 2.6993)).toBeLessThan(0.0001);
    expect(r.pHco3).toBeCloseTo(2.5269, 4);
    expect(r.pHs).toBeCloseTo(7.323, 3);
    expect(r.lsi).toBeCloseTo(0.48, 2);
    expect(r.calciteSaturationIndex).toBeCloseTo(0.477, 3);
  });

  it('the exact LSI equals the calcite saturation index with the same constants (SM 2330 B)', () => {
    for (const pH of [6.5, 7.2, 8.0, 8.8]) {
      const r = langelierExact({ ...water, pH, ionicStrength: 0.01 });
      expect(r.lsi).toBeCloseTo(r.calciteSaturationIndex, 9);
    }
  });
});

describe('interpretation (Langelier 1936; Ryznar 1944)', () => {
  it.each([
    [0.48, 'deposits_caco3'],
    [-0.3, 'dissolves_caco3'],
    [0, 'saturated'],
  ] as const)('LSI %f → %s (Langelier 1936)', (lsi, t) => expect(lsiTendency(lsi)).toBe(t));

  it.each([
    [5.5, 'scaling'],
    [6.85, 'little_scale'],
    [7.16, 'no_protective_film'],
    [8.5, 'corrosive'],
  ] as const)('RSI %f → %s (Ryznar 1944; NACE)', (rsi, t) => expect(rsiTendency(rsi)).toBe(t));
});
