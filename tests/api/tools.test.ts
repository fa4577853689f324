import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { as, demo } from '../fixtures/auth.js';
import { localTime, makeAcidLot, makeResult, makeSite } from '../fixtures/bench.js';
import { apiTestApp } from '../setup/db.js';

const { app, sequelize } = apiTestApp();
afterAll(() => sequelize.close());
let op: Awaited<ReturnType<typeof as>>;
let billing: Awaited<ReturnType<typeof as>>;
beforeAll(async () => {
  op = await as(app, demo.operator);
  billing = await as(app, demo.billing);
});

/** 400 with the error envelope, naming every field listed. */
function expectFields(res: request.Response, fields: string[]) {
  expect(res.status).toBe(400);
  expect(res.body.error.code).toBe('validation_failed');
  for (const f of fields) expect(Object.keys(res.body.error.fields)).toContain(f);
}

describe('POST /api/v1/calc/ccpp', () => {
  it('8g: pH 7.80, 25 °C, TDS 500, Ca 200, alk 150 → 13.5 mg/L as CaCO3 would precipitate, final pH 7.39 (domain.md 8g, computed from the 8.3 bisection)', async () => {
    // setup / action
    const res = await op.post('/api/v1/calc/ccpp', { pH: 7.8, temperatureC: 25, tdsMgL: 500, calciumHardness: 200, totalAlkalinity: 150 });
    // assert
    expect(res.status).toBe(200);
    expect(res.body.ccpp).toBeCloseTo(13.5, 1);
    expect(res.body.final.pH).toBeCloseTo(7.39, 2);
    expect(res.body.band.key).toBe('precipitates');
    expect(res.body.ionicStrength).toBeCloseTo(0.0125, 6);
    expect(res.body.initial.saturationIndex).toBeCloseTo(0.477, 3);
  });

  it('accepts the temperature in °F (77 °F = 25 °C)', async () => {
    const res = await op.post('/api/v1/calc/ccpp', { pH: 7.8, temperatureF: 77, tdsMgL: 500, calciumHardness: 200, totalAlkalinity: 150 });
    expect(res.status).toBe(200);
    expect(res.body.temperatureC).toBeCloseTo(25, 6);
    expect(res.body.ccpp).toBeCloseTo(13.5, 1);
  });

  it.each([
    ['an empty body', {}, ['pH', 'tdsMgL', 'calciumHardness', 'totalAlkalinity']],
    ['a pH outside 0–14', { pH: 15, tdsMgL: 500, calciumHardness: 200, totalAlkalinity: 150 }, ['pH']],
    ['both temperature units', { pH: 7.8, temperatureC: 25, temperatureF: 77, tdsMgL: 500, calciumHardness: 200, totalAlkalinity: 150 }, ['temperatureF']],
    ['an unknown field', { pH: 7.8, tdsMgL: 500, calciumHardness: 200, totalAlkalinity: 150, hardness: 1 }, ['hardness']],
  ])('answers %s with 400 naming the field', async (_n, body, fields) => {
    expectFields(await op.post('/api/v1/calc/ccpp', body), fields);
  });
});

