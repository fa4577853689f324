import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { calculateAcidity, calculateAlkalinity, calculateCurve, calculateLsi, calculateSpeciation } from '@shared/chemistry/service';
import { InputError } from '@shared/errors';
import { SYNTHETIC_TITRATION } from './fixtures';

function inputErrorOf(run: () => unknown): InputError {
  try {
    run();
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return e as InputError;
  }
  throw new Error('expected an InputError');
}

const codes = (r: { warnings: Array<{ code: string }> }) => r.warnings.map((w) => w.code);

describe('calculateAlkalinity from endpoint volumes (SM 2320 B)', () => {
  it('1a + 1c: P 21.0, T 124.0 mg/L, T 2.480 meq/L, species P < T/2 → CO3 42, HCO3 82 (SM 2320 B; Table 2320:II)', () => {
    const r = calculateAlkalinity({ sampleVolumeMl: 100, titrantNormality: 0.02, volumeToPh83Ml: 2.1, volumeToTotalEndpointMl: 12.4 });
    expect(r.phenolphthaleinAlkalinity).toBe(21);
    expect(r.totalAlkalinity).toBe(124);
    expect(r.totalAlkalinityMeqL).toBe(2.48);
    expect(r.phenolphthaleinAlkalinityMeqL).toBe(0.42);
    expect(r.species).toMatchObject({ case: 'P<T/2', hydroxide: 0, carbonate: 42, bicarbonate: 82 });
    expect(r.speciesEquilibrium).toBeNull();
    expect(r.endpoints).toEqual({
      phenolphthalein: { volumeMl: 2.1, pH: 8.3, method: 'fixed' },
      total: { volumeMl: 12.4, pH: 4.5, method: 'fixed' },
    });
    expect(r).toMatchObject({ endpointMethod: 'fixed', totalEndpointPh: 4.5, caco3Factor: 50000, curve: null, lowAlkalinity: null });
    expect(r.constants).toMatchObject({ caco3Factor: 50000, caco3MgPerMeq: 50.04, source: 'SM 2320 B' });
    expect(r.exact).toMatchObject({ phenolphthaleinAlkalinity: '21', totalAlkalinity: '124', totalAlkalinityMeqL: '2.48' });
    expect(r.warnings).toEqual([]);
  });

  it('1b: factor 50,044 → 124.109 mg/L, exact "124.10912" (computed from SM 2320 B)', () => {
    const r = calculateAlkalinity({ sampleVolumeMl: 100, titrantNormality: 0.02, volumeToPh83Ml: 0, volumeToTotalEndpointMl: 12.4, caco3Factor: 50044 });
    expect(r.totalAlkalinity).toBe(124.109);
    expect(r.exact.totalAlkalinity).toBe('124.10912');
    expect(r.caco3Factor).toBe(50044);
    expect(r.species.case).toBe('P=0');
  });

  it('1d: 8.75 mL of 0.1000 N on 50.0 mL → 875 mg/L (SM 2320 B)', () => {
    const r = calculateAlkalinity({ sampleVolumeMl: 50, titrantNormality: 0.1, volumeToPh83Ml: 0, volumeToTotalEndpointMl: 8.75 });
    expect(r.totalAlkalinity).toBe(875);
  });

  it('an initial pH implying more hydroxide than T is a 400 on initialPh', () => {
    const e = inputErrorOf(() =>
      calculateAlkalinity({ sampleVolumeMl: 100, titrantNormality: 0.02, volumeToPh83Ml: 0.1, volumeToTotalEndpointMl: 0.2, initialPh: 11.5, temperatureC: 25 }),
    );
    expect(Object.keys(e.fields)).toEqual(['initialPh']);
  });

  it('with initialPh and TDS the equilibrium species come too, converted with the result’s factor so they sum to T (NFM 6.6.5.B; SM 2330)', () => {
    const r = calculateAlkalinity({
      sampleVolumeMl: 100,
      titrantNormality: 0.02,
      volumeToPh83Ml: 0.3,
      volumeToTotalEndpointMl: 15,
      initialPh: 8.5,
      temperatureC: 25,
      tdsMgL: 300,
    });
    const e = r.speciesEquilibrium!;
    expect(e.caco3MgPerEq).toBe(50000);
    expect(e.activity).toMatchObject({ applied: true, ionicStrength: 0.0075, ionicStrengthSource: 'tds', debyeHuckelA: 0.510814 });
    expect(e.activity.debyeHuckelASource).toMatch(/SM 2330 B/);
    expect(e.hydroxide + e.carbonate + e.bicarbonate - e.hydrogen).toBeCloseTo(150, 3);
    expect(e.bicarbonate).toBeCloseTo(144.2, 0);
    expect(e.constants.source).toMatch(/Plummer and Busenberg 1982/);
    expect(r.warnings).toEqual([]);
  });
});

