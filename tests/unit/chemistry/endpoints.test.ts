import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { alkalinityMgL } from '@shared/chemistry/alkalinity';
import {
  derivativeSeries,
  fixedPhEndpoint,
  granEndpoint,
  inflectionEndpoint,
  titrationDirection,
  type Reading,
} from '@shared/chemistry/endpoints';
import { SYNTHETIC_TITRATION as R } from './fixtures';

const mgL = (volumeMl: number | string) =>
  alkalinityMgL({ titrantVolumeMl: volumeMl, titrantNormality: 0.02, sampleVolumeMl: 100 }).toNumber();

describe('fixed-pH endpoint by linear interpolation (SM 2320 B; SM 2310 B)', () => {
  it.each([
    // Synthetic titration, V_s 100.0 mL, N 0.0200, factor 50,000 (SM 2320 B formula).
    { pH: 8.3, volume: 0.75 + (0.22 / 0.42) * 0.25, mg: 8.81, source: 'SM 2320 B, P to pH 8.3' },
    { pH: 4.5, volume: 12.5 + (0.02 / 0.3) * 0.25, mg: 125.2, source: 'SM 2320 B, routine pH 4.5' },
    { pH: 4.6, volume: 12.4333, mg: 124.3, source: 'SM 2320 B Table 2320:I, 150 mg/L row' },
    { pH: 4.9, volume: 12.163, mg: 121.6, source: 'SM 2320 B Table 2320:I, 30 mg/L row' },
  ])('pH $pH → $volume mL, $mg mg/L ($source)', ({ pH, volume, mg }) => {
    const e = fixedPhEndpoint(R, pH);
    expect(e.volumeMl.toNumber()).toBeCloseTo(volume, 4);
    expect(mgL(e.volumeMl.toString())).toBeCloseTo(mg, 1);
  });

  it('pH 8.3 lies between the 0.75 mL (8.52) and 1.00 mL (8.10) readings and gives 0.8810 mL (SM 2320 B)', () => {
    const e = fixedPhEndpoint(R, 8.3);
    expect(e.before).toEqual({ volumeMl: 0.75, pH: 8.52 });
    expect(e.after).toEqual({ volumeMl: 1.0, pH: 8.1 });
    expect(e.volumeMl.toFixed(4)).toBe('0.8810');
  });

  it('interpolation is exact in decimal: 12.50 + 0.02/0.30 × 0.25 = 12.51666… (computed from the interpolation formula)', () => {
    expect(fixedPhEndpoint(R, 4.5).volumeMl.toString().startsWith('12.5166666666666666')).toBe(true);
  });

  it('a reading exactly at the endpoint pH is used as is', () => {
    expect(fixedPhEndpoint(R, 4.52).volumeMl.toNumber()).toBe(12.5);
  });

  it('a rising (acidity) titration is read the same way (SM 2310 B)', () => {
    const rising: Reading[] = [
      { volumeMl: 0, pH: 3.0 },
      { volumeMl: 2, pH: 3.5 },
      { volumeMl: 4, pH: 4.1 },
      { volumeMl: 6, pH: 7.9 },
      { volumeMl: 7, pH: 8.7 },
    ];
    expect(titrationDirection(rising)).toBe('rising');
    expect(fixedPhEndpoint(rising, 3.7).volumeMl.toNumber()).toBeCloseTo(2 + (0.2 / 0.6) * 2, 12);
    expect(fixedPhEndpoint(rising, 8.3).volumeMl.toNumber()).toBeCloseTo(6.5, 12);
  });

  it.each([
    { name: 'never reaching the endpoint', readings: R.slice(0, 20), pH: 4.5, reason: /never reach pH 4.5/ },
    { name: 'starting past the endpoint', readings: R.slice(30), pH: 4.5, reason: /already past pH 4.5/ },
  ])('$name is an input error on readings, never an extrapolation (common practice)', ({ readings, pH, reason }) => {
    let caught: unknown;
    try {
      fixedPhEndpoint(readings, pH, 'falling');
    } catch (e) {
      caught = e;
    }
    expect(caught).toMatchObject({ name: 'InputError', fields: { readings: expect.stringMatching(reason) } });
  });

  it('property: the interpolated volume lies between its bracketing readings, whose pH values bracket the endpoint', () => {
    const falling = fc
      .array(fc.tuple(fc.double({ min: 0.01, max: 2, noNaN: true }), fc.double({ min: 0.01, max: 1, noNaN: true })), { minLength: 2, maxLength: 40 })
      .map((steps) => {
        const readings: Reading[] = [{ volumeMl: 0, pH: 11 }];
        for (const [dv, dpH] of steps) {
          const last = readings[readings.length - 1];
          readings.push({ volumeMl: last.volumeMl + dv, pH: last.pH - dpH });
        }
        return readings;
      });
    fc.assert(
      fc.property(falling, fc.double({ min: 0, max: 1, noNaN: true }), (readings, where) => {
        const top = readings[0].pH;
        const bottom = readings[readings.length - 1].pH;
        const target = bottom + where * (top - bottom);
        const e = fixedPhEndpoint(readings, target);
        const v = e.volumeMl.toNumber();
        expect(v).toBeGreaterThanOrEqual(e.before.volumeMl - 1e-12);
        expect(v).toBeLessThanOrEqual(e.after.volumeMl + 1e-12);
        expect(e.before.pH).toBeGreaterThanOrEqual(target);
        expect(e.after.pH).toBeLessThanOrEqual(target);
      }),
    );
  });
});

