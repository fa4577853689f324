import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { calculateAcidity, calculateAlkalinity } from '../../shared/chemistry/service.js';
import { as, demo } from '../fixtures/auth.js';
import { kestrelEffluent, localTime, makeAcidLot, makeResult, makeSample, makeSite, makeTitration } from '../fixtures/bench.js';
import { apiTestApp } from '../setup/db.js';

const { app, sequelize } = apiTestApp();
afterAll(() => sequelize.close());

let kf: Awaited<ReturnType<typeof kestrelEffluent>>;
let acid: { id: number };

beforeAll(async () => {
  kf = await kestrelEffluent(app);
  acid = await makeAcidLot(app);
});

/** The engine output as the record keeps it: without the per-reading derivative. */
const asStored = (r: ReturnType<typeof calculateAlkalinity>) => (r.curve ? { ...r, curve: (({ derivative: _d, ...c }) => c)(r.curve) } : r);

describe('a day at the bench: operator logs, analyst reviews (product.md workflow)', () => {
  it('runs draft → submitted → returned → submitted → approved with the role and scope rules at each step', async () => {
    const op = await as(app, demo.operator);
    const other = await as(app, demo.operatorBrindlemoor);
    const analyst = await as(app, demo.analyst);
    const analysedAt = localTime(kf.zone, 2, '10:00');

    // setup: the operator logs a composite effluent sample and its titration
    const sample = await makeSample(app, demo.operator, {
      pointId: kf.point.id,
      sampleType: 'composite',
      compositeStartAt: analysedAt.subtract(27, 'hour').toISOString(),
      compositeEndAt: analysedAt.subtract(3, 'hour').toISOString(),
      collectedAt: analysedAt.subtract(3, 'hour').toISOString(),
      receivedAt: analysedAt.subtract(2, 'hour').toISOString(),
      receiptTemperatureC: 4.2,
      preservation: 'Refrigerated sampler',
    });
    expect(sample).toMatchObject({ status: 'received', point: { code: 'EFF-001' }, sampleType: 'composite', receiptTemperatureC: 4.2 });
    const draft = await makeTitration(app, demo.operator, sample.id, { titrantId: acid.id, volumeToPh83Ml: 0, volumeToTotalEndpointMl: 7.15, totalEndpointPh: 4.5, initialPh: 7.12, temperatureC: 19, analysedAt: analysedAt.toISOString() });
    expect(draft).toMatchObject({ status: 'draft', revision: 1, normalitySource: 'standardization', normalityUsed: 0.02, caco3FactorUsed: 50000, qualifiers: [] });

    // assert: the stored result is the shared engine's for the same inputs (SM 2320 B: 7.15 × 0.0200 × 50,000 / 100 = 71.5)
    const engine = calculateAlkalinity({ sampleVolumeMl: 100, titrantNormality: 0.02, volumeToPh83Ml: 0, volumeToTotalEndpointMl: 7.15, totalEndpointPh: 4.5, initialPh: 7.12, temperatureC: 19, caco3Factor: 50000 });
    expect(draft.results.engine).toEqual(asStored(engine));
    expect(draft.results.totalAlkalinity).toBe(engine.totalAlkalinity);
    expect(draft.results.totalAlkalinity).toBe(71.5);
    expect(draft.results.exact.totalAlkalinity).toBe('71.50000000');
    expect(draft.results.species).toEqual({ hydroxide: 0, carbonate: 0, bicarbonate: 71.5 });

    // another utility's operator sees nothing of it (404) and cannot touch it
    expect((await other.get(`/api/v1/samples/${sample.id}`)).status).toBe(404);
    expect((await other.get(`/api/v1/titrations/${draft.id}`)).status).toBe(404);
    expect((await other.patch(`/api/v1/titrations/${draft.id}`, { version: draft.version, notes: 'x' })).status).toBe(404);
    expect((await other.post(`/api/v1/titrations/${draft.id}/submit`, {})).status).toBe(404);
    expect((await other.post(`/api/v1/samples/${sample.id}/titrations`, { analysis: 'alkalinity', method: 'color_indicator', sampleVolumeMl: 100, titrantId: acid.id })).status).toBe(404);
    expect((await other.get(`/api/v1/titrations/${draft.id}/audit`)).status).toBe(404);
    const theirs = (await other.get('/api/v1/samples?pageSize=200')).body;
    expect(theirs.items.some((s: { id: number }) => s.id === sample.id)).toBe(false);

    // an operator can never approve
    const submitted = (await op.post(`/api/v1/titrations/${draft.id}/submit`, { version: draft.version })).body;
    expect(submitted.status).toBe('submitted');
    expect((await op.post(`/api/v1/titrations/${draft.id}/approve`, {})).status).toBe(403);
    expect((await op.post('/api/v1/review/approve', { items: [{ id: draft.id }] })).status).toBe(403);
    expect((await op.get('/api/v1/review')).status).toBe(403);

    // the analyst returns it with a comment; a return needs one
    expect((await analyst.post(`/api/v1/titrations/${draft.id}/return`, {})).body.error.fields).toHaveProperty('comment');
    const returned = (await analyst.post(`/api/v1/titrations/${draft.id}/return`, { comment: 'Check the burette reading against the bench sheet.' })).body;
    expect(returned).toMatchObject({ status: 'returned', returnComment: 'Check the burette reading against the bench sheet.', returnedBy: { name: 'Tobiah Lark' } });
    expect((await analyst.get(`/api/v1/samples/${sample.id}`)).body.status).toBe('in_progress');

    // the operator corrects it; a stale version is refused with 409 and changes nothing
    const edited = await op.patch(`/api/v1/titrations/${draft.id}`, { version: returned.version, volumeToTotalEndpointMl: 7.25 });
    expect(edited.status).toBe(200);
    expect(edited.body.results.totalAlkalinity).toBe(72.5);
    const stale = await op.patch(`/api/v1/titrations/${draft.id}`, { version: returned.version, volumeToTotalEndpointMl: 9.99 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.fields.version).toMatch(/stale/);
    expect((await op.get(`/api/v1/titrations/${draft.id}`)).body.volumeToTotalEndpointMl).toBe(7.25);

    const again = (await op.post(`/api/v1/titrations/${draft.id}/submit`, { version: edited.body.version })).body;
    expect(again.status).toBe('submitted');
    expect((await op.get(`/api/v1/samples/${sample.id}`)).body.status).toBe('submitted');
    const approved = await analyst.post(`/api/v1/titrations/${draft.id}/approve`, { version: again.version });
    expect(approved.status).toBe(200);
    expect(approved.body).toMatchObject({ status: 'approved', approvedBy: { name: 'Tobiah Lark' } });
    expect((await op.get(`/api/v1/samples/${sample.id}`)).body).toMatchObject({ status: 'approved', titrations: [{ id: draft.id, status: 'approved', totalAlkalinity: 72.5 }] });

    // approved results are never edited in place
    const late = await op.patch(`/api/v1/titrations/${draft.id}`, { version: approved.body.version, notes: 'late change' });
    expect(late.status).toBe(409);
    expect(late.body.error.message).toMatch(/amend/);
    expect((await analyst.post(`/api/v1/titrations/${draft.id}/approve`, {})).status).toBe(409);
    // nor is the sample, beyond its notes
    const s = (await op.get(`/api/v1/samples/${sample.id}`)).body;
    expect((await op.patch(`/api/v1/samples/${sample.id}`, { version: s.version, receiptTemperatureC: 3 })).status).toBe(409);
    expect((await op.patch(`/api/v1/samples/${sample.id}`, { version: s.version, notes: 'Foam on the weir.' })).body.notes).toBe('Foam on the weir.');
  });

  it('amends an approved result as a new version: both stay, and the trail shows who, when and why', async () => {
    const analyst = await as(app, demo.analyst);
    const op = await as(app, demo.operator);
    const { titration } = await makeResult(app, demo.operator, { pointId: kf.point.id, titrantId: acid.id, analysedAt: localTime(kf.zone, 3, '09:30'), titreMl: 1.75 });
    const sub = (await op.post(`/api/v1/titrations/${titration.id}/submit`, {})).body;
    const approved = (await analyst.post(`/api/v1/titrations/${titration.id}/approve`, { version: sub.version })).body;
    expect(approved.results.totalAlkalinity).toBe(17.5);

    // an amendment needs a reason, and only an analyst or the lab administrator makes one
    expect((await analyst.post(`/api/v1/titrations/${titration.id}/amend`, { volumeToTotalEndpointMl: 7.15 })).body.error.fields).toHaveProperty('reason');
    expect((await op.post(`/api/v1/titrations/${titration.id}/amend`, { reason: 'x', volumeToTotalEndpointMl: 7.15 })).status).toBe(403);

    const reason = 'Transcription error: the burette read 7.15 mL, entered as 1.75 mL.';
    const amend = await analyst.post(`/api/v1/titrations/${titration.id}/amend`, { reason, volumeToTotalEndpointMl: 7.15 });
    expect(amend.status).toBe(201);
    expect(amend.body).toMatchObject({ status: 'draft', revision: 2, amendsId: titration.id, amendReason: reason });
    expect(amend.body.results.totalAlkalinity).toBe(71.5);
    // one amendment at a time; the original is still the record meanwhile
    expect((await analyst.post(`/api/v1/titrations/${titration.id}/amend`, { reason: 'again' })).status).toBe(409);
    expect((await analyst.get(`/api/v1/titrations/${titration.id}`)).body.status).toBe('approved');

    const s2 = (await analyst.post(`/api/v1/titrations/${amend.body.id}/submit`, {})).body;
    expect((await analyst.post(`/api/v1/titrations/${amend.body.id}/approve`, { version: s2.version })).status).toBe(200);

    const old = (await analyst.get(`/api/v1/titrations/${titration.id}`)).body;
    expect(old).toMatchObject({ status: 'superseded', supersededById: amend.body.id, volumeToTotalEndpointMl: 1.75 });
    expect(old.results.totalAlkalinity).toBe(17.5);
    expect(old.versions.map((v: { id: number; status: string }) => [v.id, v.status])).toEqual([
      [titration.id, 'superseded'],
      [amend.body.id, 'approved'],
    ]);
    const both = (await op.get(`/api/v1/samples/${titration.sampleId}/titrations`)).body;
    expect(both.total).toBe(2);
    // the sample's current result is the amendment
    expect((await op.get(`/api/v1/samples/${titration.sampleId}`)).body.titrations.map((t: { id: number }) => t.id)).toEqual([amend.body.id]);

    const trail = (await op.get(`/api/v1/titrations/${amend.body.id}/audit?pageSize=50`)).body.items;
    const actions = trail.map((e: { action: string }) => e.action);
    expect(actions).toEqual(['titration.created', 'titration.submitted', 'titration.approved', 'titration.amendment_created', 'titration.amended', 'titration.submitted', 'titration.approved', 'titration.superseded']);
    const amended = trail.find((e: { action: string }) => e.action === 'titration.amendment_created');
    expect(amended).toMatchObject({ actor: { email: demo.analyst }, reason, titrationId: amend.body.id });
    expect(Date.parse(amended.createdAt)).toBeGreaterThan(Date.now() - 60_000);
    expect(trail.find((e: { action: string }) => e.action === 'titration.superseded')).toMatchObject({ reason, before: { status: 'approved' }, after: { status: 'superseded' } });
    expect(trail.find((e: { action: string }) => e.action === 'titration.created').actor.email).toBe(demo.operator);
  });

  it('keeps a draft incomplete until it can be computed, and refuses to submit it before', async () => {
    const op = await as(app, demo.operator);
    const sample = await makeSample(app, demo.operator, { pointId: kf.point.id, collectedAt: localTime(kf.zone, 1, '08:00').toISOString() });
    const draft = await makeTitration(app, demo.operator, sample.id, { titrantId: acid.id, analysedAt: localTime(kf.zone, 1, '09:00').toISOString() });
    expect(draft).toMatchObject({ results: null, missingInputs: ['volumeToPh83Ml', 'volumeToTotalEndpointMl'] });
    const res = await op.post(`/api/v1/titrations/${draft.id}/submit`, {});
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['volumeToPh83Ml', 'volumeToTotalEndpointMl']);
  });

  it('records acidity with the peroxide correction as the engine computes it (SM 2310 B; domain.md 4b)', async () => {
    const base = await makeAcidLot(app, { kind: 'base' });
    const sample = await makeSample(app, demo.operator, { pointId: kf.point.id, collectedAt: localTime(kf.zone, 1, '08:00').toISOString() });
    const t = await makeTitration(app, demo.operator, sample.id, {
      analysis: 'acidity',
      sampleVolumeMl: 50,
      titrantId: base.id,
      volumeToPh83Ml: 9.2,
      peroxideTreatment: { acidVolumeMl: 5, acidNormality: 0.02 },
      analysedAt: localTime(kf.zone, 1, '09:00').toISOString(),
    });
    const engine = calculateAcidity({ sampleVolumeMl: 50, titrantNormality: 0.02, volumeToPh83Ml: 9.2, peroxideTreatment: { acidVolumeMl: 5, acidNormality: 0.02 }, caco3Factor: 50000 });
    expect(t.results.engine).toEqual(engine);
    expect(t.results.totalAcidity).toBe(84);
  });
});

