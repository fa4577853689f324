import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  alkalinityMeqL,
  alkalinityMgL,
  asBicarbonateIon,
  digitalTitratorVolumeMl,
  lowAlkalinityTwoPoint,
  meqToMgCaco3,
  mgCaco3ToMeq,
  recommendedTotalEndpointPh,
} from '@shared/chemistry/alkalinity';
import { CACO3_FACTOR_EQUIVALENT_WEIGHT, CACO3_FACTOR_STANDARD_METHODS, EQUIVALENT_WEIGHT } from '@shared/chemistry/constants';

describe('alkalinity = A × N × factor / V_s (SM 2320 B ¶5)', () => {
  it.each([
    { id: '1a T', a: 12.4, n: 0.02, vs: 100, factor: 50000, exact: '124', source: 'SM 2320 B' },
    { id: '1b T, factor 50,044', a: 12.4, n: 0.02, vs: 100, factor: 50044, exact: '124.10912', source: 'computed from SM 2320 B with 50.044 mg/meq' },
    { id: '1c P', a: 2.1, n: 0.02, vs: 100, factor: 50000, exact: '21', source: 'SM 2320 B' },
    { id: '1d T, 0.1 N', a: 8.75, n: 0.1, vs: 50, factor: 50000, exact: '875', source: 'SM 2320 B' },
    { id: '5f strength check: 1.00 mL of 0.02 N in 1 L is 1.00 mg/L', a: 1, n: 0.02, vs: 1000, factor: 50000, exact: '1', source: 'SM 2320 B ¶3' },
  ])('$id: $a mL × $n N × $factor / $vs mL = $exact mg/L ($source)', ({ a, n, vs, factor, exact }) => {
    expect(alkalinityMgL({ titrantVolumeMl: a, titrantNormality: n, sampleVolumeMl: vs, factor }).toString()).toBe(exact);
  });

  it('1b rounds to 124.1 mg/L (computed from SM 2320 B with the 50,044 factor)', () => {
    const t = alkalinityMgL({ titrantVolumeMl: 12.4, titrantNormality: 0.02, sampleVolumeMl: 100, factor: CACO3_FACTOR_EQUIVALENT_WEIGHT });
    expect(t.toDecimalPlaces(1).toNumber()).toBe(124.1);
  });

  it('the default factor is 50,000 (SM 2320 B)', () => {
    expect(CACO3_FACTOR_STANDARD_METHODS).toBe(50000);
    expect(alkalinityMgL({ titrantVolumeMl: 12.4, titrantNormality: 0.02, sampleVolumeMl: 100 }).toNumber()).toBe(124);
  });

  it('decimal arithmetic: 0.1 × 3 mL × 0.02 N does not pick up binary error (0.30000000000000004 in floating point)', () => {
    expect(alkalinityMgL({ titrantVolumeMl: 0.3, titrantNormality: 0.1, sampleVolumeMl: 100 }).toString()).toBe('15');
    expect(0.1 * 3).not.toBe(0.3);
  });

  it('1e: 124.0 mg/L as CaCO3 is 124.0 / 50.04 = 2.478 meq/L (SM 2320 B equivalent weight)', () => {
    expect(mgCaco3ToMeq(124).toDecimalPlaces(3).toNumber()).toBe(2.478);
    expect(meqToMgCaco3(mgCaco3ToMeq(124)).toNumber()).toBeCloseTo(124, 12);
  });

  it('meq/L from the titre itself is A × N × 1000 / V_s = 2.480 for 1a (USGS NFM A6.6.5.A)', () => {
    expect(alkalinityMeqL({ titrantVolumeMl: 12.4, titrantNormality: 0.02, sampleVolumeMl: 100 }).toString()).toBe('2.48');
  });

  it('1g: USGS digital titrator, 496 counts, C_a 0.1600, CF 1.01, V_s 100 mL → 0.620 mL, 1.002 meq/L, 50.1 mg/L (NFM A6.6.5.A)', () => {
    const b = digitalTitratorVolumeMl(496);
    expect(b.toString()).toBe('0.62');
    const meq = alkalinityMeqL({ titrantVolumeMl: b, titrantNormality: 0.16, sampleVolumeMl: 100, correctionFactor: 1.01 });
    expect(meq.toDecimalPlaces(3).toNumber()).toBe(1.002);
    expect(meq.times(EQUIVALENT_WEIGHT.CaCO3).toDecimalPlaces(1).toNumber()).toBe(50.1);
  });

  it('mg/L as CaCO3 to mg/L as HCO3−: × 61.017/50.04 = 1.2194 (SM 2320 B equivalent weights)', () => {
    expect(asBicarbonateIon(100).toDecimalPlaces(2).toNumber()).toBe(121.94);
  });

  it('property: scaling sample and titrant volumes together leaves the result unchanged (A×N×factor/V_s is homogeneous)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 50_000 }),
        fc.integer({ min: 1, max: 5000 }),
        fc.integer({ min: 100, max: 20_000 }),
        fc.integer({ min: 1, max: 1000 }),
        (aHundredths, nTenThousandths, vsTenths, kTenths) => {
          const a = aHundredths / 100;
          const n = nTenThousandths / 10_000;
          const vs = vsTenths / 10;
          const k = kTenths / 10;
          const base = alkalinityMgL({ titrantVolumeMl: a, titrantNormality: n, sampleVolumeMl: vs });
          const scaled = alkalinityMgL({ titrantVolumeMl: a * k, titrantNormality: n, sampleVolumeMl: vs * k });
          expect(scaled.minus(base).abs().lte(base.abs().times('1e-12'))).toBe(true);
        },
      ),
    );
  });
});

