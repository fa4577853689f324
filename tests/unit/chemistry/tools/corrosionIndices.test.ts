import { describe, expect, it } from 'vitest';
import { langelierExact, lsiTendency, rsiTendency } from '@shared/chemistry/corrosion';
import { classify, CCPP_BANDS, LSI_BANDS, roundTo, RSI_BANDS } from '@shared/chemistry/tools/bands';
import { calciumCarbonatePrecipitationPotential } from '@shared/chemistry/tools/corrosionIndices';
import { calculateCcpp, calculateCorrosionIndices } from '@shared/chemistry/tools/service';
import { InputError } from '@shared/errors';

// The water of domain.md checks 8e–8g: pH 7.80, 25 °C, TDS 500 (I = 0.0125), Ca hardness 200, alkalinity 150.
const water = { pH: 7.8, temperatureC: 25, tdsMgL: 500, calciumHardness: 200, totalAlkalinity: 150 };

describe('CaCO3 precipitation potential, closed system, I held constant (SM 2330; DIN 38404-10; domain.md 8.3)', () => {
  it('8g: 13.5 mg/L as CaCO3 would precipitate, final pH 7.39 (domain.md 8g, computed from the 8.3 bisection)', () => {
    const r = calciumCarbonatePrecipitationPotential({ pH: 7.8, temperatureC: 25, calciumHardnessMgL: 200, alkalinityMgL: 150, ionicStrength: 0.0125 });
    expect(r.ccppMgL).toBeCloseTo(13.5, 1);
    expect(r.finalPh).toBeCloseTo(7.39, 2);
    // Mass balance of the definition: x from Ca (100,090 mg/mol) and 2x from alkalinity (50,040 mg/eq).
    expect(r.finalCalciumHardnessMgL).toBeCloseTo(200 - r.ccppMgL, 9);
    expect(r.finalAlkalinityMgL).toBeCloseTo(150 - 2 * r.precipitatedMolL * 50_040, 9);
  });

  it('the water left is just saturated, checked with the SM 2330 B exact LSI (corrosion.ts), a separate code path', () => {
    const r = calciumCarbonatePrecipitationPotential({ pH: 7.8, temperatureC: 25, calciumHardnessMgL: 200, alkalinityMgL: 150, ionicStrength: 0.0125 });
    const after = langelierExact({
      pH: r.finalPh,
      temperatureC: 25,
      calciumHardnessMgL: r.finalCalciumHardnessMgL,
      alkalinityMgL: r.finalAlkalinityMgL,
      ionicStrength: 0.0125,
    });
    expect(Math.abs(after.lsi)).toBeLessThan(1e-6);
  });

  it.each([
    // Soft, low-alkalinity water at 10 °C: aggressive (negative LSI, Langelier 1936), so CaCO3 dissolves.
    ['soft water, pH 7.0, 10 °C, Ca 40, alk 30', { pH: 7.0, temperatureC: 10, calciumHardnessMgL: 40, alkalinityMgL: 30, ionicStrength: 0.005 }],
    ['hard water, pH 8.3, 30 °C, Ca 300, alk 250', { pH: 8.3, temperatureC: 30, calciumHardnessMgL: 300, alkalinityMgL: 250, ionicStrength: 0.015 }],
    ['slightly aggressive water, pH 7.4, 20 °C, Ca 100, alk 100', { pH: 7.4, temperatureC: 20, calciumHardnessMgL: 100, alkalinityMgL: 100, ionicStrength: 0.008 }],
  ])('%s: CCPP has the sign of the LSI and leaves a saturated water (Langelier 1936 sign; SM 2330)', (_name, w) => {
    const r = calciumCarbonatePrecipitationPotential(w);
    const before = langelierExact({ ...w });
    expect(Math.sign(r.ccppMgL)).toBe(Math.sign(before.lsi));
    const after = langelierExact({ ...w, pH: r.finalPh, calciumHardnessMgL: r.finalCalciumHardnessMgL, alkalinityMgL: r.finalAlkalinityMgL });
    expect(Math.abs(after.lsi)).toBeLessThan(1e-6);
  });

  it('API shape: band, sign convention and both temperatures; °F gives the same answer as °C (77 °F = 25 °C)', () => {
    const c = calculateCcpp(water);
    const f = calculateCcpp({ ...water, temperatureC: undefined, temperatureF: 77 });
    expect(c.ccpp).toBeCloseTo(13.5, 1);
    expect(c.band.key).toBe('precipitates');
    expect(c.signConvention).toMatch(/marble test/);
    expect(f.ccpp).toBeCloseTo(c.ccpp, 6);
    expect(f.temperatureC).toBeCloseTo(25, 9);
    expect(c.temperatureF).toBeCloseTo(77, 9);
  });

  it('rejects a temperature given in both units, and an alkalinity lower than the hydroxide at that pH', () => {
    expect(() => calculateCcpp({ ...water, temperatureF: 77 })).toThrow(InputError);
    try {
      calculateCcpp({ ...water, pH: 12.5, totalAlkalinity: 1 });
      throw new Error('expected an InputError');
    } catch (e) {
      expect((e as InputError).fields).toHaveProperty('totalAlkalinity');
    }
  });
});

