import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  activityCoefficients,
  carbonateConstants,
  daviesLogGamma,
  debyeHuckelA,
  equilibriumSpeciation,
  hydroxideFromPh,
  ionicStrengthFromConductance,
  ionicStrengthFromTds,
  logK1,
  logK2,
  logKH,
  logKspCalcite,
  logKw,
  speciesFromPT,
} from '@shared/chemistry/speciation';

/**
 * The published polynomials written out again here, independently of the module: log K =
 * a + b·T + c/T + d·log10 T + e/T² (Plummer and Busenberg 1982; Kw from Harned and Robinson 1940).
 */
const PUBLISHED: Record<string, [number, number, number, number, number]> = {
  logK1: [-356.3094, -0.06091964, 21834.37, 126.8339, -1684915],
  logK2: [-107.8871, -0.03252849, 5151.79, 38.92561, -563713.9],
  logKH: [108.3865, 0.01985076, -6919.53, -40.45154, 669365],
  logKspCalcite: [-171.9065, -0.077993, 2839.319, 71.595, 0],
  logKw: [6.0875, -0.01706, -4470.99, 0, 0],
};

function published(name: keyof typeof PUBLISHED, celsius: number): number {
  const [a, b, c, d, e] = PUBLISHED[name];
  const t = celsius + 273.15;
  return a + b * t + c / t + (d * Math.log(t)) / Math.LN10 + e / t ** 2;
}

const functions = { logK1, logK2, logKH, logKspCalcite, logKw };

describe('temperature-dependent constants', () => {
  const rows = (['logK1', 'logK2', 'logKH', 'logKspCalcite', 'logKw'] as const).flatMap((name) =>
    [5, 15, 25, 35].map((t) => ({ name, t })),
  );
  it.each(rows)('$name at $t °C matches the published polynomial (Plummer and Busenberg 1982; Harned and Robinson 1940 for Kw)', ({ name, t }) => {
    expect(functions[name](t)).toBeCloseTo(published(name, t), 10);
  });

  // Tabulated values computed from the published equations (Plummer and Busenberg 1982; Harned and Robinson 1940), 4 decimals.
  it.each([
    [0, -6.5786, -10.6286, -1.1084, -8.3814, -14.9407],
    [10, -6.4633, -10.4879, -1.2694, -8.4105, -14.5332],
    [15, -6.4188, -10.4284, -1.3408, -8.4302, -14.3445],
    [20, -6.3819, -10.3756, -1.4069, -8.4533, -14.1652],
    [25, -6.3519, -10.3289, -1.4679, -8.4798, -13.9947],
    [30, -6.3281, -10.2879, -1.5244, -8.5098, -13.8327],
    [40, -6.2974, -10.2217, -1.6249, -8.5797, -13.5323],
  ])('%i °C: log K1 %f, log K2 %f, log KH %f, log Ksp %f, log Kw %f (Plummer and Busenberg 1982)', (t, k1, k2, kh, ksp, kw) => {
    const c = carbonateConstants(t);
    expect(Math.abs(c.logK1 - k1)).toBeLessThanOrEqual(0.00005);
    expect(Math.abs(c.logK2 - k2)).toBeLessThanOrEqual(0.00005);
    expect(Math.abs(c.logKH - kh)).toBeLessThanOrEqual(0.00005);
    expect(Math.abs(c.logKspCalcite - ksp)).toBeLessThanOrEqual(0.00005);
    expect(Math.abs(c.logKw - kw)).toBeLessThanOrEqual(0.00005);
  });

  it('at 25 °C pK1 6.352 and pK2 10.329, the usual textbook values (Plummer and Busenberg 1982; Stumm and Morgan)', () => {
    expect(-logK1(25)).toBeCloseTo(6.352, 3);
    expect(-logK2(25)).toBeCloseTo(10.329, 3);
  });

  it('K1 rises and Ksp of calcite falls with temperature between 0 and 40 °C (retrograde solubility; Plummer and Busenberg 1982)', () => {
    for (let t = 0; t < 40; t += 5) {
      expect(logK1(t + 5)).toBeGreaterThan(logK1(t));
      expect(logKspCalcite(t + 5)).toBeLessThan(logKspCalcite(t));
    }
  });
});

