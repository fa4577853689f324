import dayjs from 'dayjs';
import { afterAll, describe, expect, it } from 'vitest';
import { as, demo } from '../fixtures/auth.js';
import { kestrelEffluent, localTime, makeAcidLot, makeResult } from '../fixtures/bench.js';
import { apiTestApp } from '../setup/db.js';

const { app, sequelize } = apiTestApp();
afterAll(() => sequelize.close());

const lotBody = (lot: string, o: Record<string, unknown> = {}) => ({ kind: 'acid', reagent: 'H2SO4', nominalNormality: 0.1, lot, expiresOn: dayjs().add(60, 'day').format('YYYY-MM-DD'), ...o });

describe('titrant lots and standardisations (SM 2320 B ¶3; SM 2310 B ¶3)', () => {
  it('computes 5b: triplicate 19.05, 19.08, 19.02 mL against 40.00 mL of 2.512 g/L Na2CO3 → 0.09952 N, RSD 0.16 %, valid 30 days', async () => {
    const analyst = await as(app, demo.analyst);
    const lot = (await analyst.post('/api/v1/titrants', lotBody(`5b-${Date.now()}`))).body;
    const at = dayjs().subtract(1, 'day');
    const res = await analyst.post(`/api/v1/titrants/${lot.id}/standardizations`, {
      primaryStandard: 'Na2CO3',
      mode: 'solution',
      standardGramsPerL: 2.512,
      replicates: [19.05, 19.08, 19.02].map((c) => ({ standardVolumeMl: 40, titrantVolumeMl: c })),
      standardizedAt: at.toISOString(),
    });
    expect(res.status).toBe(201);
    expect(res.body.normality.toFixed(5)).toBe('0.09952');
    expect(res.body.rsdPercent.toFixed(2)).toBe('0.16');
    expect(res.body.replicates.map((r: { normality: number }) => r.normality.toFixed(5))).toEqual(['0.09952', '0.09936', '0.09968']);
    expect(res.body).toMatchObject({ accepted: true, rsdLimitPercent: 0.5, validUntil: at.add(30, 'day').toISOString() });
    const listed = (await analyst.get(`/api/v1/titrants/${lot.id}`)).body;
    expect(listed.currentStandardization).toMatchObject({ id: res.body.id, valid: true });
    expect((await analyst.get(`/api/v1/titrants/${lot.id}/standardizations`)).body.total).toBe(1);
  });

  it('rejects replicates that disagree (RSD above 0.5 %) and such a standardisation is not used', async () => {
    const analyst = await as(app, demo.analyst);
    const lot = (await analyst.post('/api/v1/titrants', lotBody(`rsd-${Date.now()}`))).body;
    const res = await analyst.post(`/api/v1/titrants/${lot.id}/standardizations`, {
      primaryStandard: 'Na2CO3',
      mode: 'solution',
      standardGramsPerL: 2.512,
      replicates: [19.05, 19.5].map((c) => ({ standardVolumeMl: 40, titrantVolumeMl: c })),
      standardizedAt: dayjs().subtract(1, 'day').toISOString(),
    });
    expect(res.body.accepted).toBe(false);
    expect((await analyst.get(`/api/v1/titrants/${lot.id}`)).body.currentStandardization).toBeNull();
  });

  it('names the wrong primary standard, the reagent that is not of that kind, a duplicate lot, and a single replicate', async () => {
    const analyst = await as(app, demo.analyst);
    const lot = (await analyst.post('/api/v1/titrants', lotBody(`k-${Date.now()}`))).body;
    const khp = await analyst.post(`/api/v1/titrants/${lot.id}/standardizations`, { primaryStandard: 'KHP', mode: 'mass', replicates: [1, 2].map(() => ({ standardGrams: 0.4, titrantVolumeMl: 20 })), standardizedAt: dayjs().toISOString() });
    expect(khp.body.error.fields.primaryStandard).toMatch(/Na2CO3/);
    expect((await analyst.post('/api/v1/titrants', lotBody('x', { reagent: 'NaOH' }))).body.error.fields).toHaveProperty('reagent');
    expect((await analyst.post('/api/v1/titrants', lotBody(lot.lot))).status).toBe(409);
    const single = await analyst.post(`/api/v1/titrants/${lot.id}/standardizations`, { primaryStandard: 'Na2CO3', mode: 'mass', replicates: [{ standardGrams: 0.106, titrantVolumeMl: 20 }], standardizedAt: dayjs().toISOString() });
    expect(single.body.error.fields.replicates).toMatch(/duplicate/);
  });

  it('lets an operator read the lab’s lots but not create one, and retires a lot with a stale-checked PATCH', async () => {
    const op = await as(app, demo.operator);
    const analyst = await as(app, demo.analyst);
    const lots = (await op.get('/api/v1/titrants?kind=acid&pageSize=100')).body;
    expect(lots.items.some((l: { lot: string }) => l.lot === 'MA-H2SO4-0.02-2611')).toBe(true);
    expect((await op.post('/api/v1/titrants', lotBody('op'))).status).toBe(403);
    const lot = (await analyst.post('/api/v1/titrants', lotBody(`r-${Date.now()}`))).body;
    expect((await analyst.patch(`/api/v1/titrants/${lot.id}`, { version: lot.version + 1, active: false })).status).toBe(409);
    const retired = await analyst.patch(`/api/v1/titrants/${lot.id}`, { version: lot.version, active: false });
    expect(retired.body.active).toBe(false);
  });
});