describe('calculateAlkalinity from readings (synthetic titration; SM 2320 B, USGS NFM A6.6.4)', () => {
  const body = { sampleVolumeMl: 100, titrantNormality: 0.02, readings: SYNTHETIC_TITRATION, temperatureC: 25 };

  it('fixed endpoints by default: P 8.81 (0.8810 mL), T 125.2 (12.5167 mL) mg/L, plus the inflection and Gran results and the derivative (SM 2320 B; NFM A6.6.4.B/C)', () => {
    const r = calculateAlkalinity(body);
    expect(r.endpointMethod).toBe('fixed');
    expect(r.phenolphthaleinAlkalinity).toBeCloseTo(8.81, 2);
    expect(r.totalAlkalinity).toBeCloseTo(125.2, 1);
    expect(r.endpoints.phenolphthalein.volumeMl).toBeCloseTo(0.881, 4);
    expect(r.endpoints.total.volumeMl).toBeCloseTo(12.5167, 4);
    const c = r.curve!;
    expect(c.inflection.totalAlkalinity).toBe(125);
    expect(c.inflection.phenolphthaleinAlkalinity).toBe(8.75);
    expect(c.gran?.n).toBe(10);
    expect(c.gran?.totalAlkalinity).toBeCloseTo(124.7, 1);
    expect(c.derivative).toHaveLength(SYNTHETIC_TITRATION.length - 1);
    // Equilibrium species from the first reading's pH.
    expect(r.speciesEquilibrium?.pH).toBe(9.2);
    // pH 9.20 is not above the 9.2 limit for the carbonate-only assumption; no TDS was given.
    expect(codes(r)).toEqual(['activity_not_corrected']);
  });

  it.each([
    { method: 'inflection', p: 8.75, t: 125.0, source: 'NFM A6.6.4.B' },
    { method: 'gran', p: 8.81, t: 124.7, source: 'NFM A6.6.4.C (P by the fixed 8.3 endpoint)' },
  ] as const)('$method: P $p, T $t mg/L ($source)', ({ method, p, t }) => {
    const r = calculateAlkalinity({ ...body, endpointMethod: method });
    expect(r.endpointMethod).toBe(method);
    expect(r.phenolphthaleinAlkalinity).toBeCloseTo(p, 2);
    expect(r.totalAlkalinity).toBeCloseTo(t, 1);
    expect(r.endpoints.total.method).toBe(method);
    expect(r.totalEndpointPh).toBeNull();
  });

  it.each([
    [4.6, 124.3],
    [4.9, 121.6],
  ])('total endpoint pH %f → %f mg/L (SM 2320 B Table 2320:I)', (pH, t) => {
    expect(calculateAlkalinity({ ...body, totalEndpointPh: pH }).totalAlkalinity).toBeCloseTo(t, 1);
  });

  it('readings that start at or below pH 8.3 give P = 0 (IUPAC Gold Book 09038)', () => {
    const r = calculateAlkalinity({ ...body, readings: SYNTHETIC_TITRATION.slice(4) });
    expect(r.phenolphthaleinAlkalinity).toBe(0);
    expect(r.species.case).toBe('P=0');
    expect(r.curve?.inflection.carbonate).toBeNull();
  });

  it.each([
    { name: 'never reach the total endpoint', readings: SYNTHETIC_TITRATION.slice(0, 24), method: undefined, reason: /never reach pH 4.5/ },
    { name: 'start below the total endpoint', readings: SYNTHETIC_TITRATION.slice(28), method: undefined, reason: /already past pH 4.5/ },
    { name: 'stop before the Gran window', readings: SYNTHETIC_TITRATION.slice(0, 30), method: 'gran' as const, reason: /Gran/ },
    { name: 'have no bicarbonate slope', readings: SYNTHETIC_TITRATION.slice(0, 9), method: 'inflection' as const, reason: /bicarbonate inflection/ },
  ])('readings that $name are a 400 on readings', ({ readings, method, reason }) => {
    const e = inputErrorOf(() => calculateAlkalinity({ ...body, readings, endpointMethod: method }));
    expect(e.fields.readings).toMatch(reason);
  });

  it('property: scaling the sample volume and every titrant volume by the same factor leaves P and T unchanged, for every endpoint method', () => {
    const methods = ['fixed', 'inflection', 'gran'] as const;
    const reference = Object.fromEntries(methods.map((m) => [m, calculateAlkalinity({ ...body, endpointMethod: m })]));
    fc.assert(
      fc.property(fc.double({ min: 0.1, max: 10, noNaN: true }), fc.constantFrom(...methods), (k, method) => {
        const scaled = calculateAlkalinity({
          ...body,
          endpointMethod: method,
          sampleVolumeMl: 100 * k,
          readings: SYNTHETIC_TITRATION.map((r) => ({ volumeMl: r.volumeMl * k, pH: r.pH })),
        });
        const ref = reference[method];
        expect(scaled.totalAlkalinity).toBeCloseTo(ref.totalAlkalinity, 3);
        expect(scaled.phenolphthaleinAlkalinity).toBeCloseTo(ref.phenolphthaleinAlkalinity, 4);
        expect(Number(scaled.exact.totalAlkalinity)).toBeCloseTo(Number(ref.exact.totalAlkalinity), 8);
      }),
      { numRuns: 60 },
    );
  });
});

