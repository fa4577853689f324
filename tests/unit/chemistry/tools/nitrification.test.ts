import { describe, expect, it } from 'vitest';
import { ALKALINITY_PER_NH4N_NITRIFIED, ALKALINITY_PER_NO3N_DENITRIFIED, nitrificationBudget } from '@shared/chemistry/tools/nitrification';
import { calculateNitrification } from '@shared/chemistry/tools/service';
import { InputError } from '@shared/errors';

describe('nitrification alkalinity budget (EPA Nitrogen Control Manual 1993, from memory)', () => {
  it('7.14 and 3.57 are the stoichiometric 2 × 50.04/14.007 and half of it, as published to 3 figures (computed from the stoichiometry)', () => {
    expect(ALKALINITY_PER_NH4N_NITRIFIED).toBe(7.14);
    expect(ALKALINITY_PER_NO3N_DENITRIFIED).toBe(3.57);
    expect((2 * 50.04) / 14.007).toBeCloseTo(7.14, 2);
    expect(50.04 / 14.007).toBeCloseTo(3.57, 2);
  });

  it('8h: influent 220, 30 NH4-N nitrified, 18 NO3-N denitrified → 220 − 7.14 × 30 + 3.57 × 18 = 70.1 mg/L (domain.md 8h, computed from formula 8.4)', () => {
    const b = nitrificationBudget({ influentAlkalinity: 220, nitrifiedNh4NMgL: 30, denitrifiedNo3NMgL: 18 });
    expect(b.consumedMgL).toBeCloseTo(214.2, 9);
    expect(b.recoveredMgL).toBeCloseTo(64.26, 9);
    expect(b.residualMgL).toBeCloseTo(70.06, 9);
    // Default target 50 mg/L (common practice): met, nothing to add.
    expect(b.targetResidualMgL).toBe(50);
    expect(b.meetsTarget).toBe(true);
    expect(b.shortfallMgL).toBe(0);
  });

  it('a target of 80 leaves a 9.94 mg/L shortfall, made up with 9.94 × 40.00/50.04 = 7.946 mg/L NaOH (domain.md 8.5)', () => {
    const r = calculateNitrification({ influentAlkalinity: 220, nitrifiedNh4NMgL: 30, denitrifiedNo3NMgL: 18, targetResidualAlkalinity: 80 });
    expect(r.shortfall).toBeCloseTo(9.94, 9);
    expect(r.status.key).toBe('below_target');
    expect(r.makeUp?.chemical).toBe('caustic_soda');
    expect(r.makeUp?.dose.pureMgL).toBeCloseTo((9.94 * 40.0) / 50.04, 4);
  });

  it('with a flow, gives daily loads in kg/d and lb/d: 30 mg/L NH4-N at 2.0 MGD = 30 × 2 × 8.34 = 500.4 lb/d (common practice 8.34)', () => {
    const r = calculateNitrification({ influentAlkalinity: 220, nitrifiedNh4NMgL: 30, flowMgd: 2 });
    expect(r.loads?.nh4NNitrified.lbPerDay).toBeCloseTo(500.4, 6);
    // 2 MGD = 7570.823568 m³/d (exact US gallon); 30 g/m³ × 7570.82 m³/d = 227.12 kg/d
    expect(r.loads?.nh4NNitrified.kgPerDay).toBeCloseTo(227.125, 2);
    expect(r.flow?.m3PerDay).toBeCloseTo(7570.82, 2);
  });

  it('flags an exhausted budget: influent 100, 30 NH4-N nitrified → 100 − 214.2 = −114.2 mg/L', () => {
    const r = calculateNitrification({ influentAlkalinity: 100, nitrifiedNh4NMgL: 30, chemical: 'lime', purityPercent: 90 });
    expect(r.residual).toBeCloseTo(-114.2, 9);
    expect(r.status.key).toBe('exhausted');
    expect(r.warnings.map((w) => w.code)).toContain('alkalinity_exhausted');
    // shortfall 50 − (−114.2) = 164.2 mg/L; lime 164.2 × 37.05/50.04 / 0.90 (domain.md 8.5)
    expect(r.makeUp?.dose.productMgL).toBeCloseTo((164.2 * 37.05) / 50.04 / 0.9, 3);
  });

  it('warns when more nitrate is denitrified than ammonia nitrified', () => {
    const r = calculateNitrification({ influentAlkalinity: 220, nitrifiedNh4NMgL: 10, denitrifiedNo3NMgL: 12 });
    expect(r.warnings.map((w) => w.code)).toContain('denitrified_exceeds_nitrified');
  });

  it('rejects a missing influent alkalinity, a negative load and a flow in both units', () => {
    for (const body of [{ nitrifiedNh4NMgL: 30 }, { influentAlkalinity: 220, nitrifiedNh4NMgL: -1 }, { influentAlkalinity: 220, nitrifiedNh4NMgL: 30, flowMgd: 1, flowM3PerDay: 3785 }]) {
      expect(() => calculateNitrification(body as never)).toThrow(InputError);
    }
  });
});