describe('LSI and RSI interpretation bands (Langelier 1936; Ryznar 1944; domain.md 8.3)', () => {
  it('8e/8f water: exact LSI +0.48 scale-forming, exact RSI 6.85 balanced, approximate RSI 7.16 no protective film (domain.md 8e, 8f)', () => {
    const r = calculateCorrosionIndices(water);
    expect(r.lsi.langelierIndex).toBeCloseTo(0.48, 2);
    expect(r.interpretation.langelier.key).toBe('deposits_caco3');
    // RSI exact = 2 × 7.323 − 7.80 = 6.846 (Ryznar 1944 with the 8f pHs)
    expect(r.lsi.ryznarIndex).toBeCloseTo(6.846, 2);
    expect(r.interpretation.ryznar.key).toBe('little_scale');
    expect(r.lsi.approximate.ryznarIndex).toBeCloseTo(7.16, 2);
    expect(r.interpretation.approximateRyznar.key).toBe('no_protective_film');
    expect(r.ccpp.ccpp).toBeCloseTo(13.5, 1);
  });

  it.each([
    [-0.01, 'dissolves_caco3'],
    [0, 'saturated'],
    [0.01, 'deposits_caco3'],
  ])('LSI %f → %s (Langelier 1936: positive deposits, negative dissolves)', (lsi, key) => {
    expect(classify(LSI_BANDS, lsi).key).toBe(key);
  });

  it('classifies the index as reported to 0.01: +0.004 shows as 0.00 and is saturated (Langelier 1936 sign)', () => {
    expect(classify(LSI_BANDS, roundTo(0.004, 2)).key).toBe('saturated');
    expect(classify(LSI_BANDS, roundTo(-0.006, 2)).key).toBe('dissolves_caco3');
  });

  it.each([
    [5.99, 'scaling'],
    [6.0, 'little_scale'],
    [6.5, 'little_scale'],
    [7.0, 'little_scale'],
    [7.01, 'no_protective_film'],
    [8.0, 'no_protective_film'],
    [8.01, 'corrosive'],
  ])('RSI %f → %s (Ryznar 1944: < 6 scaling, > 7 no protective film, > 8 corrosion likely)', (rsi, key) => {
    expect(classify(RSI_BANDS, rsi).key).toBe(key);
  });

  it('the band tables agree with the tendency functions of corrosion.ts at and around every limit', () => {
    for (const v of [-1, -0.01, 0, 0.01, 1]) expect(classify(LSI_BANDS, v).key).toBe(lsiTendency(v));
    for (const v of [5, 5.99, 6, 6.99, 7, 7.01, 7.99, 8, 8.01, 9]) expect(classify(RSI_BANDS, v).key).toBe(rsiTendency(v));
  });

  it.each([
    [-0.1, 'dissolves'],
    [0, 'saturated'],
    [0.1, 'precipitates'],
  ])('CCPP %f mg/L → %s (SM 2330 sign: positive precipitates)', (ccpp, key) => {
    expect(classify(CCPP_BANDS, ccpp).key).toBe(key);
  });

  it('every band carries a word and a level, so status never rests on colour alone (product.md)', () => {
    for (const scale of [LSI_BANDS, RSI_BANDS, CCPP_BANDS]) {
      for (const b of scale.bands) {
        expect(b.label.length).toBeGreaterThan(2);
        expect(['ok', 'caution', 'act', 'info']).toContain(b.level);
      }
      expect(scale.bands[scale.bands.length - 1].upper).toBeNull();
    }
  });
});
