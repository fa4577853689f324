import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SYNTHETIC_TITRATION } from '../unit/chemistry/fixtures.js';
import { calculateAlkalinity } from '../../shared/chemistry/service.js';
import { as, demo } from '../fixtures/auth.js';
import { kestrelEffluent, localTime, makeAcidLot, makeSite } from '../fixtures/bench.js';
import { apiTestApp } from '../setup/db.js';

const { app, sequelize } = apiTestApp();
afterAll(() => sequelize.close());

let acid: { id: number };
beforeAll(async () => {
  acid = await makeAcidLot(app);
});

const entry = (pointId: number, at: string, titration: Record<string, unknown> = {}, extra: Record<string, unknown> = {}) => ({
  sample: { pointId, sampleType: 'grab', collectedAt: at, receivedAt: at, receiptTemperatureC: 4 },
  titration: { analysis: 'alkalinity', method: 'color_indicator', sampleVolumeMl: 100, titrantId: acid.id, volumeToPh83Ml: 1.2, volumeToTotalEndpointMl: 11.5, totalEndpointPh: 4.5, analysedAt: at, ...titration },
  ...extra,
});

describe('POST /bench/entries: one row of the daily entry grid, all or nothing', () => {
  it('creates the sample and its titration, computed by the shared engine, and submits when asked', async () => {
    const op = await as(app, demo.operator);
    const kf = await kestrelEffluent(app);
    const at = localTime(kf.zone, 1, '08:30').toISOString();
    const res = await op.post('/api/v1/bench/entries').send(entry(kf.point.id, at, {}, { submit: true }));
    expect(res.status).toBe(201);
    // SM 2320 B with the fixture lot's 0.02000 N: P = 1.2 × 0.02 × 50,000 / 100 = 12, T = 115 (computed here)
    const engine = calculateAlkalinity({ sampleVolumeMl: 100, titrantNormality: 0.02, volumeToPh83Ml: 1.2, volumeToTotalEndpointMl: 11.5, totalEndpointPh: 4.5 });
    expect(res.body.titration.results).toMatchObject({ phenolphthaleinAlkalinity: engine.phenolphthaleinAlkalinity, totalAlkalinity: engine.totalAlkalinity });
    expect(res.body.titration.results.totalAlkalinity).toBe(115);
    expect(res.body.titration.status).toBe('submitted');
    expect(res.body.sample).toMatchObject({ point: { code: 'EFF-001' }, status: 'submitted' });
    expect(res.body.sample.titrations.map((t: { id: number }) => t.id)).toEqual([res.body.titration.id]);
  });

  it('leaves nothing behind when the titration is refused, naming the field under its part', async () => {
    const analyst = await as(app, demo.analyst);
    const site = await makeSite(app);
    const at = localTime(site.zone, 1, '09:00').toISOString();
    const count = async () => (await analyst.get(`/api/v1/samples?pointId=${site.point.id}&pageSize=1&from=2000-01-01&to=2100-01-01`)).body.total;
    expect(await count()).toBe(0);

    // the lot does not exist: the service refuses after the sample row was written in the same transaction
    const missingLot = await analyst.post('/api/v1/bench/entries').send(entry(site.point.id, at, { titrantId: 987654321 }));
    expect(missingLot.status).toBe(400);
    expect(Object.keys(missingLot.body.error.fields)).toEqual(['titration.titrantId']);
    expect(await count()).toBe(0);

    // a base lot for an alkalinity titration, likewise
    const base = await makeAcidLot(app, { kind: 'base' });
    const wrongKind = await analyst.post('/api/v1/bench/entries').send(entry(site.point.id, at, { titrantId: base.id }));
    expect(wrongKind.status).toBe(400);
    expect(wrongKind.body.error.fields).toHaveProperty('titration.titrantId');
    expect(await count()).toBe(0);

    // submitting an incomplete titration is refused and the draft is not kept either
    const incomplete = await analyst.post('/api/v1/bench/entries').send(entry(site.point.id, at, { volumeToTotalEndpointMl: null }, { submit: true }));
    expect(incomplete.status).toBe(400);
    expect(Object.keys(incomplete.body.error.fields).every((k) => k.startsWith('titration.'))).toBe(true);
    expect(await count()).toBe(0);

    // schema errors name both parts at once
    const bad = await analyst.post('/api/v1/bench/entries').send({ sample: { pointId: site.point.id, sampleType: 'grab' }, titration: { analysis: 'alkalinity', method: 'color_indicator', sampleVolumeMl: -5, titrantId: acid.id } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty(['sample.collectedAt']);
    expect(bad.body.error.fields).toHaveProperty(['titration.sampleVolumeMl']);
    expect(await count()).toBe(0);

    // and a good row saves
    expect((await analyst.post('/api/v1/bench/entries').send(entry(site.point.id, at))).status).toBe(201);
    expect(await count()).toBe(1);
  });

  it('keeps scope: an operator of another utility cannot log at Kestrel Ford’s point', async () => {
    const other = await as(app, demo.operatorBrindlemoor);
    const kf = await kestrelEffluent(app);
    const res = await other.post('/api/v1/bench/entries').send(entry(kf.point.id, localTime(kf.zone, 1, '10:00').toISOString()));
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({ 'sample.pointId': 'not found' });
    expect((await (await as(app, demo.compliance)).post('/api/v1/bench/entries').send(entry(kf.point.id, new Date().toISOString()))).status).toBe(403);
  });
});

describe('POST /bench/entries/import: many entries, all or nothing', () => {
  it('stores every entry as the single-entry route would, with the engine’s results', async () => {
    const analyst = await as(app, demo.analyst);
    const site = await makeSite(app);
    const titres = [4.0, 6.0, 11.5];
    const entries = titres.map((v, i) => entry(site.point.id, localTime(site.zone, 1 + i, '08:00').toISOString(), { volumeToPh83Ml: 0, volumeToTotalEndpointMl: v }, { submit: i === 2 }));
    const res = await analyst.post('/api/v1/bench/entries/import').send({ entries });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.created).toBe(3);
    expect(res.body.items.map((x: { status: string }) => x.status)).toEqual(['draft', 'draft', 'submitted']);
    for (const [i, item] of (res.body.items as { titrationId: number }[]).entries()) {
      const t = (await analyst.get(`/api/v1/titrations/${item.titrationId}`)).body;
      // SM 2320 B with the fixture lot's 0.02000 N: T = titre × 0.02 × 50,000 / 100 (4.00 mL → 40, 6.00 → 60, 11.50 → 115)
      expect(t.results.totalAlkalinity).toBe(calculateAlkalinity({ sampleVolumeMl: 100, titrantNormality: 0.02, volumeToPh83Ml: 0, volumeToTotalEndpointMl: titres[i], totalEndpointPh: 4.5 }).totalAlkalinity);
    }
    expect((await analyst.get(`/api/v1/titrations/${res.body.items[0].titrationId}`)).body.results.totalAlkalinity).toBe(40);
  });

  it('stores exactly what the single-entry route stores: rows, readings, qualifiers, audit and sample status', async () => {
    // The import saves in batched inserts with its lookups read once; the single-entry route
    // goes one query at a time. The same entries through both must leave the same records.
    const analyst = await as(app, demo.analyst);
    const expired = await makeAcidLot(app, { standardizedDaysAgo: 40 });
    const nominal = await makeAcidLot(app, { standardizedDaysAgo: null });
    // a passing calibration of meter M-CAL that morning (the import picks it from its batch read)
    const meter = `M-CAL-${Date.now()}`;
    const calibration = await analyst.post('/api/v1/calibrations').send({ meterId: meter, calibratedAt: localTime('America/Chicago', 4, '07:00').toISOString(), temperatureC: 25, buffers: [{ nominalPh: 7, mV: -0.5 }, { nominalPh: 4, mV: 172.6 }, { nominalPh: 10, mV: -170 }] });
    expect(calibration.status, JSON.stringify(calibration.body)).toBe(201);
    const entries = (site: { point: { id: number }; zone: string }) => [
      entry(site.point.id, localTime(site.zone, 2, '08:00').toISOString()),
      // 20 days after collection: hold time exceeded (40 CFR 136.3 Table II: 14 days); warm on receipt
      { ...entry(site.point.id, localTime(site.zone, 25, '08:00').toISOString(), { analysedAt: localTime(site.zone, 5, '08:00').toISOString() }), sample: { ...entry(site.point.id, localTime(site.zone, 25, '08:00').toISOString()).sample, receiptTemperatureC: 9 } },
      entry(site.point.id, localTime(site.zone, 3, '08:00').toISOString(), { titrantId: expired.id }),
      entry(site.point.id, localTime(site.zone, 3, '09:00').toISOString(), { titrantId: nominal.id, volumeToTotalEndpointMl: 6.2 }),
      // a recorded curve on a meter with no calibration that day: readings stored, meter qualifier
      entry(site.point.id, localTime(site.zone, 4, '08:00').toISOString(), { method: 'potentiometric_curve', volumeToPh83Ml: undefined, volumeToTotalEndpointMl: undefined, meterId: 'M-UNCALIBRATED', readings: SYNTHETIC_TITRATION }),
      // the same curve on the meter calibrated that morning: no meter qualifier
      entry(site.point.id, localTime(site.zone, 4, '10:00').toISOString(), { method: 'potentiometric_curve', volumeToPh83Ml: undefined, volumeToTotalEndpointMl: undefined, meterId: meter, readings: SYNTHETIC_TITRATION }),
      entry(site.point.id, localTime(site.zone, 4, '09:00').toISOString(), { volumeToTotalEndpointMl: 9.9 }, { submit: true }),
    ];
    const one = await makeSite(app);
    const singles = [];
    for (const e of entries(one)) {
      const res = await analyst.post('/api/v1/bench/entries').send(e);
      expect(res.status, JSON.stringify(res.body)).toBe(201);
      singles.push({ sampleId: res.body.sample.id, titrationId: res.body.titration.id });
    }
    const other = await makeSite(app);
    const imported = await analyst.post('/api/v1/bench/entries/import').send({ entries: entries(other) });
    expect(imported.status, JSON.stringify(imported.body)).toBe(201);

    const q = async (sql: string, ids: number[]) => (await sequelize.query(sql, { replacements: { ids }, type: QueryTypes.SELECT })) as Record<string, unknown>[];
    const strip = (rows: Record<string, unknown>[], drop: string[]) => rows.map((r) => Object.fromEntries(Object.entries(r).filter(([k]) => !drop.includes(k))));
    const titrations = (ids: number[]) => q('SELECT * FROM titrations WHERE id IN (:ids) ORDER BY id', ids).then((r) => strip(r, ['id', 'sample_id', 'point_id', 'organization_id', 'created_at', 'updated_at', 'submitted_at']));
    const samples = (ids: number[]) => q('SELECT * FROM samples WHERE id IN (:ids) ORDER BY id', ids).then((r) => strip(r, ['id', 'point_id', 'facility_id', 'organization_id', 'created_at', 'updated_at']));
    const readings = (ids: number[]) => q('SELECT seq, volume_ml, ph, temperature_c FROM titration_readings WHERE titration_id IN (:ids) ORDER BY titration_id, seq', ids);
    const auditOf = (entity: string) => async (ids: number[]) =>
      (await q(`SELECT action, entity_id, \`after\` FROM audit_events WHERE entity = '${entity}' AND entity_id IN (:ids) ORDER BY id`, ids)).map((r) => {
        const after = typeof r.after === 'string' ? JSON.parse(r.after) : r.after;
        const { id: _i, sampleId: _s, pointId: _p, facilityId: _f, organizationId: _o, createdAt: _c, updatedAt: _u, submittedAt: _sa, ...rest } = after ?? {};
        return { action: r.action, position: ids.indexOf(Number(r.entity_id)), after: rest };
      });
    const a = { samples: singles.map((x) => x.sampleId), titrations: singles.map((x) => x.titrationId) };
    const b = { samples: imported.body.items.map((x: { sampleId: number }) => x.sampleId), titrations: imported.body.items.map((x: { titrationId: number }) => x.titrationId) };
    const ta = await titrations(a.titrations);
    expect(ta).toHaveLength(7);
    expect(await titrations(b.titrations)).toEqual(ta);
    expect(await samples(b.samples)).toEqual(await samples(a.samples));
    expect((await readings(a.titrations)).length).toBe(2 * SYNTHETIC_TITRATION.length);
    expect(await readings(b.titrations)).toEqual(await readings(a.titrations));
    expect(await auditOf('titration')(b.titrations)).toEqual(await auditOf('titration')(a.titrations));
    expect(await auditOf('sample')(b.samples)).toEqual(await auditOf('sample')(a.samples));
    // the cases are really there: each qualifier decided from its own evidence
    const codes = ta.map((r) => (typeof r.qualifiers === 'string' ? JSON.parse(r.qualifiers) : r.qualifiers).map((x: { code: string }) => x.code).sort());
    expect(codes).toEqual([[], ['hold_time_exceeded', 'receipt_temperature'], ['standardization_expired'], ['standardization_expired'], ['meter_not_calibrated'], [], []]);
    expect(ta.map((r) => r.status)).toEqual(['draft', 'draft', 'draft', 'draft', 'draft', 'draft', 'submitted']);
  });

  it('refuses the whole batch when one entry is bad, naming it by position, and keeps none', async () => {
    const analyst = await as(app, demo.analyst);
    const site = await makeSite(app);
    const count = async () => (await analyst.get(`/api/v1/samples?pointId=${site.point.id}&pageSize=1&from=2000-01-01&to=2100-01-01`)).body.total;
    const at = localTime(site.zone, 1, '09:00').toISOString();
    const entries = [entry(site.point.id, at), entry(site.point.id, at), entry(site.point.id, at, { titrantId: 987654321 })];
    const res = await analyst.post('/api/v1/bench/entries/import').send({ entries });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields)).toEqual(['entries.2.titration.titrantId']);
    expect(await count()).toBe(0);
    // schema errors are named by position too, and an empty or oversized batch is refused
    const bad = await analyst.post('/api/v1/bench/entries/import').send({ entries: [entry(site.point.id, at), entry(site.point.id, at, { sampleVolumeMl: -5 })] });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).some((k) => k.startsWith('entries.1.titration.sampleVolumeMl'))).toBe(true);
    expect((await analyst.post('/api/v1/bench/entries/import').send({ entries: [] })).status).toBe(400);
    expect((await analyst.post('/api/v1/bench/entries/import').send({ entries: Array.from({ length: 501 }, () => entry(site.point.id, at)) })).status).toBe(400);
    expect(await count()).toBe(0);
  });

  it('keeps an operator to their own utility’s points', async () => {
    const brindlemoor = await as(app, demo.operatorBrindlemoor);
    const kf = await kestrelEffluent(app);
    const at = localTime(kf.zone, 1, '10:00').toISOString();
    const res = await brindlemoor.post('/api/v1/bench/entries/import').send({ entries: [entry(kf.point.id, at)] });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('entries.0.sample.pointId');
  });
});