describe('recommended total endpoint pH (SM 2320 B ¶1, Table 2320:I)', () => {
  it.each([
    [30, 4.9],
    [150, 4.6],
    [500, 4.3],
    [10, 4.9], // held at the 30 mg/L row (no extrapolation)
    [2000, 4.3], // held at the 500 mg/L row
    [60, 4.8], // log-interpolated between the 30 and 150 rows: 4.9 − 0.3 × log(2)/log(5) = 4.77 → 4.8 (computed from the table)
    [300, 4.4], // 4.6 − 0.3 × log(2)/log(10/3) = 4.43 → 4.4 (computed from the table)
  ])('about %i mg/L → pH %f (SM 2320 B Table 2320:I)', (alk, pH) => {
    expect(recommendedTotalEndpointPh(alk)).toBe(pH);
  });

  it.each(['routine', 'automated', 'silicates_phosphates', 'industrial_waste'] as const)(
    '%s → pH 4.5 (SM 2320 B Table 2320:I)',
    (condition) => {
      expect(recommendedTotalEndpointPh(150, condition)).toBe(4.5);
    },
  );

  it('no expected alkalinity → routine pH 4.5 (SM 2320 B; 40 CFR 136.3 Table IB)', () => {
    expect(recommendedTotalEndpointPh()).toBe(4.5);
  });

  it('the recommendation never rises with alkalinity (SM 2320 B Table 2320:I)', () => {
    let last = 14;
    for (let alk = 1; alk < 1000; alk += 7) {
      const pH = recommendedTotalEndpointPh(alk);
      expect(pH).toBeLessThanOrEqual(last);
      last = pH;
    }
  });
});

describe('low-alkalinity two-point method, T = (2B − C) × N × 50,000 / V_s (SM 2320 B ¶4d, ¶5)', () => {
  const base = { sampleVolumeMl: 200, titrantNormality: 0.02, firstEndpointPh: 4.5, volumeToFirstEndpointMl: 3.05, volumeToSecondEndpointMl: 3.5 };

  it('1f: B 3.05 mL at pH 4.50, C 3.50 mL at pH 4.20 → 2B − C = 2.60 mL, 13.0 mg/L (SM 2320 B)', () => {
    const r = lowAlkalinityTwoPoint({ ...base, secondEndpointPh: 4.2 });
    expect(r.equivalenceVolumeMl.toString()).toBe('2.6');
    expect(r.totalAlkalinity.toString()).toBe('13');
    expect(r.totalAlkalinityMeqL.toString()).toBe('0.26');
    expect(r.secondEndpointPh).toBe(4.2);
  });

  it.each([4.19, 4.2, 4.21, 4.18, 4.22])('second pH %f is within 0.02 of 4.20 (SM 2320 B ¶4d; tolerance common practice)', (second) => {
    expect(() => lowAlkalinityTwoPoint({ ...base, secondEndpointPh: second })).not.toThrow();
  });

  it.each([4.1, 4.17, 4.23, 4.4])('second pH %f is not 0.30 below 4.50 → input error on lowAlkalinity.secondEndpointPh (SM 2320 B ¶4d)', (second) => {
    expect(() => lowAlkalinityTwoPoint({ ...base, secondEndpointPh: second })).toThrow(
      expect.objectContaining({ fields: { 'lowAlkalinity.secondEndpointPh': expect.stringMatching(/0\.30/) } }),
    );
  });

  it('C not beyond B, or 2B − C not positive, is an input error on lowAlkalinity.volumeToSecondEndpointMl', () => {
    for (const c of [3.05, 3.0, 6.1, 7]) {
      expect(() => lowAlkalinityTwoPoint({ ...base, volumeToSecondEndpointMl: c })).toThrow(
        expect.objectContaining({ fields: { 'lowAlkalinity.volumeToSecondEndpointMl': expect.any(String) } }),
      );
    }
  });

  it('the 50,044 factor carries through (computed from SM 2320 B)', () => {
    expect(lowAlkalinityTwoPoint({ ...base, factor: 50044 }).totalAlkalinity.toString()).toBe('13.01144');
  });
});