describe('POST /api/v1/calc/toc-removal', () => {
  it('8c: source 5.2, treated 3.1, alkalinity 85 → 35.0 % required, 40.38 % achieved, ratio 1.154 (40 CFR 141.135(b)(2), (c))', async () => {
    const res = await op.post('/api/v1/calc/toc-removal', { sourceTocMgL: 5.2, sourceAlkalinity: 85, treatedTocMgL: 3.1 });
    expect(res.status).toBe(200);
    expect(res.body.requiredRemovalPercent).toBe(35);
    expect(res.body.row.key).toBe('toc_4_to_8');
    expect(res.body.column.key).toBe('alk_60_to_120');
    expect(res.body.achievedRemovalPercent).toBeCloseTo(40.38, 2);
    expect(res.body.removalRatio).toBeCloseTo(1.154, 3);
    expect(res.body.meetsStep1).toBe(true);
  });

  it('boundaries: alkalinity 60.0 is in the 0–60 column, TOC 2.0 has no requirement (40 CFR 141.135(b)(2))', async () => {
    const a = await op.post('/api/v1/calc/toc-removal', { sourceTocMgL: 4.0, sourceAlkalinity: 60.0 });
    expect(a.body.column.key).toBe('alk_0_to_60');
    expect(a.body.requiredRemovalPercent).toBe(35);
    const b = await op.post('/api/v1/calc/toc-removal', { sourceTocMgL: 2.0, sourceAlkalinity: 60.0 });
    expect(b.body.requiredRemovalPercent).toBeNull();
    expect(b.body.step1Applies).toBe(false);
  });

  it.each([
    ['an empty body', {}, ['sourceTocMgL', 'sourceAlkalinity']],
    ['a negative TOC', { sourceTocMgL: -1, sourceAlkalinity: 85 }, ['sourceTocMgL']],
    ['a non-boolean softening flag', { sourceTocMgL: 5, sourceAlkalinity: 85, softening: 'yes' }, ['softening']],
    ['a removal from a source TOC of 0', { sourceTocMgL: 0, sourceAlkalinity: 85, treatedTocMgL: 0 }, ['sourceTocMgL']],
  ])('answers %s with 400 naming the field', async (_n, body, fields) => {
    expectFields(await op.post('/api/v1/calc/toc-removal', body), fields);
  });
});

describe('POST /api/v1/calc/nitrification', () => {
  it('8h: influent 220, 30 NH4-N nitrified, 18 NO3-N denitrified → residual 70.1 mg/L (EPA 1993 factors, from memory; domain.md 8h)', async () => {
    const res = await op.post('/api/v1/calc/nitrification', { influentAlkalinity: 220, nitrifiedNh4NMgL: 30, denitrifiedNo3NMgL: 18 });
    expect(res.status).toBe(200);
    expect(res.body.residual).toBeCloseTo(70.06, 6);
    expect(res.body.targetResidual).toBe(50);
    expect(res.body.meetsTarget).toBe(true);
    expect(res.body.makeUp).toBeNull();
  });

  it('a shortfall gets a make-up dose and daily loads at a flow in m³/d', async () => {
    const res = await op.post('/api/v1/calc/nitrification', {
      influentAlkalinity: 180,
      nitrifiedNh4NMgL: 25,
      targetResidualAlkalinity: 60,
      chemical: 'sodium_bicarbonate',
      flowM3PerDay: 10_000,
    });
    expect(res.status).toBe(200);
    // 180 − 7.14 × 25 = 1.5 mg/L; shortfall 58.5; NaHCO3 58.5 × 84.01/50.04 (domain.md 8.5)
    expect(res.body.residual).toBeCloseTo(1.5, 6);
    expect(res.body.shortfall).toBeCloseTo(58.5, 6);
    expect(res.body.makeUp.dose.pureMgL).toBeCloseTo((58.5 * 84.01) / 50.04, 3);
    // 58.5 g/m³ × 10,000 m³/d = 585 kg/d of alkalinity as CaCO3
    expect(res.body.loads.shortfall.kgPerDay).toBeCloseTo(585, 3);
  });

  it.each([
    ['an empty body', {}, ['influentAlkalinity', 'nitrifiedNh4NMgL']],
    ['an unknown chemical', { influentAlkalinity: 220, nitrifiedNh4NMgL: 30, chemical: 'potash' }, ['chemical']],
    ['a flow in both units', { influentAlkalinity: 220, nitrifiedNh4NMgL: 30, flowMgd: 1, flowM3PerDay: 3785 }, ['flowM3PerDay']],
  ])('answers %s with 400 naming the field', async (_n, body, fields) => {
    expectFields(await op.post('/api/v1/calc/nitrification', body), fields);
  });
});

