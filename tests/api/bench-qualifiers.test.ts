import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { as, demo } from '../fixtures/auth.js';
import { localTime, makeAcidLot, makeResult, makeSite } from '../fixtures/bench.js';
import { apiTestApp } from '../setup/db.js';

const { app, sequelize } = apiTestApp();
afterAll(() => sequelize.close());

let site: Awaited<ReturnType<typeof makeSite>>;
let acid: { id: number };
const codes = (t: Record<string, any>) => (t.qualifiers as Array<{ code: string }>).map((q) => q.code);

beforeAll(async () => {
  site = await makeSite(app);
  acid = await makeAcidLot(app);
});

/** A clean result: collected 2 h before analysis, received cold, freshly standardised lot, colour indicator, no batch. */
const result = (o: Partial<Parameters<typeof makeResult>[2]> = {}) =>
  makeResult(app, demo.analyst, { pointId: site.point.id, titrantId: acid.id, analysedAt: localTime(site.zone, 3, '10:00'), titreMl: 7, ...o, sample: { receiptTemperatureC: 4, ...o.sample } });

describe('qualifiers, each on its own evidence', () => {
  it('gives a clean result no qualifier (the control)', async () => {
    expect(codes((await result()).titration)).toEqual([]);
  });

  it('hold_time_exceeded: 336 h from collection is within, 337 h is not (40 CFR 136.3 Table II: 14 days; domain.md 6f)', async () => {
    const analysedAt = localTime(site.zone, 3, '10:00');
    const within = await result({ sample: { collectedAt: analysedAt.subtract(336, 'hour').toISOString() } });
    expect(codes(within.titration)).toEqual([]);
    const over = await result({ sample: { collectedAt: analysedAt.subtract(337, 'hour').toISOString() } });
    expect(codes(over.titration)).toEqual(['hold_time_exceeded']);
    expect(over.titration.qualifiers[0].detail).toMatchObject({ elapsedHours: 337, limitHours: 336, exceededByHours: 1 });
  });

  it('receipt_temperature: 6.0 °C is within, 6.1 °C is not (40 CFR 136.3 Table II: cool to ≤ 6 °C)', async () => {
    expect(codes((await result({ sample: { receiptTemperatureC: 6 } })).titration)).toEqual([]);
    expect(codes((await result({ sample: { receiptTemperatureC: 6.1 } })).titration)).toEqual(['receipt_temperature']);
    // not measured is not qualified
    expect(codes((await result({ sample: { receiptTemperatureC: null } })).titration)).toEqual([]);
  });

  it('standardization_expired: a standardisation older than 30 days, or none, qualifies; the nominal normality is used when none (NFM A6.6.2 monthly)', async () => {
    const old = await makeAcidLot(app, { standardizedDaysAgo: 40 });
    const expired = await result({ titrantId: old.id });
    expect(codes(expired.titration)).toEqual(['standardization_expired']);
    expect(expired.titration.qualifiers[0].detail.reason).toBe('expired');
    const none = await makeAcidLot(app, { standardizedDaysAgo: null, nominal: 0.021 });
    const missing = await result({ titrantId: none.id });
    expect(codes(missing.titration)).toEqual(['standardization_expired']);
    expect(missing.titration).toMatchObject({ normalitySource: 'nominal', normalityUsed: 0.021, standardizationId: null });
    expect(missing.titration.results.totalAlkalinity).toBe(73.5);
  });

  it('meter_not_calibrated: a pH-meter method needs a passing calibration of that meter earlier the same day', async () => {
    const analyst = await as(app, demo.analyst);
    const analysedAt = localTime(site.zone, 3, '10:00');
    const meter = `QM-${Date.now().toString(36)}`;
    const potentiometric = { method: 'potentiometric_fixed', meterId: meter };
    expect(codes((await result({ titration: potentiometric })).titration)).toEqual(['meter_not_calibrated']);
    // a failing calibration (90 % slope) does not count
    const slope = 0.9 * 59.16;
    const failed = await analyst.post('/api/v1/calibrations', { meterId: meter, calibratedAt: analysedAt.subtract(1, 'hour').toISOString(), temperatureC: 25, buffers: [{ nominalPh: 7, mV: 0 }, { nominalPh: 4, mV: Math.round(3 * slope * 10) / 10 }] });
    expect(failed.body.passed).toBe(false);
    expect(codes((await result({ titration: potentiometric })).titration)).toEqual(['meter_not_calibrated']);
    // domain.md 6e: 97.5 % passes; a calibration after the analysis does not cover it
    const cal = (at: string) => analyst.post('/api/v1/calibrations', { meterId: meter, calibratedAt: at, temperatureC: 25, buffers: [{ nominalPh: 7, mV: -0.5 }, { nominalPh: 4, mV: 172.6 }] });
    expect((await cal(analysedAt.add(1, 'hour').toISOString())).body.passed).toBe(true);
    expect(codes((await result({ titration: potentiometric })).titration)).toEqual(['meter_not_calibrated']);
    // nor does one of the day before
    await cal(analysedAt.subtract(1, 'day').toISOString());
    expect(codes((await result({ titration: potentiometric })).titration)).toEqual(['meter_not_calibrated']);
    await cal(analysedAt.subtract(30, 'minute').toISOString());
    expect(codes((await result({ titration: potentiometric })).titration)).toEqual([]);
    // a colour-indicator titration never needs one
    expect(codes((await result({ titration: { meterId: undefined } })).titration)).toEqual([]);
  });

  it('lifts meter_not_calibrated from a draft when the morning calibration is recorded afterwards', async () => {
    const analyst = await as(app, demo.analyst);
    const analysedAt = localTime(site.zone, 4, '11:00');
    const meter = `QL-${Date.now().toString(36)}`;
    const { titration } = await result({ analysedAt, titration: { method: 'potentiometric_fixed', meterId: meter } });
    expect(codes(titration)).toEqual(['meter_not_calibrated']);
    await analyst.post('/api/v1/calibrations', { meterId: meter, calibratedAt: analysedAt.subtract(2, 'hour').toISOString(), temperatureC: 25, buffers: [{ nominalPh: 7, mV: -0.5 }, { nominalPh: 4, mV: 172.6 }] });
    expect(codes((await analyst.get(`/api/v1/titrations/${titration.id}`)).body)).toEqual([]);
  });

  it('qc_failure: a failing batch qualifies its titrations, a passing one does not (duplicates ≤ 10 % RPD, recovery 90–110 %: domain.md 6)', async () => {
    const analyst = await as(app, demo.analyst);
    const a = (await result()).titration;
    const b = (await result()).titration;
    const batch = (ids: number[], second: number) =>
      analyst.post('/api/v1/qc-batches', {
        batchDate: localTime(site.zone, 3, '10:00').format('YYYY-MM-DD'),
        analysis: 'alkalinity',
        duplicates: [{ label: 'dup', firstResult: 124, secondResult: second }],
        checkStandards: [{ label: 'LCS', trueValueNa2co3MgL: 106, measured: 97.8 }],
        blanks: [{ measured: 0.4, reportingLimit: 2 }],
        titrationIds: ids,
      });
    const passing = await batch([a.id], 121);
    expect(passing.status).toBe(201);
    expect(passing.body.evaluation.duplicates[0].rpdPercent).toBeCloseTo(2.449, 3);
    expect(passing.body).toMatchObject({ passed: true, titrations: [{ id: a.id }] });
    expect(codes((await analyst.get(`/api/v1/titrations/${a.id}`)).body)).toEqual([]);
    const failing = await batch([b.id], 108);
    expect(failing.body).toMatchObject({ passed: false, evaluation: { failures: ['duplicates.0'] } });
    const qualified = (await analyst.get(`/api/v1/titrations/${b.id}`)).body;
    expect(codes(qualified)).toEqual(['qc_failure']);
    expect(qualified.qcBatchId).toBe(failing.body.id);
    // a titration joins one batch only
    expect((await batch([b.id], 121)).body.error.fields['titrationIds.0']).toMatch(/already in QC batch/);
    // correcting the batch (a re-run duplicate) lifts the qualifier
    const fixed = await analyst.patch(`/api/v1/qc-batches/${failing.body.id}`, { version: failing.body.version, duplicates: [{ label: 'dup re-run', firstResult: 124, secondResult: 122 }] });
    expect(fixed.body.passed).toBe(true);
    expect(codes((await analyst.get(`/api/v1/titrations/${b.id}`)).body)).toEqual([]);
  });

  it('uses the lab’s own limit when the lab administrator sets one (receipt ≤ 4 °C here), and the defaults otherwise', async () => {
    const admin = await as(app, demo.admin);
    const analyst = await as(app, demo.analyst);
    expect((await analyst.patch('/api/v1/lab-settings/bench', { receiptTemperatureMaxC: 4 })).status).toBe(403);
    const before = (await admin.get('/api/v1/lab-settings/bench')).body;
    expect(before.defaults).toMatchObject({ holdingTimeHours: 336, receiptTemperatureMaxC: 6, duplicateRpdMaxPercent: 10, electrodeSlopeMinPercent: 95, standardizationValidDays: 30 });
    try {
      const set = await admin.patch('/api/v1/lab-settings/bench', { receiptTemperatureMaxC: 4 });
      expect(set.body.settings.receiptTemperatureMaxC).toBe(4);
      expect(codes((await result({ sample: { receiptTemperatureC: 5 } })).titration)).toEqual(['receipt_temperature']);
    } finally {
      await admin.patch('/api/v1/lab-settings/bench', { receiptTemperatureMaxC: before.settings.receiptTemperatureMaxC });
    }
    expect(codes((await result({ sample: { receiptTemperatureC: 5 } })).titration)).toEqual([]);
    expect((await admin.patch('/api/v1/lab-settings/bench', { holdingTimeHours: -1 })).body.error.fields).toHaveProperty('holdingTimeHours');
  });
});

describe('bench suggestions', () => {
  it('suggests a larger sample and weaker titrant for a titre under 50 burette steps (common practice; EPA 310.1 via NEMI)', async () => {
    const strong = await makeAcidLot(app, { nominal: 0.1 });
    const { titration } = await result({ titrantId: strong.id, titreMl: 0.35, titration: { sampleVolumeMl: 50 } });
    const s = titration.warnings.find((w: { code: string }) => w.code === 'titre_suggestion');
    expect(s.suggestion).toMatchObject({ reason: 'titre_too_small', suggestedSampleVolumeMl: 200, suggestedTitrantNormality: 0.02 });
    expect(titration.warnings.map((w: { code: string }) => w.code)).toContain('titrant_volume_small');
  });

  it('suggests a smaller aliquot for a titre over one 50-mL fill (EPA 310.1 via NEMI)', async () => {
    const { titration } = await result({ titreMl: 62 });
    const s = titration.warnings.find((w: { code: string }) => w.code === 'titre_suggestion');
    expect(s.suggestion).toMatchObject({ reason: 'titre_too_large', suggestedSampleVolumeMl: 25, suggestedTitrantNormality: 0.02, predictedTitrantVolumeMl: 15.5 });
  });
});
