import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { lowAlkalinityTwoPoint } from '@shared/chemistry/alkalinity';
import {
  carbonateEquivalencePh,
  carbonateModelFromTotalCarbonate,
  carbonateWaterModel,
  endpointError,
  equivalencePoints,
  modelCurve,
  modelPh,
  strongAcidModel,
  strongBaseModel,
  totalEquivalencePh,
  volumeAtPh,
  volumeGrid,
} from '@shared/chemistry/curve';
import { logK1, logK2 } from '@shared/chemistry/speciation';
import { SYNTHETIC, SYNTHETIC_TITRATION } from './fixtures';

// Kw at 25 °C written out from Harned and Robinson 1940: log Kw = −4470.99/T + 6.0875 − 0.01706 T.
const KW25 = 10 ** (-4470.99 / 298.15 + 6.0875 - 0.01706 * 298.15);

/** pH of a strong acid/base mixture from the quadratic h² + S·h − Kw = 0 (charge balance with S = net strong base). */
function strongMixturePh(netStrongBaseM: number): number {
  const root = Math.sqrt(netStrongBaseM ** 2 + 4 * KW25);
  // Two algebraically equal roots; pick the one without cancellation.
  const h = netStrongBaseM > 0 ? (2 * KW25) / (netStrongBaseM + root) : (root - netStrongBaseM) / 2;
  return -Math.log10(h);
}

describe('strong base titrated with strong acid (charge balance [Na+] + [H+] = [Cl−] + [OH−])', () => {
  const model = strongBaseModel({ sampleVolumeMl: 50, concentrationM: 0.01, titrant: 'acid', titrantNormality: 0.02, temperatureC: 25 });
  it.each([
    // 50.00 mL of 0.01000 M NaOH with 0.02000 M HCl, V_eq 25.00 mL; computed from the charge balance with Kw = 10^−13.9947 (Harned and Robinson 1940).
    [0, 11.995],
    [12.5, 11.597],
    [24.0, 10.427],
    [24.9, 9.421],
    [25.0, 6.997],
    [25.1, 4.575],
    [26.0, 3.58],
    [30.0, 2.903],
  ])('%f mL → pH %f (computed from the charge balance; Kw Harned and Robinson 1940)', (v, pH) => {
    expect(modelPh(model, v)).toBeCloseTo(pH, 3);
    // Independent check: the closed-form quadratic of the same balance.
    expect(modelPh(model, v)).toBeCloseTo(strongMixturePh((0.01 * 50 - 0.02 * v) / (50 + v)), 8);
  });

  it('the single equivalence point is at 25.00 mL and pH ½ pKw (stoichiometry; Harned and Robinson 1940)', () => {
    const [eq] = equivalencePoints(model);
    expect(eq.name).toBe('total');
    expect(eq.volumeMl).toBeCloseTo(25, 12);
    expect(eq.pH).toBeCloseTo(13.9947 / 2, 4);
  });
});

describe('0.1 M strong acid titrated with 0.1 M strong base: the jump within a drop or two of equivalence', () => {
  // 25.00 mL of 0.1000 M HCl with 0.1000 M NaOH; V_eq = 25.00 mL.
  const model = strongAcidModel({ sampleVolumeMl: 25, concentrationM: 0.1, titrant: 'base', titrantNormality: 0.1, temperatureC: 25 });
  /** Expected pH from stoichiometry alone: excess moles / total volume, water's own ions ignored. */
  const stoichiometricPh = (v: number) => {
    const excessAcidMol = (0.1 * 25 - 0.1 * v) / 1000;
    const litres = (25 + v) / 1000;
    return excessAcidMol > 0 ? -Math.log10(excessAcidMol / litres) : 13.9947 + Math.log10(-excessAcidMol / litres);
  };

  it.each([
    // Before, at ±1 and ±2 drops (0.05 mL each) and after equivalence; expected from excess moles ÷ total volume.
    [0],
    [12.5],
    [24.0],
    [24.9],
    [24.95],
    [25.05],
    [25.1],
    [26.0],
  ])('%f mL: model pH equals the stoichiometric pH within 0.005 (excess moles / total volume)', (v) => {
    expect(Math.abs(modelPh(model, v) - stoichiometricPh(v))).toBeLessThan(0.005);
  });

  it('pH climbs only slowly until the last fraction of a millilitre, then jumps from about 4 to about 10 within one drop either side (stoichiometry)', () => {
    expect(stoichiometricPh(24.95)).toBeCloseTo(4.0, 2);
    expect(stoichiometricPh(25.05)).toBeCloseTo(10.0, 1);
    expect(modelPh(model, 24.95)).toBeGreaterThan(3.9);
    expect(modelPh(model, 24.95)).toBeLessThan(4.1);
    expect(modelPh(model, 25.05)).toBeGreaterThan(9.9);
    expect(modelPh(model, 25.05)).toBeLessThan(10.1);
    // The first 24 mL (96 % of the titrant) move the pH by less than 1.7 units; the next 1.05 mL by about 8.
    expect(modelPh(model, 24) - modelPh(model, 0)).toBeLessThan(1.7);
    expect(modelPh(model, 25.05) - modelPh(model, 24)).toBeGreaterThan(7);
  });
});