describe('POST /api/v1/calc/alkalinity-dose', () => {
  it('8j: +30 mg/L at 2.0 MGD with 50 % NaOH → 400 lb/d of 100 % = 800 lb/d of 50 % (domain.md 8j)', async () => {
    const res = await op.post('/api/v1/calc/alkalinity-dose', { chemical: 'caustic_soda', alkalinityIncrease: 30, purityPercent: 50, flowMgd: 2 });
    expect(res.status).toBe(200);
    expect(res.body.dose.pureMgL).toBeCloseTo(23.98, 2);
    expect(res.body.feed.pure.lbPerDay).toBeCloseTo(400, 0);
    expect(res.body.feed.product.lbPerDay).toBeCloseTo(800, 0);
    expect(res.body.flow.m3PerDay).toBeCloseTo(7570.82, 2);
    expect(res.body.cautions.join(' ')).toMatch(/licensed practice govern/);
  });

  it.each([
    ['an empty body', {}, ['chemical', 'alkalinityIncrease']],
    ['a target below the current alkalinity', { chemical: 'lime', currentAlkalinity: 80, targetAlkalinity: 60 }, ['targetAlkalinity']],
    ['only a current alkalinity', { chemical: 'lime', currentAlkalinity: 80 }, ['targetAlkalinity']],
    ['a zero purity', { chemical: 'lime', alkalinityIncrease: 10, purityPercent: 0 }, ['purityPercent']],
  ])('answers %s with 400 naming the field', async (_n, body, fields) => {
    expectFields(await op.post('/api/v1/calc/alkalinity-dose', body), fields);
  });
});

describe('POST /api/v1/calc/digester', () => {
  it('8i: VA 900 / alkalinity 2400 = 0.375, act (common practice; domain.md 8i)', async () => {
    const res = await op.post('/api/v1/calc/digester', { volatileAcidsMgL: 900, alkalinity: 2400 });
    expect(res.status).toBe(200);
    expect(res.body.ratio).toBeCloseTo(0.375, 9);
    expect(res.body.band.key).toBe('act');
    expect(res.body.alkalinityForTarget).toBe(3600);
  });

  it.each([
    ['an empty body', {}, ['volatileAcidsMgL', 'alkalinity']],
    ['a zero alkalinity', { volatileAcidsMgL: 200, alkalinity: 0 }, ['alkalinity']],
    ['previous ratios that are not numbers', { volatileAcidsMgL: 200, alkalinity: 2000, previousRatios: ['high'] }, ['previousRatios.0']],
  ])('answers %s with 400 naming the field', async (_n, body, fields) => {
    expectFields(await op.post('/api/v1/calc/digester', body), fields);
  });
});

describe('POST /api/v1/calc/endpoint-error', () => {
  it('a 70 mg/L water with its equivalence near pH 4.6: the pH 4.5 endpoint reads high by about 0.065 mL, 0.65 mg/L (charge-balance model)', async () => {
    const res = await op.post('/api/v1/calc/endpoint-error', { sampleVolumeMl: 100, titrantNormality: 0.02, totalAlkalinity: 70, initialPh: 7.5, temperatureC: 25 });
    expect(res.status).toBe(200);
    const total = res.body.endpoints.find((e: { kind: string }) => e.kind === 'total');
    expect(total.equivalencePh).toBeCloseTo(4.61, 2);
    expect(total.errorMl).toBeGreaterThan(0.06);
    expect(total.errorMl).toBeLessThan(0.07);
    expect(total.errorMgL).toBeCloseTo(total.errorMl * 0.02 * 50_000 / 100, 4);
    expect(total.steep).toBe(true);
    expect(res.body.recommendedTotalEndpointPh).toBe(4.7);
    expect(res.body.indicators).toHaveLength(3);
    expect(res.body.curve.points.length).toBeGreaterThan(100);
  });

  it('warns when the chosen endpoint is off the steep part (pH 5.5 for a 125 mg/L water)', async () => {
    const res = await op.post('/api/v1/calc/endpoint-error', { sampleVolumeMl: 100, titrantNormality: 0.02, totalAlkalinity: 125, initialPh: 9.2, totalEndpointPh: 5.5 });
    expect(res.status).toBe(200);
    expect(res.body.warnings.map((w: { code: string }) => w.code)).toContain('endpoint_outside_steep_part');
  });

  it.each([
    ['an empty body', {}, ['sampleVolumeMl', 'titrantNormality', 'totalAlkalinity', 'initialPh']],
    ['a negative normality', { sampleVolumeMl: 100, titrantNormality: -0.02, totalAlkalinity: 70, initialPh: 7.5 }, ['titrantNormality']],
    ['a total endpoint the sample starts below', { sampleVolumeMl: 100, titrantNormality: 0.02, totalAlkalinity: 70, initialPh: 4.2 }, ['totalEndpointPh']],
    ['an unsupported CaCO3 factor', { sampleVolumeMl: 100, titrantNormality: 0.02, totalAlkalinity: 70, initialPh: 7.5, caco3Factor: 50 }, ['caco3Factor']],
  ])('answers %s with 400 naming the field', async (_n, body, fields) => {
    expectFields(await op.post('/api/v1/calc/endpoint-error', body), fields);
  });
});