describe('hydroxide, carbonate and bicarbonate from P and T (SM 2320 B, Table 2320:II)', () => {
  it.each([
    // T = 200 mg/L; one row per case of the table (SM 2320 B Table 2320:II).
    { p: 0, t: 200, c: 'P=0', oh: 0, co3: 0, hco3: 200 },
    { p: 40, t: 200, c: 'P<T/2', oh: 0, co3: 80, hco3: 120 },
    { p: 100, t: 200, c: 'P=T/2', oh: 0, co3: 200, hco3: 0 },
    { p: 150, t: 200, c: 'P>T/2', oh: 100, co3: 100, hco3: 0 },
    { p: 200, t: 200, c: 'P=T', oh: 200, co3: 0, hco3: 0 },
    // Synthetic titration P 8.81, T 125.2 (fixed endpoints; SM 2320 B table applied).
    { p: 8.81, t: 125.2, c: 'P<T/2', oh: 0, co3: 17.62, hco3: 107.58 },
  ])('P $p, T $t → $c: OH $oh, CO3 $co3, HCO3 $hco3', ({ p, t, c, oh, co3, hco3 }) => {
    const s = speciesFromPT(p, t);
    expect(s.case).toBe(c);
    expect(s.hydroxide.toNumber()).toBe(oh);
    expect(s.carbonate.toNumber()).toBe(co3);
    expect(s.bicarbonate.toNumber()).toBe(hco3);
  });

  it.each([
    // Equality within the stated tolerance of 0.05 mg/L (half of a 0.1 mg/L resolution; common practice).
    { p: 100.04, t: 200, c: 'P=T/2' },
    { p: 100.06, t: 200, c: 'P>T/2' },
    { p: 99.96, t: 200, c: 'P=T/2' },
    { p: 99.94, t: 200, c: 'P<T/2' },
    { p: 199.96, t: 200, c: 'P=T' },
    { p: 200.04, t: 200, c: 'P=T' },
  ])('tolerance: P $p with T $t is $c (common practice: half the reporting resolution)', ({ p, t, c }) => {
    expect(speciesFromPT(p, t).case).toBe(c);
  });

  it('P above T beyond the tolerance is an input error naming phenolphthaleinAlkalinity', () => {
    expect(() => speciesFromPT(200.1, 200)).toThrow(expect.objectContaining({ fields: { phenolphthaleinAlkalinity: expect.any(String) } }));
  });

  it('property: the three species are non-negative and sum exactly to T (SM 2320 B Table 2320:II)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 100_000 }), fc.integer({ min: 0, max: 1000 }), (tHundredths, share) => {
        const t = tHundredths / 100;
        const p = Math.round((t * share) / 10) / 100;
        const s = speciesFromPT(p, t);
        expect(s.hydroxide.plus(s.carbonate).plus(s.bicarbonate).eq(t)).toBe(true);
        for (const v of [s.hydroxide, s.carbonate, s.bicarbonate]) expect(v.isNegative() && !v.isZero()).toBe(false);
      }),
    );
  });
});

describe('ionic strength and activity', () => {
  it.each([
    [300, 0.0075], // Langelier 1936 via SM 2330: I = 2.5e-5 × TDS
    [500, 0.0125],
  ])('TDS %f mg/L → I %f (Langelier 1936, as in SM 2330)', (tds, expected) => {
    expect(ionicStrengthFromTds(tds)).toBeCloseTo(expected, 12);
  });

  it('SC 500 µS/cm → I 0.0080 (Russell 1976: I = 1.6e-5 × SC)', () => {
    expect(ionicStrengthFromConductance(500)).toBeCloseTo(0.008, 12);
  });

  it('A = 0.5108 at 25 °C from the SM 2330 B temperature form', () => {
    expect(debyeHuckelA(25)).toBeCloseTo(0.5108, 4);
  });

  it('A rises with temperature because εT falls (SM 2330 B temperature form)', () => {
    for (let t = 0; t < 60; t += 10) expect(debyeHuckelA(t + 10)).toBeGreaterThan(debyeHuckelA(t));
  });

  it('I = 0.0075, A = 0.5108: log γ1 −0.03956, γ1 0.9129, γ2 0.6946 (Davies 1962)', () => {
    expect(daviesLogGamma(0.0075, 1, 0.5108)).toBeCloseTo(-0.03956, 5);
    const a = activityCoefficients(0.0075, 25);
    expect(a.gamma1).toBeCloseTo(0.9129, 4);
    expect(a.gamma2).toBeCloseTo(0.6946, 4);
    expect(Math.log10(a.gamma2)).toBeCloseTo(4 * Math.log10(a.gamma1), 12);
  });

  it('I = 0 is an ideal solution (γ = 1) and says so', () => {
    const a = activityCoefficients(0, 25);
    expect(a).toMatchObject({ gamma1: 1, gamma2: 1, applied: false });
  });
});

