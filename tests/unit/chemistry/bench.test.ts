import { describe, expect, it } from 'vitest';
import {
  acidityFromReadings,
  alkalinityFromLongCurve,
  alkalinityFromReadings,
  BENCH_READINGS_LIMIT,
  ENGINE_READINGS_LIMIT,
  evaluateQc,
  historyComparison,
  meterCalibration,
  standardize,
  titreSuggestion,
  volatileAcidsRatio,
} from '@shared/chemistry/bench';
import { alkalinityMgL } from '@shared/chemistry/alkalinity';
import { carbonateWaterModel, modelCurve, volumeAtPh } from '@shared/chemistry/curve';
import { calculateAlkalinity } from '@shared/chemistry/service';
import { InputError } from '@shared/errors';
import { SYNTHETIC, SYNTHETIC_TITRATION } from './fixtures';

const base = { sampleVolumeMl: SYNTHETIC.sampleVolumeMl, titrantNormality: SYNTHETIC.titrantNormality };

function fieldsOf(run: () => unknown): Record<string, string> {
  try {
    run();
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return (e as InputError).fields;
  }
  throw new Error('expected an InputError');
}

/** A smooth acid titration of the domain.md 3.4 water (125 mg/L, start pH 9.20), n readings to 17 mL, from the engine's own model. */
function modelReadings(n: number) {
  const model = carbonateWaterModel({ sampleVolumeMl: 100, titrant: 'acid', titrantNormality: 0.02, initialPh: 9.2, alkalinityEqL: 2.5e-3 });
  const volumes = Array.from({ length: n }, (_, i) => Math.round(((17 * i) / (n - 1)) * 1e5) / 1e5);
  return { model, readings: modelCurve(model, volumes).map((r) => ({ volumeMl: r.volumeMl, pH: Math.round(r.pH * 1000) / 1000 })) };
}

describe('curves longer than the calculation API takes', () => {
  it('keeps ENGINE_READINGS_LIMIT in step with calculateAlkalinity (2000 accepted, 2001 refused)', () => {
    const { readings } = modelReadings(ENGINE_READINGS_LIMIT + 1);
    expect(() => calculateAlkalinity({ ...base, readings: readings.slice(0, ENGINE_READINGS_LIMIT) })).not.toThrow();
    expect(fieldsOf(() => calculateAlkalinity({ ...base, readings }))).toHaveProperty('readings');
  });

  it.each([
    // domain.md 3a/3b (SM 2320 B fixed endpoints), 3c (pH 4.9), 3d/3e (NFM A6.6.4.B inflection), 3f (NFM A6.6.4.C Gran)
    ['fixed', 4.5, 8.81, 125.2],
    ['fixed', 4.9, 8.81, 121.6],
    ['inflection', undefined, 8.75, 125.0],
    ['gran', undefined, 8.81, 124.7],
  ] as const)('the long path gives the engine’s %s result (T endpoint %s): P %f, T %f (domain.md 3.4 check values)', (endpointMethod, totalEndpointPh, p, t) => {
    const request = { ...base, readings: SYNTHETIC_TITRATION, endpointMethod, ...(totalEndpointPh ? { totalEndpointPh } : {}), temperatureC: 25 };
    const engine = calculateAlkalinity(request);
    const long = alkalinityFromLongCurve(request);
    expect(long).toEqual({ ...engine, curve: null });
    expect(Number(long.phenolphthaleinAlkalinity.toFixed(2))).toBe(p);
    expect(Number(long.totalAlkalinity.toFixed(1))).toBe(t);
  });

  it('uses the engine itself up to its limit, so the curve comparison is there', () => {
    const r = alkalinityFromReadings({ ...base, readings: SYNTHETIC_TITRATION });
    expect(r.curve?.gran?.totalAlkalinity).toBeCloseTo(124.7, 1);
  });

  it('analyses a 5,000-reading curve: T at pH 4.5 matches the charge-balance model to 0.001 mL (SM 2320 B; model of domain.md 9.2)', () => {
    const { model, readings } = modelReadings(5000);
    const r = alkalinityFromReadings({ ...base, readings });
    const exactVolume = volumeAtPh(model, 4.5)!;
    expect(r.curve).toBeNull();
    expect(Number(r.exact.totalVolumeMl)).toBeCloseTo(exactVolume, 3);
    expect(r.totalAlkalinity).toBeCloseTo(alkalinityMgL({ titrantVolumeMl: exactVolume, ...base }).toNumber(), 1);
    expect(r.phenolphthaleinAlkalinity).toBeGreaterThan(8);
    expect(r.phenolphthaleinAlkalinity).toBeLessThan(9.5);
  });

  it('names the reading whose volume goes backwards, past the engine’s limit too', () => {
    const { readings } = modelReadings(3000);
    readings[2500] = { ...readings[2500], volumeMl: readings[2498].volumeMl - 0.5 };
    expect(fieldsOf(() => alkalinityFromReadings({ ...base, readings }))).toHaveProperty(['readings.2500.volumeMl']);
  });

  it(`refuses more than ${BENCH_READINGS_LIMIT} readings`, () => {
    const { readings } = modelReadings(BENCH_READINGS_LIMIT + 1);
    expect(fieldsOf(() => alkalinityFromReadings({ ...base, readings }))).toHaveProperty('readings');
  });
});