describe('calculateAlkalinity, low-alkalinity two-point method (SM 2320 B ¶4d)', () => {
  const low = { sampleVolumeMl: 200, titrantNormality: 0.02, lowAlkalinity: { firstEndpointPh: 4.5, volumeToFirstEndpointMl: 3.05, volumeToSecondEndpointMl: 3.5 } };

  it('1f: 2B − C = 2.60 mL → 13.0 mg/L (SM 2320 B ¶5)', () => {
    const r = calculateAlkalinity(low);
    expect(r.totalAlkalinity).toBe(13);
    expect(r.endpointMethod).toBe('two_point');
    expect(r.lowAlkalinity).toEqual({ equivalenceVolumeMl: 2.6, firstEndpointPh: 4.5, secondEndpointPh: 4.2 });
    expect(r.endpoints.total).toEqual({ volumeMl: 2.6, pH: 4.5, method: 'two_point' });
    expect(r.constants.formula).toMatch(/2B − C/);
    expect(r.warnings).toEqual([]);
  });

  it('a second pH not 0.30 below the first is a 400 on lowAlkalinity.secondEndpointPh (SM 2320 B ¶4d)', () => {
    const e = inputErrorOf(() => calculateAlkalinity({ ...low, lowAlkalinity: { ...low.lowAlkalinity, secondEndpointPh: 4.0 } }));
    expect(Object.keys(e.fields)).toEqual(['lowAlkalinity.secondEndpointPh']);
  });
});

describe('calculateAlkalinity warnings (suspicious but legal input)', () => {
  const v = (overrides: Record<string, unknown>) => ({ sampleVolumeMl: 100, titrantNormality: 0.02, volumeToPh83Ml: 0, volumeToTotalEndpointMl: 12.4, ...overrides });
  it.each([
    { name: 'pH 4.9 endpoint for about 500 mg/L (Table 2320:I says 4.3)', body: v({ sampleVolumeMl: 50, volumeToTotalEndpointMl: 25, totalEndpointPh: 4.9 }), code: 'endpoint_ph_not_recommended' },
    { name: 'pH 4.0 endpoint, outside 4.3–4.9', body: v({ totalEndpointPh: 4.0 }), code: 'endpoint_ph_not_recommended' },
    { name: 'a 0.80 mL titre on a 0.02 mL burette', body: v({ volumeToTotalEndpointMl: 0.8, sampleVolumeMl: 10 }), code: 'titrant_volume_small' },
    { name: 'a 55 mL titre (EPA 310.1)', body: v({ volumeToTotalEndpointMl: 55 }), code: 'titrant_volume_large' },
    { name: 'T below 20 mg/L at a fixed endpoint (SM 2320 B ¶4d)', body: v({ volumeToTotalEndpointMl: 1.5 }), code: 'low_alkalinity_method_advised' },
    { name: 'P reported for a sample that starts at pH 8.0', body: v({ volumeToPh83Ml: 1, initialPh: 8.0, temperatureC: 25, tdsMgL: 200 }), code: 'phenolphthalein_alkalinity_with_low_ph' },
    {
      name: 'a two-point first pH of 4.8 (method: 4.3–4.7)',
      body: { sampleVolumeMl: 200, titrantNormality: 0.02, lowAlkalinity: { firstEndpointPh: 4.8, volumeToFirstEndpointMl: 3.05, volumeToSecondEndpointMl: 3.5 } },
      code: 'first_endpoint_ph_outside_range',
    },
  ])('$name → $code', ({ body, code }) => {
    expect(codes(calculateAlkalinity(body))).toContain(code);
  });

  it.each([
    { name: 'routine pH 4.5 at 500 mg/L', body: v({ sampleVolumeMl: 50, volumeToTotalEndpointMl: 25, totalEndpointPh: 4.5 }) },
    { name: 'pH 4.3 at 500 mg/L', body: v({ sampleVolumeMl: 50, volumeToTotalEndpointMl: 25, totalEndpointPh: 4.3 }) },
    { name: 'pH 4.6 at about 150 mg/L', body: v({ volumeToTotalEndpointMl: 15, totalEndpointPh: 4.6 }) },
    { name: 'a 0.80 mL titre read on a 0.01 mL microburet', body: v({ volumeToTotalEndpointMl: 0.8, sampleVolumeMl: 10, buretteResolutionMl: 0.01 }) },
    { name: 'a 50 mL titre', body: v({ volumeToTotalEndpointMl: 50 }) },
  ])('no warning for $name', ({ body }) => {
    expect(calculateAlkalinity(body).warnings).toEqual([]);
  });

  it('each warning has a code, a message and, where it applies, a field', () => {
    const [w] = calculateAlkalinity(v({ totalEndpointPh: 4.0 })).warnings;
    expect(w).toEqual({ code: 'endpoint_ph_not_recommended', message: expect.stringMatching(/4\.3–4\.9/), field: 'totalEndpointPh' });
  });
});

