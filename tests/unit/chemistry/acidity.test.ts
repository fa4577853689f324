import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { acidityMgL } from '@shared/chemistry/acidity';

describe('acidity = [(A × B) − (C × D)] × 50,000 / V_s (SM 2310 B ¶5)', () => {
  it.each([
    { id: '4a no pretreatment', a: 5.6, b: 0.02, vs: 100, c: 0, d: 0, exact: '56', netAlkaline: false, source: 'SM 2310 B' },
    { id: '4b peroxide pretreatment', a: 9.2, b: 0.02, vs: 50, c: 5, d: 0.02, exact: '84', netAlkaline: false, source: 'SM 2310 B ¶4d, ¶5' },
    { id: '4c net alkaline', a: 3.0, b: 0.02, vs: 50, c: 5, d: 0.02, exact: '-40', netAlkaline: true, source: 'SM 2310 B sign convention' },
  ])('$id: $exact mg/L as CaCO3 ($source)', ({ a, b, vs, c, d, exact, netAlkaline }) => {
    const r = acidityMgL({
      titrantVolumeMl: a,
      titrantNormality: b,
      sampleVolumeMl: vs,
      pretreatment: c ? { acidVolumeMl: c, acidNormality: d } : undefined,
    });
    expect(r.acidity.toString()).toBe(exact);
    expect(r.netAlkaline).toBe(netAlkaline);
  });

  it('4b: (0.1840 − 0.1000) meq; the pretreatment term is C × D = 0.1 meq (SM 2310 B ¶5)', () => {
    const r = acidityMgL({ titrantVolumeMl: 9.2, titrantNormality: 0.02, sampleVolumeMl: 50, pretreatment: { acidVolumeMl: 5, acidNormality: 0.02 } });
    expect(r.pretreatmentMeq.toString()).toBe('0.1');
    expect(r.acidityMeqL.toString()).toBe('1.68');
  });

  it('zero acidity is not flagged as net alkaline', () => {
    const r = acidityMgL({ titrantVolumeMl: 5, titrantNormality: 0.02, sampleVolumeMl: 50, pretreatment: { acidVolumeMl: 5, acidNormality: 0.02 } });
    expect(r.acidity.isZero()).toBe(true);
    expect(r.netAlkaline).toBe(false);
  });

  it('property: scaling sample, titrant and pretreatment volumes together leaves the result unchanged (formula is homogeneous)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 5000 }), fc.integer({ min: 0, max: 1000 }), fc.integer({ min: 1, max: 100 }), (a, c, k) => {
        const one = acidityMgL({ titrantVolumeMl: a / 100, titrantNormality: 0.02, sampleVolumeMl: 50, pretreatment: { acidVolumeMl: c / 100, acidNormality: 0.02 } });
        const scaled = acidityMgL({ titrantVolumeMl: (a * k) / 100, titrantNormality: 0.02, sampleVolumeMl: 50 * k, pretreatment: { acidVolumeMl: (c * k) / 100, acidNormality: 0.02 } });
        expect(scaled.acidity.minus(one.acidity).abs().lte('1e-30')).toBe(true);
      }),
    );
  });
});