describe('pH meter calibrations (EPA SW-846 9040C; Nernst slope)', () => {
  it('6e: pH 7.00 at −0.5 mV and pH 4.00 at +172.6 mV, 25 °C → 57.70 mV/pH, 97.5 % of 59.16, passes 95–105 %', async () => {
    const op = await as(app, demo.operator);
    const res = await op.post('/api/v1/calibrations', { meterId: `KF-T-${Date.now()}`, calibratedAt: dayjs().subtract(1, 'hour').toISOString(), temperatureC: 25, buffers: [{ nominalPh: 7, mV: -0.5 }, { nominalPh: 4, mV: 172.6 }, { nominalPh: 10, mV: -170 }] });
    expect(res.status).toBe(201);
    expect(res.body.slopeMvPerPh).toBeCloseTo(57.7, 3);
    expect(res.body.theoreticalSlopeMvPerPh).toBeCloseTo(59.16, 2);
    expect(res.body.percentSlope).toBeCloseTo(97.53, 2);
    expect(res.body.checks[0]).toMatchObject({ nominalPh: 10, passed: true });
    expect(res.body).toMatchObject({ passed: true, window: { minPercent: 95, maxPercent: 105 } });
    // it belongs to the operator's utility: another utility cannot see it
    expect((await (await as(app, demo.operatorBrindlemoor)).get(`/api/v1/calibrations/${res.body.id}`)).status).toBe(404);
    expect((await (await as(app, demo.analyst)).get(`/api/v1/calibrations/${res.body.id}`)).status).toBe(200);
    const bad = await op.post('/api/v1/calibrations', { meterId: 'X', calibratedAt: dayjs().toISOString(), temperatureC: 25, buffers: [{ nominalPh: 7, mV: 0 }, { nominalPh: 7, mV: 170 }] });
    expect(bad.body.error.fields).toHaveProperty(['buffers.1.nominalPh']);
  });
});

describe('QC batches seen by a client utility', () => {
  it('shows an operator only batches covering their own results, with only their titrations', async () => {
    const analyst = await as(app, demo.analyst);
    const kf = await kestrelEffluent(app);
    const acid = await makeAcidLot(app);
    const { titration } = await makeResult(app, demo.analyst, { pointId: kf.point.id, titrantId: acid.id, analysedAt: localTime(kf.zone, 2, '10:00'), titreMl: 7 });
    const batch = (await analyst.post('/api/v1/qc-batches', { batchDate: localTime(kf.zone, 2, '10:00').format('YYYY-MM-DD'), analysis: 'alkalinity', duplicates: [{ firstResult: 70, secondResult: 71 }], titrationIds: [titration.id] })).body;
    expect(batch.passed).toBe(true);
    const kestrelOp = await as(app, demo.operator);
    expect((await kestrelOp.get(`/api/v1/qc-batches/${batch.id}`)).body.titrations.map((t: { id: number }) => t.id)).toEqual([titration.id]);
    expect((await kestrelOp.post('/api/v1/qc-batches', { batchDate: '2026-01-01', analysis: 'alkalinity' })).status).toBe(403);
    const brindlemoor = await as(app, demo.operatorBrindlemoor);
    expect((await brindlemoor.get(`/api/v1/qc-batches/${batch.id}`)).status).toBe(404);
    expect((await brindlemoor.get('/api/v1/qc-batches?pageSize=200')).body.items.some((b: { id: number }) => b.id === batch.id)).toBe(false);
    // the demo's weekly lab batches, one of which failed
    const demoBatches = (await analyst.get('/api/v1/qc-batches?passed=false&pageSize=50')).body;
    expect(demoBatches.total).toBeGreaterThanOrEqual(1);
  });
});