describe('access and documentation', () => {
  it.each(['/calc/ccpp', '/calc/toc-removal', '/calc/nitrification', '/calc/alkalinity-dose', '/calc/digester', '/calc/endpoint-error'])(
    '%s needs a signed-in user and is open to every role (calc.use)',
    async (path) => {
      expect((await request(app).post(`/api/v1${path}`).send({})).status).toBe(401);
      // billing holds calc.use like every role; an empty body is a 400, not a 403.
      expect((await billing.post(`/api/v1${path}`, {})).status).toBe(400);
    },
  );

  it('describes the tools routes in the OpenAPI document with their request schemas', async () => {
    const res = await request(app).get('/api/v1/openapi.json');
    for (const p of ['/calc/ccpp', '/calc/toc-removal', '/calc/nitrification', '/calc/alkalinity-dose', '/calc/digester', '/calc/endpoint-error']) {
      expect(res.body.paths[p].post.requestBody.content['application/json'].schema.properties).toBeDefined();
      expect(res.body.paths[p].post['x-titrata-access']).toBe('calc.use');
    }
  });
});

describe('GET /api/v1/tools/inputs: a point’s latest approved figures for the Tools pages', () => {
  it('takes each figure from the newest approved result that records it, skipping drafts, and names the result', async () => {
    const analyst = await as(app, demo.analyst);
    const acid = await makeAcidLot(app);
    const site = await makeSite(app);
    // setup: an older approved result with pH, temperature and TDS; a newer approved one with T only; a newest draft
    const older = await makeResult(app, demo.analyst, { pointId: site.point.id, titrantId: acid.id, analysedAt: localTime(site.zone, 3, '09:00'), titreMl: 6.0, titration: { initialPh: 7.4, temperatureC: 18.5, tdsMgL: 320 } });
    const newer = await makeResult(app, demo.analyst, { pointId: site.point.id, titrantId: acid.id, analysedAt: localTime(site.zone, 2, '09:00'), titreMl: 7.25, titration: { volumeToPh83Ml: 0.4, sampleVolumeMl: 50 } });
    await makeResult(app, demo.analyst, { pointId: site.point.id, titrantId: acid.id, analysedAt: localTime(site.zone, 1, '09:00'), titreMl: 9.9, titration: { initialPh: 8.9 } });
    for (const r of [older, newer]) {
      const t = (await analyst.post(`/api/v1/titrations/${r.titration.id}/submit`).send({ version: r.titration.version })).body;
      expect((await analyst.post(`/api/v1/titrations/${r.titration.id}/approve`).send({ version: t.version })).status).toBe(200);
    }

    // action
    const res = await analyst.get(`/api/v1/tools/inputs?pointId=${site.point.id}`);

    // assert: SM 2320 B with the fixture's 0.02000 N — 7.25 × 0.02 × 50,000 / 50 = 145; P = 0.4 × 0.02 × 50,000 / 50 = 8 (computed here)
    expect(res.status).toBe(200);
    expect(res.body.point).toMatchObject({ id: site.point.id, facility: { id: site.facility.id } });
    expect(res.body.values.totalAlkalinity).toMatchObject({ value: 145, titrationId: newer.titration.id, sampleId: newer.sample.id });
    expect(res.body.values.phenolphthaleinAlkalinity.value).toBe(8);
    expect(res.body.values).toMatchObject({ sampleVolumeMl: { value: 50 }, titrantNormality: { value: 0.02 }, volumeToTotalEndpointMl: { value: 7.25 } });
    // pH, temperature and TDS come from the older approved result; the draft's pH 8.9 is not used
    expect(res.body.values.pH).toMatchObject({ value: 7.4, titrationId: older.titration.id });
    expect(res.body.values.temperatureC.value).toBe(18.5);
    expect(res.body.values.tdsMgL.value).toBe(320);
    expect(res.body.values).not.toHaveProperty('volatileAcidsMgL');
    expect(res.body.searched).toBe(2);
  });

  it('answers an empty set for a point with no approved results, 400 without a point, and keeps scope', async () => {
    const analyst = await as(app, demo.analyst);
    const site = await makeSite(app);
    const empty = await analyst.get(`/api/v1/tools/inputs?pointId=${site.point.id}`);
    expect(empty.status).toBe(200);
    expect(empty.body).toMatchObject({ values: {}, searched: 0 });
    expectFields(await analyst.get('/api/v1/tools/inputs'), ['pointId']);
    expectFields(await analyst.get('/api/v1/tools/inputs?pointId=abc'), ['pointId']);
    // the Kestrel Ford operator cannot read another utility's point; billing may not read results at all
    const other = await op.get(`/api/v1/tools/inputs?pointId=${site.point.id}`);
    expect(other.status).toBe(400);
    expect(other.body.error.fields).toEqual({ pointId: 'not found' });
    expect((await billing.get(`/api/v1/tools/inputs?pointId=${site.point.id}`)).status).toBe(403);
  });
});

