import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { as, demo } from '../fixtures/auth.js';
import { apiTestApp } from '../setup/db.js';

const { app, sequelize } = apiTestApp();
afterAll(() => sequelize.close());
let op: Awaited<ReturnType<typeof as>>;
beforeAll(async () => {
  op = await as(app, demo.operator);
});

/** The synthetic titration of a 125.0 mg/L water in 100 mL with 0.0200 N acid (computed from the closed-system carbonate model). */
const SYNTHETIC: Array<[number, number]> = [
  [0, 9.2], [0.25, 9.05], [0.5, 8.85], [0.75, 8.52], [1, 8.1], [1.25, 7.78], [1.5, 7.58], [1.75, 7.43], [2, 7.31], [3, 7.0], [4, 6.79],
  [5, 6.61], [6, 6.45], [7, 6.3], [8, 6.15], [9, 5.99], [10, 5.79], [10.25, 5.73], [10.5, 5.67], [10.75, 5.6], [11, 5.53], [11.25, 5.44],
  [11.5, 5.34], [11.75, 5.21], [12, 5.05], [12.25, 4.82], [12.5, 4.52], [12.75, 4.22], [13, 4.01], [13.25, 3.86], [13.5, 3.74], [13.75, 3.65],
  [14, 3.57], [14.5, 3.45], [15, 3.36], [15.5, 3.28], [16, 3.22], [16.5, 3.16], [17, 3.11],
];
const readings = SYNTHETIC.map(([volumeMl, pH]) => ({ volumeMl, pH }));

describe('POST /api/v1/calc/alkalinity', () => {
  it('computes P and T from endpoint volumes (SM 2320 B: A × N × 50,000 / V)', async () => {
    // SM 2320 B ¶5: 12.40 mL × 0.0200 N × 50,000 / 100.0 mL = 124.0 mg/L; 2.10 mL → 21.0 mg/L
    const res = await op.post('/api/v1/calc/alkalinity', { sampleVolumeMl: 100, titrantNormality: 0.02, volumeToPh83Ml: 2.1, volumeToTotalEndpointMl: 12.4 });
    expect(res.status).toBe(200);
    expect(res.body.totalAlkalinity).toBeCloseTo(124.0, 6);
    expect(res.body.phenolphthaleinAlkalinity).toBeCloseTo(21.0, 6);
    // 124.0 / 50.04 = 2.478 meq/L would use the exact factor; the titration's own meq/L is A × N × 1000 / V = 2.48
    expect(res.body.totalAlkalinityMeqL).toBeCloseTo(2.48, 6);
    // SM 2320 B Table 2320:II, P < T/2: CO3 = 2P = 42.0, HCO3 = T − 2P = 82.0
    expect(res.body.species).toMatchObject({ hydroxide: 0, carbonate: 42, bicarbonate: 82 });
    expect(res.body.caco3Factor).toBe(50000);
  });

  it('finds endpoints on a recorded curve by interpolation (SM 2320 B; fixed pH 8.3 and 4.5)', async () => {
    const res = await op.post('/api/v1/calc/alkalinity', { sampleVolumeMl: 100, titrantNormality: 0.02, readings });
    expect(res.status).toBe(200);
    // 0.75 + (8.52 − 8.3)/(8.52 − 8.10) × 0.25 = 0.8810 mL → 8.81 mg/L; 12.50 + 0.02/0.30 × 0.25 = 12.5167 mL → 125.2 mg/L
    expect(res.body.endpoints.phenolphthalein.volumeMl).toBeCloseTo(0.881, 3);
    expect(res.body.phenolphthaleinAlkalinity).toBeCloseTo(8.81, 2);
    expect(res.body.totalAlkalinity).toBeCloseTo(125.17, 2);
    expect(res.body.curve.derivative.length).toBe(readings.length - 1);
    // USGS NFM A6.6.4.B inflection: tie at 12.375 and 12.625 mL → 12.500 mL
    expect(res.body.curve.inflection.bicarbonate.volumeMl).toBeCloseTo(12.5, 6);
  });

  it.each([
    ['an empty body', {}, ['sampleVolumeMl', 'titrantNormality']],
    ['a negative volume', { sampleVolumeMl: 100, titrantNormality: 0.02, volumeToPh83Ml: -1, volumeToTotalEndpointMl: 12 }, ['volumeToPh83Ml']],
    ['a non-numeric normality', { sampleVolumeMl: 100, titrantNormality: 'strong', volumeToTotalEndpointMl: 12 }, ['titrantNormality']],
    ['a negative normality', { sampleVolumeMl: 100, titrantNormality: -0.02, volumeToTotalEndpointMl: 12 }, ['titrantNormality']],
    ['a pH outside 0–14', { sampleVolumeMl: 100, titrantNormality: 0.02, volumeToTotalEndpointMl: 12, totalEndpointPh: 15 }, ['totalEndpointPh']],
    ['a P volume above the T volume', { sampleVolumeMl: 100, titrantNormality: 0.02, volumeToPh83Ml: 13, volumeToTotalEndpointMl: 12 }, ['volumeToPh83Ml']],
    ['readings whose volumes go backwards', { sampleVolumeMl: 100, titrantNormality: 0.02, readings: [{ volumeMl: 0, pH: 8 }, { volumeMl: 2, pH: 6 }, { volumeMl: 1, pH: 4 }] }, ['readings.2.volumeMl']],
    ['a reading pH outside 0–14', { sampleVolumeMl: 100, titrantNormality: 0.02, readings: [{ volumeMl: 0, pH: 8 }, { volumeMl: 2, pH: -1 }] }, ['readings.1.pH']],
    ['a curve that never reaches the endpoint', { sampleVolumeMl: 100, titrantNormality: 0.02, readings: [{ volumeMl: 0, pH: 8 }, { volumeMl: 2, pH: 6.5 }, { volumeMl: 4, pH: 5.9 }] }, ['readings']],
  ])('answers %s with 400 naming the field', async (_name, body, fields) => {
    const res = await op.post('/api/v1/calc/alkalinity', body);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    for (const f of fields) expect(Object.keys(res.body.error.fields)).toContain(f);
  });

  it('warns (and still answers) for a total endpoint outside the recommended range and a tiny titrant volume', async () => {
    // SM 2320 B Table 2320:I lists 4.3–4.9; 4.0 is outside. 0.3 mL of titrant is too little to read to 1 % on a 0.02 mL burette (common practice)
    const res = await op.post('/api/v1/calc/alkalinity', { sampleVolumeMl: 100, titrantNormality: 0.02, volumeToPh83Ml: 0, volumeToTotalEndpointMl: 0.3, totalEndpointPh: 4.0 });
    expect(res.status).toBe(200);
    const codes = res.body.warnings.map((w: { code: string }) => w.code);
    expect(codes).toContain('endpoint_ph_not_recommended');
    expect(codes.some((c: string) => /volume/.test(c))).toBe(true);
  });

  it('needs a signed-in user', async () => {
    const res = await request(app).post('/api/v1/calc/alkalinity').send({ sampleVolumeMl: 100, titrantNormality: 0.02, volumeToTotalEndpointMl: 12 });
    expect(res.status).toBe(401);
  });
});