describe('inflection point, maximum |ΔpH/ΔV| at midpoints (USGS NFM A6.6.4.B)', () => {
  it('bicarbonate endpoint: slopes 0.92, 1.20, 1.20, 0.84 at 12.125–12.875 mL; tie → mean of 12.375 and 12.625 = 12.500 mL, T 125.0 mg/L (NFM A6.6.4.B; tie rule common practice)', () => {
    const d = derivativeSeries(R);
    const near = d.filter((p) => p.volumeMl >= 12.1 && p.volumeMl <= 12.9);
    expect(near.map((p) => p.volumeMl)).toEqual([12.125, 12.375, 12.625, 12.875]);
    expect(near.map((p) => -p.slope)).toEqual([0.92, 1.2, 1.2, 0.84]);
    const e = inflectionEndpoint(R, 'bicarbonate');
    expect(e?.tiedMidpointsMl).toEqual([12.375, 12.625]);
    expect(e?.volumeMl.toNumber()).toBe(12.5);
    expect(mgL(e!.volumeMl.toString())).toBe(125);
  });

  it('carbonate endpoint: slopes 1.32, 1.68, 1.28 at 0.625, 0.875, 1.125 mL; maximum at 0.875 mL, P 8.75 mg/L (NFM A6.6.4.B)', () => {
    const d = derivativeSeries(R).filter((p) => p.volumeMl > 0.6 && p.volumeMl < 1.2);
    expect(d.map((p) => -p.slope)).toEqual([1.32, 1.68, 1.28]);
    const e = inflectionEndpoint(R, 'carbonate');
    expect(e?.volumeMl.toNumber()).toBe(0.875);
    expect(e?.maxSlope).toBe(1.68);
    expect(mgL(0.875)).toBe(8.75);
  });

  it('no carbonate endpoint is sought when the first reading is at or below pH 8.3 (IUPAC Gold Book 09038)', () => {
    expect(inflectionEndpoint(R.slice(4), 'carbonate')).toBeNull();
    expect(inflectionEndpoint(R.slice(4), 'bicarbonate')?.volumeMl.toNumber()).toBe(12.5);
  });

  it('three tied midpoints average the first and last only (common practice)', () => {
    const readings: Reading[] = [
      { volumeMl: 0, pH: 5.5 },
      { volumeMl: 1, pH: 5.0 },
      { volumeMl: 2, pH: 4.5 },
      { volumeMl: 3, pH: 4.0 },
      { volumeMl: 3.5, pH: 3.9 },
    ];
    const e = inflectionEndpoint(readings, 'bicarbonate');
    expect(e?.tiedMidpointsMl).toEqual([0.5, 1.5, 2.5]);
    expect(e?.volumeMl.toNumber()).toBe(1.5);
  });

  it('two readings at the same volume are skipped instead of giving an infinite slope', () => {
    const readings: Reading[] = [
      { volumeMl: 0, pH: 5 },
      { volumeMl: 1, pH: 4.8 },
      { volumeMl: 1, pH: 4.7 },
      { volumeMl: 2, pH: 4.0 },
    ];
    expect(derivativeSeries(readings).map((d) => d.volumeMl)).toEqual([0.5, 1.5]);
  });
});