describe('equilibrium speciation (USGS NFM 6.6.5.B; SM 2330)', () => {
  it('25 °C, pH 8.50, T 150.0, TDS 300: HCO3 144.2, CO3 5.62, OH 0.175 mg/L as CaCO3 (computed from NFM 6.6.5.B equations)', () => {
    const s = equilibriumSpeciation({ pH: 8.5, totalAlkalinityMgL: 150, temperatureC: 25, ionicStrength: ionicStrengthFromTds(300) });
    expect(s.alkalinityEqL * 1000).toBeCloseTo(2.9976, 4);
    expect(s.carbonateToBicarbonateRatio).toBeCloseTo(0.019491, 6);
    expect(s.molar.bicarbonate).toBeCloseTo(2.8818e-3, 7);
    expect(s.asCaco3.bicarbonate).toBeCloseTo(144.2, 1);
    expect(s.asIon.bicarbonate).toBeCloseTo(175.8, 1);
    expect(s.molar.carbonate).toBeCloseTo(5.617e-5, 8);
    expect(s.asCaco3.carbonate).toBeCloseTo(5.62, 2);
    expect(s.asIon.carbonate).toBeCloseTo(3.37, 2);
    expect(s.molar.hydroxide).toBeCloseTo(3.506e-6, 9);
    expect(s.asCaco3.hydroxide).toBeCloseTo(0.175, 3);
    expect(s.molar.carbonicAcid).toBeCloseTo(1.87e-5, 7);
    expect(s.asIon.carbonDioxide).toBeCloseTo(0.82, 2);
    expect(s.molar.totalCarbonate).toBeCloseTo(2.957e-3, 6);
    expect(s.asCaco3.hydroxide + s.asCaco3.carbonate + s.asCaco3.bicarbonate).toBeCloseTo(150.0, 1);
  });

  it('same water with all γ = 1: HCO3 145.5, CO3 4.32, OH 0.160 (computed from NFM 6.6.5.B equations)', () => {
    const s = equilibriumSpeciation({ pH: 8.5, totalAlkalinityMgL: 150, temperatureC: 25 });
    expect(s.asCaco3.bicarbonate).toBeCloseTo(145.5, 1);
    expect(s.asCaco3.carbonate).toBeCloseTo(4.32, 2);
    expect(s.asCaco3.hydroxide).toBeCloseTo(0.16, 3);
  });

  it('pH 10.5, 25 °C: hydroxide 50,000 × 10^(pH − pKw) = 16.0 mg/L as CaCO3 (SM 2320 B)', () => {
    expect(hydroxideFromPh(10.5, 25)).toBeCloseTo(16.0, 1);
  });

  it('alkalinity lower than the hydroxide the pH implies is an input error on totalAlkalinity', () => {
    expect(() => equilibriumSpeciation({ pH: 11, totalAlkalinityMgL: 1 })).toThrow(
      expect.objectContaining({ fields: { totalAlkalinity: expect.any(String) } }),
    );
  });

  it('property: OH + CO3 + HCO3 − H (mg/L as CaCO3) equals T, all species non-negative (NFM 6.6.5.B alkalinity definition)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 4.5, max: 9.5, noNaN: true }),
        fc.double({ min: 10, max: 1000, noNaN: true }),
        fc.double({ min: 0, max: 40, noNaN: true }),
        fc.double({ min: 0, max: 0.05, noNaN: true }),
        (pH, t, temperatureC, ionicStrength) => {
          const s = equilibriumSpeciation({ pH, totalAlkalinityMgL: t, temperatureC, ionicStrength });
          const sum = s.asCaco3.hydroxide + s.asCaco3.carbonate + s.asCaco3.bicarbonate - s.asCaco3.hydrogen;
          expect(Math.abs(sum - t)).toBeLessThan(1e-9 * t);
          expect(Math.min(s.molar.bicarbonate, s.molar.carbonate, s.molar.carbonicAcid)).toBeGreaterThanOrEqual(0);
        },
      ),
    );
  });
});