describe('calculateAcidity (SM 2310 B)', () => {
  it('4a: 5.60 mL of 0.0200 N on 100 mL → total acidity 56.0 mg/L', () => {
    const r = calculateAcidity({ sampleVolumeMl: 100, titrantNormality: 0.02, volumeToPh37Ml: 0, volumeToPh83Ml: 5.6 });
    expect(r).toMatchObject({ totalAcidity: 56, mineralAcidity: 0, netAlkaline: false, reportable: true, peroxideTreatment: null });
    expect(r.endpoints).toEqual({ mineral: { volumeMl: 0, pH: 3.7 }, total: { volumeMl: 5.6, pH: 8.3 } });
    expect(r.exact.totalAcidity).toBe('56');
  });

  it('4b: peroxide pretreatment 5.00 mL of 0.0200 N H2SO4, 9.20 mL NaOH on 50.0 mL → 84.0 mg/L', () => {
    const r = calculateAcidity({ sampleVolumeMl: 50, titrantNormality: 0.02, volumeToPh83Ml: 9.2, peroxideTreatment: { acidVolumeMl: 5, acidNormality: 0.02 } });
    expect(r.totalAcidity).toBe(84);
    expect(r.peroxideTreatment).toEqual({ acidVolumeMl: 5, acidNormality: 0.02, correctionMeq: 0.1 });
    expect(r.mineralAcidity).toBeNull();
  });

  it('4c: as 4b with 3.00 mL → −40.0 mg/L kept signed, flagged net alkaline, not reportable, prompting for alkalinity (SM 2310 B)', () => {
    const r = calculateAcidity({ sampleVolumeMl: 50, titrantNormality: 0.02, volumeToPh83Ml: 3, peroxideTreatment: { acidVolumeMl: 5, acidNormality: 0.02 } });
    expect(r.totalAcidity).toBe(-40);
    expect(r.exact.totalAcidity).toBe('-40');
    expect(r.netAlkaline).toBe(true);
    expect(r.reportable).toBe(false);
    expect(r.warnings).toEqual([expect.objectContaining({ code: 'net_alkaline', field: 'volumeToPh83Ml', message: expect.stringMatching(/alkalinity/) })]);
  });

  it('the endpoint actually used is recorded (EPA 305.1 uses pH 8.2)', () => {
    expect(calculateAcidity({ sampleVolumeMl: 100, titrantNormality: 0.02, volumeToPh83Ml: 5.6, totalEndpointPh: 8.2 }).endpoints.total.pH).toBe(8.2);
  });

  it('a pH 3.7 volume beyond the pH 8.3 volume is a 400 on volumeToPh37Ml', () => {
    const e = inputErrorOf(() => calculateAcidity({ sampleVolumeMl: 100, titrantNormality: 0.02, volumeToPh37Ml: 6, volumeToPh83Ml: 5.6 }));
    expect(Object.keys(e.fields)).toEqual(['volumeToPh37Ml']);
  });
});