describe('POST /api/v1/calc/acidity', () => {
  it.each([
    // SM 2310 B ¶5: [(A × B) − (C × D)] × 50,000 / V
    ['no pretreatment: 5.60 mL of 0.0200 N in 100 mL', { sampleVolumeMl: 100, titrantNormality: 0.02, volumeToPh83Ml: 5.6 }, 56.0, false],
    ['peroxide pretreatment: 9.20 mL NaOH, 5.00 mL 0.0200 N H2SO4, 50 mL', { sampleVolumeMl: 50, titrantNormality: 0.02, volumeToPh83Ml: 9.2, peroxideTreatment: { acidVolumeMl: 5, acidNormality: 0.02 } }, 84.0, false],
    ['net alkaline: 3.00 mL NaOH after the same pretreatment', { sampleVolumeMl: 50, titrantNormality: 0.02, volumeToPh83Ml: 3.0, peroxideTreatment: { acidVolumeMl: 5, acidNormality: 0.02 } }, -40.0, true],
  ])('%s', async (_n, body, total, netAlkaline) => {
    const res = await op.post('/api/v1/calc/acidity', body);
    expect(res.status).toBe(200);
    expect(res.body.totalAcidity).toBeCloseTo(total, 6);
    expect(res.body.netAlkaline).toBe(netAlkaline);
    if (netAlkaline) expect(res.body.warnings.map((w: { code: string }) => w.code)).toContain('net_alkaline');
  });

  it('answers a pH 3.7 volume above the pH 8.3 volume with 400', async () => {
    const res = await op.post('/api/v1/calc/acidity', { sampleVolumeMl: 100, titrantNormality: 0.02, volumeToPh37Ml: 6, volumeToPh83Ml: 5 });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('volumeToPh37Ml');
  });
});