describe('GET /api/v1/tools/inputs: the digester trend', () => {
  it('lists the VA/alkalinity ratios of the earlier approved results, oldest first, before the latest', async () => {
    const analyst = await as(app, demo.analyst);
    const acid = await makeAcidLot(app);
    const site = await makeSite(app);
    // setup: titres 50, 40, 25 mL on 50 mL at 0.02 N → 1000, 800, 500 mg/L as CaCO3 (SM 2320 B, computed here)
    // with VA 100, 200, 150 mg/L → ratios 0.1, 0.25, 0.3 oldest to newest (Gerardi's VA/alkalinity, computed here)
    for (const [days, titre, va] of [[4, 50, 100], [3, 40, 200], [2, 25, 150]] as const) {
      const r = await makeResult(app, demo.analyst, { pointId: site.point.id, titrantId: acid.id, analysedAt: localTime(site.zone, days, '09:00'), titreMl: titre, titration: { sampleVolumeMl: 50, volatileAcidsMgL: va } });
      const t = (await analyst.post(`/api/v1/titrations/${r.titration.id}/submit`).send({ version: r.titration.version })).body;
      expect((await analyst.post(`/api/v1/titrations/${r.titration.id}/approve`).send({ version: t.version })).status).toBe(200);
    }
    const res = await analyst.get(`/api/v1/tools/inputs?pointId=${site.point.id}`);
    expect(res.body.values.volatileAcidsMgL.value).toBe(150);
    expect(res.body.values.totalAlkalinity.value).toBe(500);
    expect(res.body.previousVolatileAcidsRatios).toEqual([0.1, 0.25]);
  });
});
