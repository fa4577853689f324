import { describe, expect, it } from 'vitest';
import { carbonateWaterModel, equivalencePoints } from '@shared/chemistry/curve';
import { endpointSteepness, INDICATORS, indicatorsAt, slopeAtPh, STEEP_FRACTION, steepPart } from '@shared/chemistry/tools/curveInsight';
import { calculateEndpointError } from '@shared/chemistry/tools/service';
import { InputError } from '@shared/errors';

/*
 * An independent closed-system carbonate model, written here from the charge balance
 * (Stumm and Morgan), ideal solution, with the 25 °C constants of domain.md 2.3 as printed
 * (Plummer and Busenberg 1982; Harned and Robinson 1940) rather than the engine's formulas.
 *
 * Charge balance after V mL of strong acid of normality N added to V0 mL:
 *   (Alk0·V0 − N·V)/(V0 + V) = C_T·V0/(V0 + V) · αB(h) + Kw/h − h,   αB = (K1 h + 2 K1 K2)/(h² + K1 h + K1 K2)
 */
const K1 = 10 ** -6.3519;
const K2 = 10 ** -10.3289;
const KW = 10 ** -13.9947;
const alphaB = (h: number) => (K1 * h + 2 * K1 * K2) / (h * h + K1 * h + K1 * K2);

/** The test water: 70 mg/L as CaCO3 (1.400 meq/L with the 50,000 factor), pH 7.50, 100 mL, 0.0200 N acid, 25 °C. */
const V0 = 100;
const N = 0.02;
const ALK_MGL = 70;
const ALK0 = ALK_MGL / 50_000;
const PH0 = 7.5;
const h0 = 10 ** -PH0;
// C_T from the same balance at V = 0: Alk0 = C_T αB(h0) + Kw/h0 − h0.
const CT = (ALK0 - KW / h0 + h0) / alphaB(h0);

/** pH after V mL, by bisection on log h (the residual falls as h rises). */
function phAt(v: number): number {
  const ct = (CT * V0) / (V0 + v);
  const alk = (ALK0 * V0 - N * v) / (V0 + v);
  let lo = -14;
  let hi = 0;
  for (let i = 0; i < 100; i++) {
    const mid = (lo + hi) / 2;
    const h = 10 ** mid;
    if (ct * alphaB(h) + KW / h - h - alk > 0) lo = mid;
    else hi = mid;
  }
  return -(lo + hi) / 2;
}