describe('POST /api/v1/calc/speciation', () => {
  it('splits 150 mg/L at pH 8.50, 25 °C, TDS 300 (USGS NFM 6.6.5.B method with Plummer–Busenberg constants and Davies)', async () => {
    const res = await op.post('/api/v1/calc/speciation', { pH: 8.5, temperatureC: 25, totalAlkalinity: 150, tdsMgL: 300 });
    expect(res.status).toBe(200);
    // computed from the NFM 6.6.5.B equations: HCO3 144.2, CO3 5.62, OH 0.175 mg/L as CaCO3
    const s = res.body.equilibrium;
    expect(s.bicarbonate).toBeCloseTo(144.2, 1);
    expect(s.carbonate).toBeCloseTo(5.62, 2);
    expect(s.hydroxide).toBeCloseTo(0.175, 3);
  });

  it('answers a missing pH with 400', async () => {
    const res = await op.post('/api/v1/calc/speciation', { totalAlkalinity: 150 });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('pH');
  });
});

describe('POST /api/v1/calc/curve', () => {
  it('models a carbonate water whose equivalence points fall near pH 8.3 and 4.5', async () => {
    const res = await op.post('/api/v1/calc/curve', { sampleVolumeMl: 100, titrantNormality: 0.02, initialPh: 9.2, totalAlkalinity: 125, temperatureC: 25, endpointPh: [8.3, 4.5] });
    expect(res.status).toBe(200);
    const names = Object.fromEntries(res.body.equivalencePoints.map((p: { name: string; pH: number; volumeMl: number }) => [p.name, p]));
    // stoichiometry: V_eq = Alk × V0 / N = 2.5 meq/L × 100 mL / 0.02 N = 12.5 mL
    const total = Object.values(names).find((p) => (p as { volumeMl: number }).volumeMl > 10) as { pH: number; volumeMl: number };
    expect(total.volumeMl).toBeCloseTo(12.5, 3);
    expect(total.pH).toBeGreaterThan(4.3);
    expect(total.pH).toBeLessThan(4.7);
    expect(res.body.endpointErrors).toHaveLength(2);
  });

  it('answers a carbonate curve without initialPh with 400 naming it', async () => {
    const res = await op.post('/api/v1/calc/curve', { sampleVolumeMl: 100, titrantNormality: 0.02, totalAlkalinity: 125 });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('initialPh');
  });
});

describe('POST /api/v1/calc/lsi', () => {
  it('computes pHs, LSI and RSI (Roberge 2008 approximation): pH 7.80, 25 °C, TDS 500, Ca 200, alk 150', async () => {
    const res = await op.post('/api/v1/calc/lsi', { pH: 7.8, temperatureC: 25, tdsMgL: 500, calciumHardness: 200, totalAlkalinity: 150 });
    expect(res.status).toBe(200);
    const a = res.body.approximate;
    // A 0.16990, B 2.08828, C 1.90103, D 2.17609 → pHs 7.481, LSI +0.32, RSI 7.16 (computed from Roberge eqs 8.26–8.31)
    expect(a.pHs).toBeCloseTo(7.481, 3);
    expect(a.langelierIndex).toBeCloseTo(0.32, 2);
    expect(a.ryznarIndex).toBeCloseTo(7.16, 2);
    // SM 2330 B exact form, same water (I = 0.0125, A = 0.5108): pHs 7.323, LSI +0.48 (computed from the formula)
    expect(res.body.exact.pHs).toBeCloseTo(7.323, 3);
    expect(res.body.exact.langelierIndex).toBeCloseTo(0.48, 2);
  });

  it('answers a missing calcium hardness with 400', async () => {
    const res = await op.post('/api/v1/calc/lsi', { pH: 7.8, tdsMgL: 500, totalAlkalinity: 150 });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('calciumHardness');
  });
});

describe('GET /api/v1/openapi.json', () => {
  it('describes the calculation routes with their request schemas', async () => {
    const res = await request(app).get('/api/v1/openapi.json');
    expect(res.status).toBe(200);
    expect(res.body.openapi).toMatch(/^3\./);
    for (const p of ['/calc/alkalinity', '/calc/acidity', '/calc/speciation', '/calc/curve', '/calc/lsi']) {
      expect(res.body.paths[p].post.requestBody.content['application/json'].schema.properties).toBeDefined();
    }
    expect(res.body.paths['/calc/alkalinity'].post.requestBody.content['application/json'].schema.properties).toHaveProperty('readings');
  });
});