describe('calculateSpeciation (USGS NFM 6.6.5.B; SM 2330; SM 2320 B)', () => {
  it('2e: 25 °C, pH 8.50, T 150.0, TDS 300 → HCO3 144.2, CO3 5.62, OH 0.175 mg/L as CaCO3; γ1 0.9129, γ2 0.6946 with A 0.5108', () => {
    const r = calculateSpeciation({ pH: 8.5, totalAlkalinity: 150, temperatureC: 25, tdsMgL: 300 });
    const e = r.equilibrium;
    expect(e.bicarbonate).toBeCloseTo(144.2, 1);
    expect(e.carbonate).toBeCloseTo(5.62, 2);
    expect(e.hydroxide).toBeCloseTo(0.175, 3);
    expect(e.asIon.bicarbonate).toBeCloseTo(175.8, 1);
    expect(e.totalCarbonateMmolL).toBeCloseTo(2.957, 3);
    expect(e.caco3MgPerEq).toBe(50040);
    expect(e.activity).toMatchObject({ gamma1: expect.closeTo(0.9129, 4), gamma2: expect.closeTo(0.6946, 4), debyeHuckelA: expect.closeTo(0.5108, 4) });
    expect(r.fromPT).toBeNull();
    expect(r.warnings).toEqual([]);
  });

  it('2f: no TDS → γ = 1, HCO3 145.5, CO3 4.32, OH 0.160, and a warning that activity was not corrected', () => {
    const r = calculateSpeciation({ pH: 8.5, totalAlkalinity: 150, temperatureC: 25 });
    expect(r.equilibrium.bicarbonate).toBeCloseTo(145.5, 1);
    expect(r.equilibrium.carbonate).toBeCloseTo(4.32, 2);
    expect(r.equilibrium.hydroxide).toBeCloseTo(0.16, 3);
    expect(r.equilibrium.activity.applied).toBe(false);
    expect(codes(r)).toEqual(['activity_not_corrected']);
  });

  it('2g: pH 10.5 → hydroxide from pH 16.0 mg/L as CaCO3, and a warning that other bases may count above pH 9.2 (SM 2320 B; NFM 6.6.5.B)', () => {
    const r = calculateSpeciation({ pH: 10.5, totalAlkalinity: 150, temperatureC: 25, specificConductanceUsCm: 500, phenolphthaleinAlkalinity: 40 });
    expect(r.hydroxideFromPh).toBeCloseTo(16.0, 1);
    expect(r.equilibrium.activity).toMatchObject({ ionicStrength: 0.008, ionicStrengthSource: 'specific_conductance' });
    expect(r.fromPT).toMatchObject({ case: 'P<T/2', carbonate: 80, bicarbonate: 70 });
    expect(codes(r)).toContain('non_carbonate_bases_possible');
  });
});