/** Volume at which the curve reaches a pH, by bisection on V (pH falls as acid is added). */
function volumeAt(pH: number): number {
  let lo = 0;
  let hi = 3 * ((ALK0 * V0) / N);
  for (let i = 0; i < 100; i++) {
    const mid = (lo + hi) / 2;
    if (phAt(mid) > pH) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

// Stoichiometric equivalence: all alkalinity neutralised, V_eq = Alk0·V0/N = 1.4e-3 × 100 / 0.02 = 7.000 mL.
const V_EQ = (ALK0 * V0) / N;

const request = { sampleVolumeMl: V0, titrantNormality: N, totalAlkalinity: ALK_MGL, initialPh: PH0, temperatureC: 25 };

describe('endpoint error of a fixed pH 4.5 endpoint, computed independently (charge balance; SM 2320 B)', () => {
  it('the test water’s true bicarbonate equivalence point is about pH 4.6 (own bisection)', () => {
    expect(V_EQ).toBeCloseTo(7.0, 12);
    expect(phAt(V_EQ)).toBeCloseTo(4.607, 2);
    const r = calculateEndpointError(request);
    const total = r.equivalencePoints.find((p) => p.name === 'total')!;
    expect(total.volumeMl).toBeCloseTo(V_EQ, 4);
    expect(total.pH).toBeCloseTo(phAt(V_EQ), 3);
    expect(total.resultMgL).toBeCloseTo(70, 4);
  });

  it('pH 4.5 reads high by a small positive error: own bisection on the charge balance', () => {
    const v45 = volumeAt(4.5);
    const errorMl = v45 - V_EQ;
    expect(errorMl).toBeGreaterThan(0);
    expect(errorMl).toBeLessThan(0.1);
    const r = calculateEndpointError(request);
    const t = r.endpoints.find((e) => e.kind === 'total')!;
    expect(t.endpointPh).toBe(4.5);
    expect(t.endpointVolumeMl).toBeCloseTo(v45, 4);
    expect(t.errorMl).toBeCloseTo(errorMl, 4);
    // mg/L as CaCO3 = ΔV × N × 50,000 / V0 (SM 2320 B); % of the true result; meq/L = ΔV × N × 1000 / V0
    expect(t.errorMgL).toBeCloseTo((errorMl * N * 50_000) / V0, 3);
    expect(t.errorMeqL).toBeCloseTo((errorMl * N * 1000) / V0, 5);
    expect(t.errorPercent).toBeCloseTo((errorMl / V_EQ) * 100, 2);
    expect(t.endpointResultMgL).toBeCloseTo(70 + (errorMl * N * 50_000) / V0, 3);
  });

  it('pH 4.5 error by the analytic excess-acid estimate agrees with the bisection', () => {
    /*
     * Past equivalence the acid added beyond V_eq is either free H+ or has protonated the
     * bicarbonate still left. Write the charge balance at V = V_eq + ΔV with Alk0·V0 = N·V_eq:
     *   −N·ΔV/(V0 + V) = C_T·V0/(V0 + V)·αB(h) + Kw/h − h
     * At pH 4.5, Kw/h (1e−5 of h) and the carbonate term 2K1K2 (1e−6 of K1·h) are negligible,
     * so αB ≈ K1/(h + K1) and
     *   N·ΔV = (V0 + V_eq + ΔV)·h − C_T·V0·K1/(h + K1)
     *   ΔV = [(V0 + V_eq)·h − C_T·V0·K1/(h + K1)] / (N − h)
     * i.e. excess strong acid ≈ 10^−4.5 (free H+, γ = 1 here) minus the [HCO3−] not yet protonated.
     */
    const h = 10 ** -4.5;
    const analytic = ((V0 + V_EQ) * h - (CT * V0 * K1) / (h + K1)) / (N - h);
    expect(analytic).toBeGreaterThan(0);
    expect(analytic).toBeCloseTo(volumeAt(4.5) - V_EQ, 4);
    const t = calculateEndpointError(request).endpoints.find((e) => e.kind === 'total')!;
    // 0.0655 mL, 0.655 mg/L, 0.94 % with these constants
    expect(t.errorMl).toBeCloseTo(analytic, 4);
  });

  it('an endpoint above the equivalence pH reads low: pH 4.9 comes before the true point (own bisection)', () => {
    const t = calculateEndpointError({ ...request, totalEndpointPh: 4.9 }).endpoints.find((e) => e.kind === 'total')!;
    expect(volumeAt(4.9) - V_EQ).toBeLessThan(0);
    expect(t.errorMl).toBeCloseTo(volumeAt(4.9) - V_EQ, 4);
  });
});

describe('the steep part of the curve (|dpH/dV| ≥ 75 % of its peak; stated fraction, common practice)', () => {
  /** |dpH/dV| by a central difference on the test's own V(pH). */
  const slope = (pH: number) => (2e-3) / Math.abs(volumeAt(pH - 1e-3) - volumeAt(pH + 1e-3));
  // The peak of the derivative near the total equivalence: a grid over pH 3.8–5.6.
  const grid = Array.from({ length: 181 }, (_, i) => 3.8 + i * 0.01);
  const peak = Math.max(...grid.map(slope));

  it.each([
    [4.5, true],
    [4.6, true],
    [4.0, false],
    [5.5, false],
  ])('endpoint pH %f on the steep part: %s (own finite differences)', (pH, steep) => {
    const ownFraction = slope(pH) / peak;
    expect(ownFraction >= STEEP_FRACTION).toBe(steep);
    const r = calculateEndpointError({ ...request, totalEndpointPh: pH });
    const t = r.endpoints.find((e) => e.kind === 'total')!;
    expect(t.steep).toBe(steep);
    expect(t.slopeFractionOfPeak).toBeCloseTo(ownFraction, 2);
    expect(r.warnings.some((w) => w.code === 'endpoint_outside_steep_part')).toBe(!steep);
  });

  it('the stated fraction is 0.75 and the definition is returned with every answer', () => {
    expect(STEEP_FRACTION).toBe(0.75);
    const r = calculateEndpointError(request);
    expect(r.steepFraction).toBe(0.75);
    expect(r.steepDefinition).toMatch(/75 %/);
  });

  it('the steep part brackets the equivalence point, and its edges sit at 75 % of the peak', () => {
    const model = carbonateWaterModel({ sampleVolumeMl: V0, titrant: 'acid', titrantNormality: N, temperatureC: 25, initialPh: PH0, alkalinityEqL: ALK0 });
    const [total] = equivalencePoints(model);
    const part = steepPart(model, total, total.volumeMl)!;
    expect(part.maxSlope).toBeCloseTo(peak, 1);
    expect(part.highPh).toBeGreaterThan(total.pH);
    expect(part.lowPh).toBeLessThan(total.pH);
    expect(part.highVolumeMl).toBeLessThan(total.volumeMl);
    expect(part.lowVolumeMl).toBeGreaterThan(total.volumeMl);
    expect(slopeAtPh(model, part.highPh)! / part.maxSlope).toBeCloseTo(0.75, 3);
    expect(slopeAtPh(model, part.lowPh)! / part.maxSlope).toBeCloseTo(0.75, 3);
    expect(endpointSteepness(model, 4.5, part).volumePerTenthPhMl).toBeCloseTo(0.1 / slope(4.5), 3);
  });
});

describe('curve insight for other waters (domain.md 3.4, 1h, 9.3; SM 2320 B)', () => {
  it('3.4 synthetic water (125.0 mg/L, pH 9.20): equivalences 0.8685 mL at pH 8.32 and 12.500 mL at pH 4.52 (domain.md 3.4)', () => {
    const r = calculateEndpointError({ sampleVolumeMl: 100, titrantNormality: 0.02, totalAlkalinity: 125, initialPh: 9.2, temperatureC: 25 });
    const [carbonate, total] = r.equivalencePoints;
    expect(carbonate.name).toBe('carbonate');
    expect(carbonate.volumeMl).toBeCloseTo(0.8685, 4);
    expect(carbonate.pH).toBeCloseTo(8.32, 2);
    expect(total.volumeMl).toBeCloseTo(12.5, 4);
    expect(total.pH).toBeCloseTo(4.52, 2);
    const p = r.endpoints.find((e) => e.kind === 'phenolphthalein')!;
    expect(p.applicable).toBe(true);
    expect(p.steep).toBe(true);
    // pH 8.3 sits just past the carbonate equivalence at 8.32: a small positive error
    expect(p.errorMl).toBeGreaterThan(0);
    expect(p.errorMl).toBeLessThan(0.05);
  });

  it('1h: 10.0 mg/L, 200 mL, pH 6.80, 0.0200 N: pH 4.50 at 2.282 mL, reporting 11.4 mg/L (domain.md 1h, computed from the section 9 model)', () => {
    const r = calculateEndpointError({ sampleVolumeMl: 200, titrantNormality: 0.02, totalAlkalinity: 10, initialPh: 6.8, temperatureC: 25 });
    const t = r.endpoints.find((e) => e.kind === 'total')!;
    expect(t.endpointVolumeMl).toBeCloseTo(2.282, 3);
    expect(t.endpointResultMgL).toBeCloseTo(11.4, 1);
    expect(t.errorPercent).toBeGreaterThan(10);
    expect(r.warnings.map((w) => w.code)).toContain('low_alkalinity_method_advised');
  });

  it('a sample starting below pH 8.3 has no P endpoint to miss: reported as not applicable, not an error (IUPAC Gold Book 09038: P = 0)', () => {
    const p = calculateEndpointError(request).endpoints.find((e) => e.kind === 'phenolphthalein')!;
    expect(p.applicable).toBe(false);
    expect(p.errorMl).toBeNull();
    expect(p.note).toMatch(/P is zero/);
  });

  it.each([
    [30, 4.9],
    [150, 4.6],
    [500, 4.3],
  ])('recommended total endpoint for %f mg/L is pH %f (SM 2320 B Table 2320:I, from memory)', (alk, pH) => {
    const r = calculateEndpointError({ sampleVolumeMl: 100, titrantNormality: 0.02, totalAlkalinity: alk, initialPh: 8.0, temperatureC: 25 });
    expect(r.recommendedTotalEndpointPh).toBe(pH);
    expect(r.atRecommendedEndpoint?.endpointPh).toBe(pH);
  });

  it('indicator ranges as tabulated: phenolphthalein 8.2–10.0, methyl orange 3.1–4.4, bromcresol green–methyl red 4.5–5.2 (Bishop 1972; domain.md 9.3)', () => {
    const byKey = Object.fromEntries(INDICATORS.map((i) => [i.key, [i.fromPh, i.toPh]]));
    expect(byKey).toEqual({ phenolphthalein: [8.2, 10.0], methyl_orange: [3.1, 4.4], bromcresol_green_methyl_red: [4.5, 5.2] });
    expect(indicatorsAt(8.3)).toEqual(['phenolphthalein']);
    expect(indicatorsAt(4.5)).toEqual(['bromcresol_green_methyl_red']);
    expect(indicatorsAt(4.0)).toEqual(['methyl_orange']);
    expect(indicatorsAt(7.0)).toEqual([]);
  });

  it('the model curve starts at the sample pH and runs past the total equivalence point', () => {
    const r = calculateEndpointError(request);
    expect(r.curve.points[0]).toEqual({ volumeMl: 0, pH: 7.5 });
    expect(r.curve.points[r.curve.points.length - 1].volumeMl).toBeCloseTo(1.5 * V_EQ, 6);
    expect(r.curve.derivative.length).toBe(r.curve.points.length - 1);
  });

  it('rejects a total endpoint the sample starts below, naming totalEndpointPh, and a missing initial pH', () => {
    try {
      calculateEndpointError({ ...request, initialPh: 4.2 });
      throw new Error('expected an InputError');
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      expect((e as InputError).fields).toHaveProperty('totalEndpointPh');
    }
    const { initialPh: _omitted, ...withoutPh } = request;
    expect(() => calculateEndpointError(withoutPh as never)).toThrow(InputError);
  });
});
