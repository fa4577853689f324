import { describe, expect, it } from 'vitest';
import {
  acidNormalityFromNa2co3Mass,
  acidNormalityFromNa2co3Solution,
  baseNormalityFromKhpMass,
  baseNormalityFromKhpSolution,
  caco3MgPerMlTitrant,
  dilutedNormality,
  replicateStatistics,
  replicatesAccepted,
} from '@shared/chemistry/standardization';

const round5 = (d: { toDecimalPlaces(n: number): { toNumber(): number } }) => d.toDecimalPlaces(5).toNumber();

describe('acid against sodium carbonate (SM 2320 B ¶3)', () => {
  it.each([
    // 5a and 5b: A = 2.512 g/L, B = 40.00 mL (SM 2320 B ¶3, N = A × B / (53.00 × C)).
    [19.05, 0.09952],
    [19.08, 0.09936],
    [19.02, 0.09968],
  ])('A 2.512 g/L, B 40.00 mL, C %f mL → %f N (SM 2320 B ¶3)', (c, n) => {
    expect(round5(acidNormalityFromNa2co3Solution({ na2co3GramsPerL: 2.512, na2co3VolumeMl: 40, acidVolumeMl: c }))).toBe(n);
  });

  it('5a exactly: 100.48 / 1009.65 (SM 2320 B ¶3)', () => {
    const n = acidNormalityFromNa2co3Solution({ na2co3GramsPerL: 2.512, na2co3VolumeMl: 40, acidVolumeMl: 19.05 });
    expect(n.eq(new (n.constructor as typeof import('decimal.js').default)(100.48).div(1009.65))).toBe(true);
  });

  it('5c direct weighing: 0.1060 g, 20.00 mL → 106.0 / (52.994 × 20.00) = 0.10001 N (computed from SM 2320 B ¶3 stoichiometry)', () => {
    expect(round5(acidNormalityFromNa2co3Mass({ na2co3Grams: 0.106, acidVolumeMl: 20 }))).toBe(0.10001);
    // With the rounded 52.99 the same weighing reads 0.10002 N: the equivalent weight matters at the fifth place.
    expect(round5(acidNormalityFromNa2co3Mass({ na2co3Grams: 0.106, acidVolumeMl: 20, equivalentWeight: 52.99 }))).toBe(0.10002);
  });
});

describe('NaOH against potassium hydrogen phthalate (SM 2310 B ¶3)', () => {
  it('5d: A 10.123 g/L, B 40.00 mL, C 19.85 mL → 404.92 / 4053.4 = 0.09990 N (SM 2310 B ¶3)', () => {
    expect(round5(baseNormalityFromKhpSolution({ khpGramsPerL: 10.123, khpVolumeMl: 40, baseVolumeMl: 19.85 }))).toBe(0.0999);
  });

  it('5e: 0.4085 g KHP, 20.00 mL → 408.5 / 4084.4 = 0.10001 N (SM 2310 B ¶3, direct weighing)', () => {
    expect(round5(baseNormalityFromKhpMass({ khpGrams: 0.4085, baseVolumeMl: 20 }))).toBe(0.10001);
  });
});

describe('replicates (SM 1020 B; acceptance common practice)', () => {
  it('5b: N 0.09952, 0.09936, 0.09968 → mean 0.09952, SD 0.000157, RSD 0.16 %, passes 0.5 % (SM 2320 B ¶3; common practice)', () => {
    const ns = [19.05, 19.08, 19.02].map((c) => acidNormalityFromNa2co3Solution({ na2co3GramsPerL: 2.512, na2co3VolumeMl: 40, acidVolumeMl: c }));
    const s = replicateStatistics(ns);
    expect(s.n).toBe(3);
    expect(round5(s.mean)).toBe(0.09952);
    expect(s.standardDeviation.toSignificantDigits(3).toNumber()).toBe(0.000157);
    expect(s.relativeStandardDeviationPercent.toDecimalPlaces(2).toNumber()).toBe(0.16);
    expect(replicatesAccepted(s)).toBe(true);
    expect(replicatesAccepted(s, 0.1)).toBe(false);
  });

  it('SD uses n − 1: 1, 2, 3 → SD 1 (sample standard deviation definition)', () => {
    expect(replicateStatistics([1, 2, 3]).standardDeviation.toNumber()).toBe(1);
  });

  it('one replicate is an input error', () => {
    expect(() => replicateStatistics([0.1])).toThrow(expect.objectContaining({ fields: { replicates: expect.any(String) } }));
  });
});

describe('dilution (SM 2320 B ¶3)', () => {
  it('5f: 200.00 mL of 0.1000 N to 1000 mL → 0.02000 N; 1.00 mL = 1.00 mg CaCO3 (SM 2320 B ¶3)', () => {
    const n = dilutedNormality({ stockNormality: 0.1, stockVolumeMl: 200, finalVolumeMl: 1000 });
    expect(n.toString()).toBe('0.02');
    expect(caco3MgPerMlTitrant(n).toString()).toBe('1');
  });
});
