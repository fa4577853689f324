import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { alkalinityFromReadings, BENCH_READINGS_LIMIT } from '../../shared/chemistry/bench.js';
import { carbonateWaterModel, modelCurve } from '../../shared/chemistry/curve.js';
import { Dec } from '../../shared/chemistry/decimal.js';
import { derivativeSeries } from '../../shared/chemistry/endpoints.js';
import { calculateAlkalinity } from '../../shared/chemistry/service.js';
import { as, demo, tokenFor } from '../fixtures/auth.js';
import { localTime, makeAcidLot, makeSample, makeSite, makeTitration, readingsCsv } from '../fixtures/bench.js';
import { apiTestApp } from '../setup/db.js';
import { SYNTHETIC_TITRATION } from '../unit/chemistry/fixtures.js';

const { app, sequelize } = apiTestApp();
// A second app on the same models with a 4 KiB upload limit (models are bound once per process).
const small = apiTestApp({ UPLOAD_LIMIT_BYTES: '4096' }, sequelize).app;
afterAll(() => sequelize.close());

let site: Awaited<ReturnType<typeof makeSite>>;
let acid: { id: number };
let token: string;

beforeAll(async () => {
  site = await makeSite(app);
  acid = await makeAcidLot(app);
  token = await tokenFor(app, demo.analyst);
});

async function curveDraft(body: Record<string, unknown> = {}) {
  const sample = await makeSample(app, demo.analyst, { pointId: site.point.id, collectedAt: localTime(site.zone, 2, '08:00').toISOString() });
  return makeTitration(app, demo.analyst, sample.id, { method: 'potentiometric_curve', titrantId: acid.id, analysedAt: localTime(site.zone, 2, '09:00').toISOString(), ...body });
}

const upload = (id: number, csv: string | Buffer, o: { filename?: string; contentType?: string; field?: string; version?: number; on?: typeof app } = {}) => {
  const req = request(o.on ?? app).post(`/api/v1/titrations/${id}/readings`).set('Authorization', `Bearer ${token}`);
  if (o.version !== undefined) req.field('version', String(o.version));
  return req.attach(o.field ?? 'file', Buffer.isBuffer(csv) ? csv : Buffer.from(csv), { filename: o.filename ?? 'curve.csv', contentType: o.contentType ?? 'text/csv' });
};

const synthetic = SYNTHETIC_TITRATION.map((r) => [r.volumeMl, r.pH] as [number, number]);