describe('closed carbonate water titrated with strong acid (charge balance; Plummer and Busenberg 1982)', () => {
  const model = carbonateWaterModel({
    sampleVolumeMl: SYNTHETIC.sampleVolumeMl,
    alkalinityEqL: SYNTHETIC.alkalinityEqL,
    initialPh: SYNTHETIC.initialPh,
    titrant: 'acid',
    titrantNormality: SYNTHETIC.titrantNormality,
    temperatureC: 25,
  });

  it('C_T = 2.3263 mM for 2.500 meq/L at pH 9.20 (USGS NFM 6.6.5.B equations)', () => {
    expect(model.totalCarbonateM * 1000).toBeCloseTo(2.3263, 4);
  });

  it('reproduces every reading of the synthetic titration to the 0.01 pH it was rounded to (closed-system model, Plummer and Busenberg 1982)', () => {
    const curve = modelCurve(model, SYNTHETIC_TITRATION.map((r) => r.volumeMl));
    curve.forEach((p, i) => expect(Math.abs(p.pH - SYNTHETIC_TITRATION[i].pH)).toBeLessThanOrEqual(0.005 + 1e-9));
  });

  it('equivalence points: carbonate 0.8685 mL at pH 8.32, total 12.500 mL at pH 4.52 (stoichiometry (Alk − C_T)·V0/N and Alk·V0/N)', () => {
    const [carbonate, total] = equivalencePoints(model);
    expect(carbonate.name).toBe('carbonate');
    expect(carbonate.volumeMl).toBeCloseTo(((2.5e-3 - model.totalCarbonateM) * 100) / 0.02, 10);
    expect(carbonate.volumeMl).toBeCloseTo(0.8685, 4);
    expect(carbonate.pH).toBeCloseTo(8.32, 2);
    expect(total.name).toBe('total');
    expect(total.volumeMl).toBeCloseTo(12.5, 10);
    expect(total.pH).toBeCloseTo(4.52, 2);
  });

  it('the carbonate equivalence pH is near ½(pK1 + pK2) = 8.34 (NaHCO3 solution; Plummer and Busenberg 1982)', () => {
    const [carbonate] = equivalencePoints(model);
    expect(Math.abs(carbonate.pH - (-logK1(25) - logK2(25)) / 2)).toBeLessThan(0.05);
  });

  it('endpoint error of pH 4.5: reads 0.0167 mL (0.13 %) past the true 12.500 mL (computed from the model and the fixed-endpoint definition)', () => {
    const e = endpointError(model, 4.5);
    expect(e.equivalence.name).toBe('total');
    expect(e.errorMl).toBeCloseTo(e.endpointVolumeMl - 12.5, 12);
    expect(e.errorMl).toBeGreaterThan(0);
    expect(e.errorMl).toBeLessThan(0.05);
    expect(e.errorMgL).toBeCloseTo((e.errorMl * 0.02 * 50000) / 100, 12);
    expect(e.trueResultMgL).toBeCloseTo(125, 10);
    expect(e.errorPercent).toBeCloseTo((e.errorMl / 12.5) * 100, 10);
  });

  it('endpoint error of pH 8.3 is measured against the carbonate point (nearest equivalence pH)', () => {
    const e = endpointError(model, 8.3);
    expect(e.equivalence.name).toBe('carbonate');
    // The model reaches 8.30 about 0.012 mL after the 0.8685 mL equivalence (pH 8.32 there).
    expect(e.errorMl).toBeGreaterThan(0);
    expect(e.errorMl).toBeLessThan(0.02);
  });

  it('volumeAtPh inverts modelPh (closed form of the charge balance vs bisection)', () => {
    for (const pH of [9.0, 8.3, 7, 6, 5, 4.5, 4.2, 3.5, 3.0]) {
      const v = volumeAtPh(model, pH)!;
      expect(modelPh(model, v)).toBeCloseTo(pH, 9);
    }
  });

  it('a pH above the start, or below what the titrant can reach, has no volume', () => {
    expect(volumeAtPh(model, 9.5)).toBeNull();
    expect(volumeAtPh(model, 1.0)).toBeNull();
    expect(() => endpointError(model, 1.0)).toThrow(expect.objectContaining({ fields: { endpointPh: expect.stringMatching(/never brings/) } }));
    expect(() => endpointError(model, 9.5)).toThrow(expect.objectContaining({ fields: { endpointPh: expect.stringMatching(/already past/) } }));
  });
});

