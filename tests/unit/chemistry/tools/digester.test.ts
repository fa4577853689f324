import { describe, expect, it } from 'vitest';
import { classify, DIGESTER_BANDS } from '@shared/chemistry/tools/bands';
import { alkalinityForRatio, ratioTrend, volatileAcidsAlkalinityRatio } from '@shared/chemistry/tools/digester';
import { calculateDigester } from '@shared/chemistry/tools/service';
import { InputError } from '@shared/errors';

describe('digester VA/alkalinity ratio (Gerardi 2003 concept; thresholds common practice)', () => {
  it('8i: VA 250 / alk 2500 = 0.10, stable; VA 900 / alk 2400 = 0.375, act (domain.md 8i)', () => {
    const a = calculateDigester({ volatileAcidsMgL: 250, alkalinity: 2500 });
    expect(a.ratio).toBeCloseTo(0.1, 12);
    expect(a.band.key).toBe('stable');
    expect(a.band.level).toBe('ok');
    const b = calculateDigester({ volatileAcidsMgL: 900, alkalinity: 2400 });
    expect(b.ratio).toBeCloseTo(0.375, 12);
    expect(b.band.key).toBe('act');
    expect(b.band.level).toBe('act');
  });

  it.each([
    // about 0.1–0.25 stable; above about 0.3–0.4 act (common practice); Titrata watches between 0.25 and 0.3
    [0.05, 'stable'],
    [0.25, 'stable'],
    [0.26, 'watch'],
    [0.3, 'watch'],
    [0.31, 'act'],
    [0.45, 'act'],
  ])('ratio %f → %s (common practice)', (ratio, key) => {
    expect(classify(DIGESTER_BANDS, ratio).key).toBe(key);
  });

  it('ratio and the alkalinity for a 0.25 ratio: VA 900 needs 900/0.25 = 3600 mg/L, 1200 more than 2400', () => {
    expect(volatileAcidsAlkalinityRatio(900, 2400)).toBe(0.375);
    expect(alkalinityForRatio(900, 0.25)).toBe(3600);
    const r = calculateDigester({ volatileAcidsMgL: 900, alkalinity: 2400 });
    expect(r.alkalinityForTarget).toBe(3600);
    expect(r.additionalAlkalinity).toBe(1200);
    expect(calculateDigester({ volatileAcidsMgL: 250, alkalinity: 2500 }).additionalAlkalinity).toBe(0);
  });

  it('a rising trend over the last three results is flagged (Gerardi 2003: the trend warns first, pH changes last)', () => {
    expect(ratioTrend([0.15, 0.2], 0.24)).toBe('rising');
    expect(ratioTrend([0.3, 0.2], 0.15)).toBe('falling');
    expect(ratioTrend([0.2, 0.2], 0.24)).toBe('steady');
    expect(ratioTrend([0.2], 0.24)).toBe('unknown');
    const r = calculateDigester({ volatileAcidsMgL: 480, alkalinity: 2000, previousRatios: [0.12, 0.18, 0.2] });
    expect(r.trend).toBe('rising');
    expect(r.band.key).toBe('stable');
    expect(r.warnings.map((w) => w.code)).toContain('ratio_rising');
  });

  it('rejects a zero alkalinity and a negative VA', () => {
    expect(() => calculateDigester({ volatileAcidsMgL: 200, alkalinity: 0 })).toThrow(InputError);
    expect(() => calculateDigester({ volatileAcidsMgL: -1, alkalinity: 2000 })).toThrow(InputError);
  });
});