describe('calculateCurve (charge-balance model)', () => {
  it('1h: 10.0 mg/L, 200 mL, pH 6.80, 0.02 N → pH 4.5 at 2.282 mL, 11.4 mg/L, true 2.000 mL (computed from the model; SM 2320 B)', () => {
    const r = calculateCurve({ sampleVolumeMl: 200, titrantNormality: 0.02, totalAlkalinity: 10, initialPh: 6.8, temperatureC: 25 });
    expect(r.equivalencePoints).toEqual([{ name: 'total', volumeMl: 2, pH: expect.closeTo(4.97, 2) }]);
    expect(r.endpointErrors).toHaveLength(1);
    const e = r.endpointErrors[0];
    expect(e).toMatchObject({ endpointPh: 4.5, equivalence: 'total', equivalenceVolumeMl: 2 });
    expect(e.endpointVolumeMl).toBeCloseTo(2.282, 3);
    expect(e.endpointResultMgL).toBeCloseTo(11.4, 1);
    expect(e.errorMgL).toBeCloseTo(1.41, 2);
    expect(e.errorPercent).toBeCloseTo(14.1, 1);
    expect(r.model).toMatchObject({ sampleType: 'carbonate', titrant: 'acid', initialPh: 6.8 });
    expect(r.points.some((p) => p.volumeMl === 2)).toBe(true);
  });

  it('synthetic carbonate water: equivalence points near pH 8.3 and 4.5, default endpoints 8.3 and 4.5 (closed-system model; Plummer and Busenberg 1982)', () => {
    const r = calculateCurve({ sampleVolumeMl: 100, titrantNormality: 0.02, totalAlkalinity: 125, initialPh: 9.2, temperatureC: 25 });
    expect(r.equivalencePoints.map((e) => e.name)).toEqual(['carbonate', 'total']);
    expect(r.equivalencePoints[0].volumeMl).toBeCloseTo(0.8685, 4);
    expect(r.equivalencePoints[0].pH).toBeCloseTo(8.32, 2);
    expect(r.equivalencePoints[1].volumeMl).toBeCloseTo(12.5, 4);
    expect(r.equivalencePoints[1].pH).toBeCloseTo(4.52, 2);
    expect(r.endpointErrors.map((e) => [e.endpointPh, e.equivalence])).toEqual([
      [8.3, 'carbonate'],
      [4.5, 'total'],
    ]);
    expect(r.model.totalCarbonateMmolL).toBeCloseTo(2.3263, 4);
    for (let i = 1; i < r.points.length; i++) expect(r.points[i].pH).toBeLessThanOrEqual(r.points[i - 1].pH);
    expect(r.derivative).toHaveLength(r.points.length - 1);
  });

  it('strong base with strong acid at given volumes reproduces the charge-balance values (Kw Harned and Robinson 1940)', () => {
    const r = calculateCurve({
      sampleVolumeMl: 50,
      titrantNormality: 0.02,
      sampleType: 'strongBase',
      concentrationM: 0.01,
      temperatureC: 25,
      volumesMl: [0, 24.9, 25, 25.1, 30],
    });
    expect(r.points.map((p) => Number(p.pH.toFixed(3)))).toEqual([11.995, 9.421, 6.997, 4.575, 2.903]);
    expect(r.model.titrant).toBe('acid');
  });

  it('an endpoint the titrant cannot reach is a 400 on endpointPh.<i>', () => {
    const e = inputErrorOf(() =>
      calculateCurve({ sampleVolumeMl: 100, titrantNormality: 0.02, totalAlkalinity: 125, initialPh: 9.2, endpointPh: [4.5, 1.0] }),
    );
    expect(Object.keys(e.fields)).toEqual(['endpointPh.1']);
  });

  it('acidity sample with base titrant: mineral and total points, default endpoints 3.7 and 8.3 (SM 2310 B)', () => {
    const r = calculateCurve({ sampleVolumeMl: 100, titrantNormality: 0.02, titrant: 'base', initialPh: 3.0, totalCarbonateMmolL: 2, temperatureC: 25 });
    expect(r.equivalencePoints.map((p) => p.name)).toEqual(['mineral', 'total']);
    expect(r.endpointErrors.map((e) => e.endpointPh)).toEqual([3.7, 8.3]);
    for (let i = 1; i < r.points.length; i++) expect(r.points[i].pH).toBeGreaterThanOrEqual(r.points[i - 1].pH);
  });
});

describe('calculateLsi (SM 2330 B; Roberge 2008; Ryznar 1944)', () => {
  it('8e/8f: pH 7.80, 25 °C, TDS 500, Ca 200, alk 150 → exact pHs 7.323, LSI +0.48; approximate pHs 7.481, LSI +0.32, RSI 7.16', () => {
    const r = calculateLsi({ pH: 7.8, temperatureC: 25, tdsMgL: 500, calciumHardness: 200, totalAlkalinity: 150 });
    expect(r.pHs).toBeCloseTo(7.323, 3);
    expect(r.langelierIndex).toBeCloseTo(0.48, 2);
    expect(r.ryznarIndex).toBeCloseTo(2 * 7.323 - 7.8, 2);
    expect(r.exact).toMatchObject({ ionicStrength: 0.0125, ionicStrengthSource: 'tds', pfm: expect.closeTo(0.04945, 5), calciteSaturationIndex: expect.closeTo(0.477, 3) });
    expect(r.approximate).toMatchObject({ pHs: expect.closeTo(7.481, 3), langelierIndex: expect.closeTo(0.32, 2), ryznarIndex: expect.closeTo(7.16, 2) });
    expect(r.tendency.langelier).toBe('deposits_caco3');
    expect(r.tendency.note).toMatch(/SM 2330 A/);
    expect(r.warnings).toEqual([]);
  });

  it('without a temperature it assumes 25 °C and says so', () => {
    const r = calculateLsi({ pH: 7.8, tdsMgL: 500, calciumHardness: 200, totalAlkalinity: 150 });
    expect(r.temperatureC).toBe(25);
    expect(codes(r)).toEqual(['temperature_assumed']);
  });
});