describe('low-alkalinity model check: 10.0 mg/L, V_s 200 mL, pH 6.80, 25 °C, 0.02 N (SM 2320 B ¶4d; model)', () => {
  const model = carbonateWaterModel({ sampleVolumeMl: 200, alkalinityEqL: 10 / 50000, initialPh: 6.8, titrant: 'acid', titrantNormality: 0.02 });
  it('pH 4.50 at 2.282 mL and pH 4.20 at 2.620 mL; fixed 4.5 reads 11.4 mg/L (high); 2B − C gives 9.72 mg/L (computed from the model; SM 2320 B formulas)', () => {
    const b = volumeAtPh(model, 4.5)!;
    const c = volumeAtPh(model, 4.2)!;
    expect(b).toBeCloseTo(2.282, 3);
    expect(c).toBeCloseTo(2.62, 3);
    expect(endpointError(model, 4.5).endpointResultMgL).toBeCloseTo(11.4, 1);
    const twoPoint = lowAlkalinityTwoPoint({
      sampleVolumeMl: 200,
      titrantNormality: 0.02,
      firstEndpointPh: 4.5,
      volumeToFirstEndpointMl: b,
      volumeToSecondEndpointMl: c,
      secondEndpointPh: 4.2,
    });
    expect(twoPoint.totalAlkalinity.toNumber()).toBeCloseTo(9.72, 2);
  });
});

describe('pH at the total-alkalinity equivalence (CO2 solution), 25 °C', () => {
  it.each([
    // C_T mM → pH, solved with the charge balance (Plummer and Busenberg 1982 constants); ≈ ½(pK1 − log C_T).
    [0.6, 4.79],
    [1.0, 4.68],
    [3.0, 4.44],
    [10.0, 4.18],
  ])('C_T %f mM → pH %f (charge balance; Plummer and Busenberg 1982)', (mM, pH) => {
    const exact = totalEquivalencePh(mM / 1000, 25);
    expect(exact).toBeCloseTo(pH, 2);
    // The textbook approximation ½(pK1 − log C_T) agrees within 0.01 (Stumm and Morgan).
    expect(Math.abs(exact - (-logK1(25) - Math.log10(mM / 1000)) / 2)).toBeLessThan(0.01);
  });

  it('falls as alkalinity rises, which is why Table 2320:I lowers the endpoint for higher alkalinity (SM 2320 B)', () => {
    expect(totalEquivalencePh(0.6e-3)).toBeGreaterThan(totalEquivalencePh(3e-3));
    expect(totalEquivalencePh(3e-3)).toBeGreaterThan(totalEquivalencePh(10e-3));
  });

  it('a NaHCO3 solution sits near pH 8.3 (½(pK1 + pK2); Plummer and Busenberg 1982)', () => {
    expect(carbonateEquivalencePh(2.3e-3)).toBeGreaterThan(8.2);
    expect(carbonateEquivalencePh(2.3e-3)).toBeLessThan(8.4);
  });
});