describe('Gran function F1 = (V_s + V_t) × 10^−pH (USGS NFM A6.6.4.C)', () => {
  it('ten points 13.25–17.00 mL: F1 0.015633 → 0.090821, slope 0.019974, intercept −0.249094, r 0.99995, V_eq 12.471 mL, T 124.7 mg/L (NFM A6.6.4.C; least squares)', () => {
    const g = granEndpoint(R, 100, { titrantNormality: 0.02 });
    expect(g).not.toBeNull();
    expect(g!.n).toBe(10);
    expect(g!.points[0].volumeMl).toBe(13.25);
    expect(g!.points[9].volumeMl).toBe(17);
    expect(g!.points[0].f1).toBeCloseTo(0.015633, 6);
    expect(g!.points[9].f1).toBeCloseTo(0.090821, 6);
    expect(g!.slope).toBeCloseTo(0.019974, 6);
    expect(g!.intercept).toBeCloseTo(-0.249094, 6);
    expect(g!.r).toBeCloseTo(0.99995, 5);
    expect(g!.rSquared).toBeCloseTo(0.99995 ** 2, 4);
    expect(g!.equivalenceVolumeMl).toBeCloseTo(12.471, 3);
    expect(mgL(g!.equivalenceVolumeMl)).toBeCloseTo(124.7, 1);
    // Slope close to N: the QC check of NFM A6.6.4.C.
    expect(g!.slopeToNormalityRatio).toBeCloseTo(1, 2);
  });

  it('F1 of each point follows the formula, checked against a hand-written least-squares fit (computed from the normal equations)', () => {
    const pts = R.filter((r) => r.volumeMl >= 13.25).map((r) => [r.volumeMl, (100 + r.volumeMl) * 10 ** -r.pH]);
    const n = pts.length;
    const sx = pts.reduce((a, [x]) => a + x, 0);
    const sy = pts.reduce((a, [, y]) => a + y, 0);
    const sxx = pts.reduce((a, [x]) => a + x * x, 0);
    const sxy = pts.reduce((a, [x, y]) => a + x * y, 0);
    const slope = (n * sxy - sx * sy) / (n * sxx - sx * sx);
    const intercept = (sy - slope * sx) / n;
    const g = granEndpoint(R, 100)!;
    expect(g.slope).toBeCloseTo(slope, 12);
    expect(g.intercept).toBeCloseTo(intercept, 12);
  });

  it('widening the window to pH 4.5 takes in 12.75 and 13.00 mL, where CO2 still bends the line, and moves V_eq away from the true 12.500 mL (computed from the model)', () => {
    const wide = granEndpoint(R, 100, { maxPh: 4.5 })!;
    const narrow = granEndpoint(R, 100)!;
    expect(wide.n).toBe(12);
    expect(Math.abs(wide.equivalenceVolumeMl - 12.5)).toBeGreaterThan(Math.abs(narrow.equivalenceVolumeMl - 12.5));
  });

  it('fewer than three points in the window gives no Gran result', () => {
    expect(granEndpoint(R.slice(0, 31), 100)).toBeNull();
  });
});
