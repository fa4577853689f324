import { describe, expect, it } from 'vitest';
import {
  checkStandardRecovery,
  electrodeCalibration,
  holdingTime,
  matrixSpikeRecovery,
  na2co3AsCaco3,
  nernstSlopeMvPerPh,
  relativePercentDifference,
  spikeVolumeNeedsCorrection,
} from '@shared/chemistry/qc';

describe('duplicates, recoveries (common practice; 40 CFR 136.7)', () => {
  it('6a: duplicates 124.0 and 121.0 → RPD 3.0 / 122.5 × 100 = 2.45 % (common practice RPD formula)', () => {
    expect(relativePercentDifference(124, 121).toDecimalPlaces(2).toNumber()).toBe(2.45);
    expect(relativePercentDifference(121, 124).eq(relativePercentDifference(124, 121))).toBe(true);
  });

  it('6b: Na2CO3 check standard 106.0 mg/L → 100.1 mg/L as CaCO3 (× 100.09/105.99 = 0.9443); measured 97.8 → recovery 97.7 % (computed from SM 2320 B molar masses)', () => {
    expect(na2co3AsCaco3(1).toDecimalPlaces(4).toNumber()).toBe(0.9443);
    const trueValue = na2co3AsCaco3(106);
    expect(trueValue.toDecimalPlaces(1).toNumber()).toBe(100.1);
    expect(checkStandardRecovery(97.8, trueValue).toDecimalPlaces(1).toNumber()).toBe(97.7);
  });

  it('6c: sample 124.0, spike adds 50.0, spiked 171.5 → recovery 95.0 % (common practice)', () => {
    expect(matrixSpikeRecovery({ spikedResult: 171.5, unspikedResult: 124, spikeAdded: 50 }).toString()).toBe('95');
  });

  it('a spike over 1 % of the sample volume is corrected for dilution (common practice)', () => {
    expect(spikeVolumeNeedsCorrection(100, 1)).toBe(false);
    expect(spikeVolumeNeedsCorrection(100, 2)).toBe(true);
    // 124 mg/L diluted 100/102 → 121.569; (171.5 − 121.569)/50 × 100 = 99.86 %.
    const r = matrixSpikeRecovery({ spikedResult: 171.5, unspikedResult: 124, spikeAdded: 50, sampleVolumeMl: 100, spikeVolumeMl: 2 });
    expect(r.toDecimalPlaces(2).toNumber()).toBe(99.86);
  });
});

describe('pH electrode (Nernst equation; EPA SW-846 9040C)', () => {
  it.each([
    // 6d: ln(10)·R·T/F, R and F CODATA (Nernst equation).
    [0, 54.2],
    [10, 56.18],
    [20, 58.17],
    [25, 59.16],
    [30, 60.15],
  ])('%i °C → %f mV/pH (Nernst equation)', (t, slope) => {
    expect(nernstSlopeMvPerPh(t)).toBeCloseTo(slope, 2);
  });

  it('6e: pH 7.00 at −0.5 mV, pH 4.00 at +172.6 mV, 25 °C → 57.70 mV/pH = 97.5 %, offset −0.5 mV (Nernst equation; 95–105 % common practice)', () => {
    const c = electrodeCalibration({ pH: 7, mV: -0.5 }, { pH: 4, mV: 172.6 }, 25);
    expect(c.slopeMvPerPh).toBeCloseTo(57.7, 2);
    expect(c.percentSlope).toBeCloseTo(97.5, 1);
    expect(c.offsetMvAtPh7).toBeCloseTo(-0.5, 10);
    expect(c.bufferSpan).toBe(3);
    expect(c.accepted).toBe(true);
    expect(electrodeCalibration({ pH: 7, mV: -0.5 }, { pH: 4, mV: 172.6 }, 25, { minPercent: 98, maxPercent: 102 }).accepted).toBe(false);
  });
});

describe('holding time (40 CFR 136.3 Table II: 14 days)', () => {
  it('6f: collected 2024-03-01 08:00, analysed 2024-03-15 09:00 → exceeded by 1 h; limit 2024-03-15 08:00 (14 days = 336 h)', () => {
    const h = holdingTime('2024-03-01T08:00:00Z', '2024-03-15T09:00:00Z');
    expect(h.limitHours).toBe(336);
    expect(h.elapsedHours).toBe(337);
    expect(h.exceeded).toBe(true);
    expect(h.exceededByHours).toBe(1);
    expect(h.deadline).toBe('2024-03-15T08:00:00.000Z');
  });

  it('analysed exactly at 336 h is within the limit (40 CFR 136.3 Table II)', () => {
    const h = holdingTime(new Date('2024-03-01T08:00:00Z'), new Date('2024-03-15T08:00:00Z'));
    expect(h.exceeded).toBe(false);
    expect(h.exceededByHours).toBe(0);
  });

  it('analysis before collection, or a bad date, is an input error', () => {
    expect(() => holdingTime('2024-03-02T00:00:00Z', '2024-03-01T00:00:00Z')).toThrow(expect.objectContaining({ fields: { analyzedAt: expect.any(String) } }));
    expect(() => holdingTime('not a date', '2024-03-01T00:00:00Z')).toThrow(expect.objectContaining({ fields: { collectedAt: expect.any(String) } }));
  });
});
