import { afterAll, beforeAll, describe, expect, it } from 'vitest';
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