describe('acid sample with carbonate titrated with strong base (acidity; SM 2310 B endpoints)', () => {
  // 100 mL at pH 3.00 with C_T 2.0 mM, 0.0200 N NaOH.
  const model = carbonateModelFromTotalCarbonate({ sampleVolumeMl: 100, initialPh: 3.0, totalCarbonateM: 2e-3, titrant: 'base', titrantNormality: 0.02 });

  it('mineral point near 5.00 mL (1 mM free acid) and total point near 15.00 mL (+ 2 mM CO2) (stoichiometry)', () => {
    const [mineral, total] = equivalencePoints(model);
    expect(mineral.name).toBe('mineral');
    expect(mineral.volumeMl).toBeCloseTo((1e-3 * 100) / 0.02, 1);
    expect(total.name).toBe('total');
    expect(total.volumeMl).toBeCloseTo(((1e-3 + 2e-3) * 100) / 0.02, 1);
    expect(total.volumeMl - mineral.volumeMl).toBeCloseTo((2e-3 * 100) / 0.02, 10);
  });

  it('mineral point pH ≈ ½(pK1 − log C_T′) and total point pH near 8.3 (Plummer and Busenberg 1982; SM 2310 B)', () => {
    const [mineral, total] = equivalencePoints(model);
    const diluted = (2e-3 * 100) / (100 + mineral.volumeMl);
    expect(Math.abs(mineral.pH - (-logK1(25) - Math.log10(diluted)) / 2)).toBeLessThan(0.02);
    expect(total.pH).toBeGreaterThan(8.1);
    expect(total.pH).toBeLessThan(8.4);
  });

  it('the fixed endpoints 3.7 and 8.3 map to the mineral and total points', () => {
    expect(endpointError(model, 3.7).equivalence.name).toBe('mineral');
    expect(endpointError(model, 3.7).errorMl).toBeLessThan(0);
    expect(endpointError(model, 8.3).equivalence.name).toBe('total');
  });
});

describe('activity corrections use concentration constants (K1/γ1², K2/γ2, Kw/γ1²)', () => {
  it('the starting pH is reproduced with activity, and C_T matches the activity-corrected speciation of NFM 6.6.5.B', () => {
    const m = carbonateWaterModel({ sampleVolumeMl: 100, alkalinityEqL: 150 / 50040, initialPh: 8.5, titrant: 'acid', titrantNormality: 0.02, ionicStrength: 0.0075 });
    expect(modelPh(m, 0)).toBeCloseTo(8.5, 9);
    expect(m.totalCarbonateM).toBeCloseTo(2.957e-3, 6);
  });
});

describe('properties', () => {
  it('the model curve is monotone in volume: falls with acid, rises with base (buffer capacity is positive)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 10, max: 1000, noNaN: true }),
        fc.double({ min: 6, max: 9.2, noNaN: true }),
        fc.double({ min: 0, max: 40, noNaN: true }),
        fc.double({ min: 0, max: 0.05, noNaN: true }),
        fc.boolean(),
        (alkMgL, initialPh, temperatureC, ionicStrength, base) => {
          const model = base
            ? carbonateModelFromTotalCarbonate({ sampleVolumeMl: 100, initialPh: initialPh - 3, totalCarbonateM: alkMgL / 50000, titrant: 'base', titrantNormality: 0.02, temperatureC, ionicStrength })
            : carbonateWaterModel({ sampleVolumeMl: 100, alkalinityEqL: alkMgL / 50000, initialPh, titrant: 'acid', titrantNormality: 0.02, temperatureC, ionicStrength });
          const curve = modelCurve(model, volumeGrid(60, 300));
          for (let i = 1; i < curve.length; i++) {
            const step = curve[i].pH - curve[i - 1].pH;
            if (base) expect(step).toBeGreaterThan(-1e-9);
            else expect(step).toBeLessThan(1e-9);
          }
        },
      ),
      { numRuns: 60 },
    );
  });
});