describe('POST /titrations/:id/readings (CSV upload of a recorded curve)', () => {
  it('stores the curve and recomputes: domain.md 3b, fixed pH 4.5 → T 125.2 mg/L, P 8.81 (SM 2320 B), the engine’s own result', async () => {
    const draft = await curveDraft();
    expect(draft.missingInputs).toEqual(['readings']);
    const res = await upload(draft.id, readingsCsv(synthetic), { version: draft.version });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ readingCount: 39, missingInputs: [] });
    expect(res.body.results.totalAlkalinity).toBe(125.167);
    expect(Number(res.body.results.totalAlkalinity.toFixed(1))).toBe(125.2);
    expect(Number(res.body.results.phenolphthaleinAlkalinity.toFixed(2))).toBe(8.81);
    const engine = calculateAlkalinity({ sampleVolumeMl: 100, titrantNormality: 0.02, readings: SYNTHETIC_TITRATION, caco3Factor: 50000 });
    const { derivative: _d, ...curve } = engine.curve!;
    expect(res.body.results.engine).toEqual({ ...engine, curve });
    // the Curve view's data: readings, the engine's first derivative, the endpoints used
    expect(res.body.readings).toHaveLength(39);
    expect(res.body.readings[4]).toEqual({ seq: 5, volumeMl: 1, pH: 8.1, temperatureC: null });
    expect(res.body.derivative).toEqual(derivativeSeries(SYNTHETIC_TITRATION));
    expect(res.body.results.endpointVolumes.total).toBeCloseTo(12.5167, 4);

    // the inflection endpoint of the same curve, by PATCH: 12.500 mL, T 125.0 (domain.md 3d, NFM A6.6.4.B)
    const analyst = await as(app, demo.analyst);
    const inflection = await analyst.patch(`/api/v1/titrations/${draft.id}`, { version: res.body.version, endpointMethod: 'inflection' });
    expect(inflection.status).toBe(200);
    expect(inflection.body.results.totalAlkalinity).toBe(125);
    expect(inflection.body.readingCount).toBe(39);
  });

  it('takes 5,000 readings and stores every one; the result is the engine’s for that curve', async () => {
    const model = carbonateWaterModel({ sampleVolumeMl: 100, titrant: 'acid', titrantNormality: 0.02, initialPh: 9.2, alkalinityEqL: 2.5e-3 });
    const volumes = Array.from({ length: 5000 }, (_, i) => Math.round(((17 * i) / 4999) * 1e5) / 1e5);
    const rows = modelCurve(model, volumes).map((r) => [r.volumeMl, Math.round(r.pH * 1000) / 1000, 25] as [number, number, number]);
    const draft = await curveDraft();
    const started = Date.now();
    const res = await upload(draft.id, readingsCsv(rows, 'volume_ml,ph,temperature_c'));
    expect(res.status).toBe(200);
    expect(Date.now() - started).toBeLessThan(15_000);
    expect(res.body.readingCount).toBe(5000);
    expect(res.body.readings).toHaveLength(5000);
    expect(res.body.readings[4999]).toMatchObject({ seq: 5000, volumeMl: 17, temperatureC: 25 });
    expect(res.body.derivative).toHaveLength(4999);
    const engine = alkalinityFromReadings({ sampleVolumeMl: 100, titrantNormality: 0.02, readings: rows.map(([volumeMl, pH]) => ({ volumeMl, pH })), caco3Factor: 50000 });
    expect(res.body.results.totalAlkalinity).toBe(engine.totalAlkalinity);
    expect(res.body.results.exact.totalAlkalinity).toBe(new Dec(engine.exact.totalAlkalinity).toDecimalPlaces(8).toFixed(8));
    // the replaced readings are kept in the audit trail, not lost
    const again = await upload(draft.id, readingsCsv(synthetic));
    expect(again.body.readingCount).toBe(39);
    const trail = (await (await as(app, demo.analyst)).get(`/api/v1/titrations/${draft.id}/audit?sort=-createdAt&pageSize=1`)).body.items[0];
    expect(trail.action).toBe('titration.readings_replaced');
    expect(trail.before.readings).toHaveLength(5000);
  });

  it('refuses more rows than BENCH_READINGS_LIMIT with 400 naming the limit, and keeps the old readings', async () => {
    const draft = await curveDraft();
    const ok = await upload(draft.id, readingsCsv(synthetic), { version: draft.version });
    expect(ok.status).toBe(200);
    const rows = Array.from({ length: BENCH_READINGS_LIMIT + 1 }, (_, i) => [Math.round(i * 0.001 * 1000) / 1000, 9] as [number, number]);
    const big = await upload(draft.id, readingsCsv(rows));
    expect(big.status, JSON.stringify(big.body).slice(0, 300)).toBe(400);
    expect(JSON.stringify(big.body.error)).toContain(String(BENCH_READINGS_LIMIT));
    expect((await (await as(app, demo.analyst)).get(`/api/v1/titrations/${draft.id}`)).body.readingCount).toBe(39);
  });

  it('answers a bad value 400 naming its line and column, and stores nothing', async () => {
    const draft = await curveDraft();
    const res = await upload(draft.id, 'volume_ml,ph\n0,9.20\n0.25,9.05\n0.50,abc\n0.75,8.52\n');
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/line 4, column ph/);
    expect(res.body.error.fields).toEqual({ 'line.4.ph': '"abc" is not a number (use a decimal point)' });
    expect((await (await as(app, demo.analyst)).get(`/api/v1/titrations/${draft.id}`)).body.readingCount).toBe(0);
  });

  it.each([
    ['a pH outside 0–14', 'volume_ml,ph\n0,9.2\n1,15.2\n', 'line.3.ph', /between 0 and 14/],
    ['a volume that goes backwards', 'volume_ml,ph\n0,9.2\n1.5,8.1\n\n1.2,7.9\n', 'line.5.volume_ml', /less than 1.5 on line 3/],
    ['a missing header', '0,9.2\n1,8.1\n', 'line.1.0', /header/],
    ['an unknown column', 'volume_ml,ph,conductivity\n0,9.2,100\n', 'line.1.conductivity', /unknown column/],
    ['a short line', 'volume_ml,ph\n0,9.2\n1\n', 'line.3', /expected 2 values/],
    ['a decimal comma', 'volume_ml,ph\n0,9.2\n"1,5",8.1\n', 'line.3.volume_ml', /not a number/],
    ['false precision', 'volume_ml,ph\n0,9.2\n1.123456,8.1\n', 'line.3.volume_ml', /decimal places/],
  ])('names the line for %s', async (_what, csv, field, reason) => {
    const draft = await curveDraft();
    const res = await upload(draft.id, csv);
    expect(res.status).toBe(400);
    expect(res.body.error.fields[field]).toMatch(reason);
  });

  it('answers a curve that never reaches the endpoint 400 from the engine', async () => {
    const draft = await curveDraft();
    const res = await upload(draft.id, readingsCsv([[0, 9.2], [1, 8.1], [2, 7.5]]));
    expect(res.status).toBe(400);
    expect(res.body.error.fields.readings).toMatch(/never reach pH 4.5/);
  });

  it('refuses a file that is not CSV, a wrong field, no file, a stale version and a non-curve titration', async () => {
    const draft = await curveDraft();
    const png = await upload(draft.id, Buffer.from([0x89, 0x50, 0x4e, 0x47, 0, 0, 0]), { filename: 'curve.png', contentType: 'image/png' });
    expect(png.status).toBe(400);
    expect(png.body.error.fields.file).toMatch(/csv/i);
    const field = await upload(draft.id, readingsCsv(synthetic), { field: 'readings' });
    expect(field.status).toBe(400);
    const none = await (await as(app, demo.analyst)).post(`/api/v1/titrations/${draft.id}/readings`, {});
    expect(none.status).toBe(400);
    expect(none.body.error.fields).toHaveProperty('file');
    const stale = await upload(draft.id, readingsCsv(synthetic), { version: draft.version + 5 });
    expect(stale.status).toBe(409);
    const sample = await makeSample(app, demo.analyst, { pointId: site.point.id, collectedAt: localTime(site.zone, 2, '08:00').toISOString() });
    const fixed = await makeTitration(app, demo.analyst, sample.id, { titrantId: acid.id, analysedAt: localTime(site.zone, 2, '09:00').toISOString() });
    expect((await upload(fixed.id, readingsCsv(synthetic))).body.error.fields).toHaveProperty('method');
  });

  it('answers a file over UPLOAD_LIMIT_BYTES 413', async () => {
    const draft = await curveDraft();
    const rows = Array.from({ length: 600 }, (_, i) => [i * 0.01, 9] as [number, number]);
    const res = await upload(draft.id, readingsCsv(rows), { on: small });
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('payload_too_large');
  });

  it('takes pasted readings as JSON too, with the same checks', async () => {
    const draft = await curveDraft();
    const analyst = await as(app, demo.analyst);
    const ok = await analyst.post(`/api/v1/titrations/${draft.id}/readings`, { readings: SYNTHETIC_TITRATION });
    expect(ok.status).toBe(200);
    expect(ok.body.results.totalAlkalinity).toBe(125.167);
    const bad = await analyst.post(`/api/v1/titrations/${draft.id}/readings`, { readings: [{ volumeMl: 1, pH: 8 }, { volumeMl: 0.5, pH: 7 }] });
    expect(bad.body.error.fields).toHaveProperty(['readings.1.volumeMl']);
  });
});