describe('acidity from a base-titration curve (SM 2310 B)', () => {
  it('4a read off a curve: 5.60 mL of 0.0200 N to pH 8.3 on 100 mL → 56.0 mg/L; starting above 3.7 gives mineral acidity 0', () => {
    const r = acidityFromReadings({ sampleVolumeMl: 100, titrantNormality: 0.02, readings: [{ volumeMl: 0, pH: 4.0 }, { volumeMl: 5.5, pH: 8.1 }, { volumeMl: 5.7, pH: 8.5 }] });
    expect(r.totalAcidity).toBe(56);
    expect(r.mineralAcidity).toBe(0);
    expect(r.curveVolumes.totalMl).toBe('5.6');
  });

  it('mineral acidity from the pH 3.7 crossing: 1.50 mL × 0.0200 N × 50,000 / 100 mL = 15.0 mg/L (SM 2310 B ¶5; computed here)', () => {
    const r = acidityFromReadings({
      sampleVolumeMl: 100,
      titrantNormality: 0.02,
      readings: [{ volumeMl: 0, pH: 3.0 }, { volumeMl: 1, pH: 3.4 }, { volumeMl: 2, pH: 4.0 }, { volumeMl: 6, pH: 8.0 }, { volumeMl: 7, pH: 9.0 }],
    });
    expect(r.mineralAcidity).toBe(15);
    expect(r.totalAcidity).toBe(63);
  });

  it('answers a curve that never reaches pH 8.3 with a readings error', () => {
    expect(fieldsOf(() => acidityFromReadings({ sampleVolumeMl: 100, titrantNormality: 0.02, readings: [{ volumeMl: 0, pH: 4 }, { volumeMl: 3, pH: 6 }] }))).toHaveProperty('readings');
  });
});

describe('sample volume and titrant suggestions (EPA 310.1 via NEMI: ≤ 50 mL; common practice: ≥ 50 burette steps)', () => {
  it('says nothing when the titre fits one fill: 70 mg/L, 100 mL, 0.02 N → 7 mL (SM 2320 B)', () => {
    expect(titreSuggestion({ titrantVolumeMl: 7, sampleVolumeMl: 100, titrantNormality: 0.02 })).toBeNull();
  });

  it('a 0.35-mL titre (35 mg/L, 50 mL, 0.1 N) → 200 mL with 0.02 N gives about 7 mL', () => {
    const s = titreSuggestion({ titrantVolumeMl: 0.35, sampleVolumeMl: 50, titrantNormality: 0.1 })!;
    expect(s).toMatchObject({ reason: 'titre_too_small', minimumMl: 1, suggestedSampleVolumeMl: 200, suggestedTitrantNormality: 0.02, predictedTitrantVolumeMl: 7 });
    expect(s.message).toMatch(/200-mL sample and 0.02 N/);
  });

  it('a 250-mL titre (2500 mg/L digester, 100 mL, 0.02 N) → a 10-mL aliquot gives 25 mL, preferred over also changing the titrant', () => {
    const s = titreSuggestion({ titrantVolumeMl: 250, sampleVolumeMl: 100, titrantNormality: 0.0199, nominalNormality: 0.02 })!;
    expect(s).toMatchObject({ reason: 'titre_too_large', suggestedSampleVolumeMl: 10, suggestedTitrantNormality: 0.02, predictedTitrantVolumeMl: 25 });
  });

  it('uses a microburet’s finer step: 0.6 mL read to 0.01 mL is enough (50 × 0.01 = 0.5 mL)', () => {
    expect(titreSuggestion({ titrantVolumeMl: 0.6, sampleVolumeMl: 200, titrantNormality: 0.02, buretteResolutionMl: 0.01 })).toBeNull();
    expect(titreSuggestion({ titrantVolumeMl: 0.6, sampleVolumeMl: 200, titrantNormality: 0.02 })?.reason).toBe('titre_too_small');
  });

  it('a 62-mL titre (100 mL, 0.02 N) → a 25-mL aliquot (15.5 mL), not a bigger sample with stronger titrant', () => {
    expect(titreSuggestion({ titrantVolumeMl: 62, sampleVolumeMl: 100, titrantNormality: 0.02 })).toMatchObject({ suggestedSampleVolumeMl: 25, suggestedTitrantNormality: 0.02, predictedTitrantVolumeMl: 15.5 });
  });
});