describe('bad input answers 400 with field reasons, never 500', () => {
  it('names unknown, missing and inapplicable fields, cross-field times and the wrong titrant', async () => {
    const analyst = await as(app, demo.analyst);
    const site = await makeSite(app);
    const empty = await analyst.post('/api/v1/samples', {});
    expect(empty.status).toBe(400);
    expect(Object.keys(empty.body.error.fields).sort()).toEqual(['collectedAt', 'pointId', 'sampleType']);
    const times = await analyst.post('/api/v1/samples', { pointId: site.point.id, sampleType: 'composite', collectedAt: '2026-01-02T08:00:00Z', receivedAt: '2026-01-01T08:00:00Z', colour: 'brown' });
    expect(Object.keys(times.body.error.fields).sort()).toEqual(['colour', 'compositeEndAt', 'compositeStartAt', 'receivedAt']);
    const local = await analyst.post('/api/v1/samples', { pointId: site.point.id, sampleType: 'grab', collectedAt: '2026-01-02T08:00' });
    expect(local.body.error.fields.collectedAt).toMatch(/offset/);
    const future = await analyst.post('/api/v1/samples', { pointId: site.point.id, sampleType: 'grab', collectedAt: new Date(Date.now() + 86_400_000).toISOString() });
    expect(future.body.error.fields.collectedAt).toMatch(/future/);

    const sample = await makeSample(app, demo.analyst, { pointId: site.point.id, collectedAt: localTime(site.zone, 1, '08:00').toISOString() });
    const url = `/api/v1/samples/${sample.id}/titrations`;
    const base = { analysis: 'alkalinity', method: 'color_indicator', sampleVolumeMl: 100, titrantId: acid.id };
    const wrong = await analyst.post(url, { ...base, readings: [{ volumeMl: 0, pH: 7 }], volumeToPh37Ml: 1 });
    expect(wrong.status).toBe(400);
    expect(Object.keys(wrong.body.error.fields).sort()).toEqual(['readings', 'volumeToPh37Ml']);
    expect((await analyst.post(url, { ...base, volumeToPh83Ml: 5, volumeToTotalEndpointMl: 4 })).body.error.fields).toHaveProperty('volumeToPh83Ml');
    expect((await analyst.post(url, { ...base, volumeToPh83Ml: 0, volumeToTotalEndpointMl: 7.123456 })).body.error.fields.volumeToTotalEndpointMl).toMatch(/decimal/);
    expect((await analyst.post(url, { ...base, analysedAt: localTime(site.zone, 1, '07:00').toISOString() })).body.error.fields.analysedAt).toMatch(/before/);
    const naoh = await makeAcidLot(app, { kind: 'base' });
    expect((await analyst.post(url, { ...base, titrantId: naoh.id })).body.error.fields.titrantId).toMatch(/acid/);
    expect((await analyst.post(url, { ...base, analysis: 'acidity', method: 'low_alkalinity_two_point', titrantId: naoh.id })).body.error.fields).toHaveProperty('method');
    expect((await analyst.post(url, { ...base, titrantId: 999999 })).body.error.fields.titrantId).toBe('not found');
    expect((await analyst.get('/api/v1/samples?from=yesterday')).body.error.fields).toHaveProperty('from');
    expect((await analyst.get('/api/v1/samples?status=lost')).body.error.fields).toHaveProperty('status');
  });
});