describe('history comparison for review (±3s control limits, SM 1020 B from memory; common practice)', () => {
  // mean 60, sample SD √(28/9) = 1.7638 (computed here)
  const history = [60, 62, 58, 61, 59, 60, 63, 57, 60, 60];
  it.each([
    [66, true, 3.40168],
    [65, false, 2.83473],
    [54, true, -3.40168],
  ])('%f against 10 values of mean 60, SD 1.764 → unusual %s (z %f)', (value, unusual, z) => {
    const c = historyComparison(value, history);
    expect(c).toMatchObject({ n: 10, mean: 60, standardDeviation: 1.76383, unusual, zScore: z });
  });

  it('does not judge with fewer values than the minimum', () => {
    expect(historyComparison(90, history.slice(0, 9)).unusual).toBeNull();
    expect(historyComparison(90, history.slice(0, 9), { minCount: 5 }).unusual).toBe(true);
  });

  it('flags any change from a history with no spread', () => {
    const flat = Array(12).fill(50);
    expect(historyComparison(50, flat).unusual).toBe(false);
    expect(historyComparison(51, flat).unusual).toBe(true);
  });
});

describe('titrant standardisation (SM 2320 B ¶3; SM 2310 B ¶3)', () => {
  it('5b: triplicate 19.05, 19.08, 19.02 mL against 2.512 g/L Na2CO3, 40.00 mL → mean 0.09952 N, RSD 0.16 %, accepted at 0.5 %', () => {
    const r = standardize({
      primaryStandard: 'Na2CO3',
      mode: 'solution',
      standardGramsPerL: 2.512,
      replicates: [19.05, 19.08, 19.02].map((c) => ({ standardVolumeMl: 40, titrantVolumeMl: c })),
    });
    expect(Number(r.normality).toFixed(5)).toBe('0.09952');
    expect(Number(r.rsdPercent).toFixed(2)).toBe('0.16');
    expect(r.accepted).toBe(true);
    expect(standardize({ primaryStandard: 'Na2CO3', mode: 'solution', standardGramsPerL: 2.512, rsdLimitPercent: 0.1, replicates: [19.05, 19.08, 19.02].map((c) => ({ standardVolumeMl: 40, titrantVolumeMl: c })) }).accepted).toBe(false);
  });

  it('5e: KHP weighed directly, 0.4085 g to 20.00 mL twice → 0.10001 N, RSD 0', () => {
    const r = standardize({ primaryStandard: 'KHP', mode: 'mass', replicates: [{ standardGrams: 0.4085, titrantVolumeMl: 20 }, { standardGrams: 0.4085, titrantVolumeMl: 20 }] });
    expect(Number(r.normality).toFixed(5)).toBe('0.10001');
    expect(Number(r.rsdPercent)).toBe(0);
  });

  it('names the missing quantity of a replicate and refuses a single titration', () => {
    expect(fieldsOf(() => standardize({ primaryStandard: 'KHP', mode: 'mass', replicates: [{ standardGrams: 0.4, titrantVolumeMl: 20 }, { titrantVolumeMl: 20 }] }))).toHaveProperty(['replicates.1.standardGrams']);
    expect(fieldsOf(() => standardize({ primaryStandard: 'KHP', mode: 'mass', replicates: [{ standardGrams: 0.4, titrantVolumeMl: 20 }] }))).toHaveProperty('replicates');
  });
});