describe('the Bench list', () => {
  it('pages and filters by facility, point, local dates and status', async () => {
    const analyst = await as(app, demo.analyst);
    const site = await makeSite(app);
    for (const daysAgo of [3, 2, 1]) await makeSample(app, demo.analyst, { pointId: site.point.id, collectedAt: localTime(site.zone, daysAgo, '23:30').toISOString() });
    const day2 = localTime(site.zone, 2, '00:00').format('YYYY-MM-DD');
    const one = (await analyst.get(`/api/v1/samples?facilityId=${site.facility.id}&from=${day2}&to=${day2}`)).body;
    // 23:30 in Chicago is the next day in UTC: the facility's own calendar decides
    expect(one.total).toBe(1);
    expect(one.items[0].collectedAt).toBe(localTime(site.zone, 2, '23:30').toISOString());
    const page = (await analyst.get(`/api/v1/samples?pointId=${site.point.id}&pageSize=2&sort=collectedAt`)).body;
    expect(page.total).toBe(3);
    expect(page.items).toHaveLength(2);
    expect(Date.parse(page.items[0].collectedAt)).toBeLessThan(Date.parse(page.items[1].collectedAt));
    expect((await analyst.get(`/api/v1/samples?pointId=${site.point.id}&status=approved`)).body.total).toBe(0);
    expect((await analyst.get(`/api/v1/samples?pointId=${site.point.id}&status=received`)).body.total).toBe(3);
    // the demo's three months are there for the demo operator
    const op = await as(app, demo.operator);
    const demoList = (await op.get(`/api/v1/samples?pointId=${kf.point.id}&status=approved&pageSize=5`)).body;
    expect(demoList.total).toBeGreaterThan(80);
    expect(demoList.items[0].titrations[0].totalAlkalinity).toBeGreaterThan(0);
  });
});