describe('pH meter calibration (EPA SW-846 9040C; Nernst slope)', () => {
  it('6e: pH 7.00 at −0.5 mV and 4.00 at +172.6 mV, 25 °C → 97.5 % passes; a pH 10.00 check at −170.0 mV reads 9.938 (within ±0.1)', () => {
    const r = meterCalibration([{ nominalPh: 7, mV: -0.5 }, { nominalPh: 4, mV: 172.6 }, { nominalPh: 10, mV: -170 }], 25);
    expect(r.calibration.percentSlope).toBeCloseTo(97.53, 2);
    expect(r.checks[0].readPh).toBeCloseTo(9.9376, 4);
    expect(r.passed).toBe(true);
  });

  it('fails a 94 % slope and a check buffer 0.2 pH off; warns on buffers under 3 pH apart', () => {
    const slope = 0.94 * 59.16;
    expect(meterCalibration([{ nominalPh: 7, mV: 0 }, { nominalPh: 4, mV: 3 * slope }], 25).passed).toBe(false);
    const off = meterCalibration([{ nominalPh: 7, mV: -0.5 }, { nominalPh: 4, mV: 172.6 }, { nominalPh: 10, mV: -0.5 - 57.7 * 3.2 }], 25);
    expect(off.checks[0].passed).toBe(false);
    expect(off.passed).toBe(false);
    expect(meterCalibration([{ nominalPh: 7, mV: 0 }, { nominalPh: 5, mV: 118 }], 25).warnings.map((w) => w.code)).toEqual(['buffer_span_small']);
  });
});

describe('QC batch evaluation (domain.md 6; common practice limits)', () => {
  const limits = { duplicateRpdMaxPercent: 10, checkStandardRecoveryMinPercent: 90, checkStandardRecoveryMaxPercent: 110 };
  it('6a duplicates 124.0/121.0 → RPD 2.45 %; 6b Na2CO3 LCS 106.0 mg/L measured 97.8 → 97.7 %; blank 0.4 < RL 1.0: all pass', () => {
    const r = evaluateQc(
      { duplicates: [{ firstResult: 124, secondResult: 121 }], checkStandards: [{ trueValueNa2co3MgL: 106, measured: 97.8 }], blanks: [{ measured: 0.4, reportingLimit: 1 }] },
      limits,
    );
    expect(r.duplicates[0].rpdPercent).toBeCloseTo(2.449, 3);
    expect(r.checkStandards[0].trueValue).toBeCloseTo(100.1, 1);
    expect(r.checkStandards[0].recoveryPercent).toBeCloseTo(97.7, 1);
    expect(r).toMatchObject({ passed: true, failures: [] });
  });

  it('fails a duplicate pair 124/108 (RPD 13.8 %), a recovery of 88 % and a blank at the RL, naming each', () => {
    const r = evaluateQc(
      { duplicates: [{ firstResult: 124, secondResult: 108 }], checkStandards: [{ trueValue: 100, measured: 88 }], blanks: [{ measured: 1, reportingLimit: 1 }] },
      limits,
    );
    expect(r.duplicates[0].rpdPercent).toBeCloseTo(13.79, 2);
    expect(r.failures).toEqual(['duplicates.0', 'checkStandards.0', 'blanks.0']);
    expect(r.passed).toBe(false);
  });
});

describe('digester VA/alkalinity ratio (Gerardi 2003 concept; common-practice thresholds)', () => {
  it.each([
    [250, 2500, 0.1, 'stable'],
    [900, 2400, 0.375, 'act'],
    [660, 2400, 0.275, 'watch'],
  ] as const)('VA %f / alkalinity %f → %f (%s) (domain.md 8i)', (va, alk, ratio, status) => {
    expect(volatileAcidsRatio(va, alk)).toEqual({ ratio, status });
  });
});
