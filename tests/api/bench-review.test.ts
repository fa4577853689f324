import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { historyComparison } from '../../shared/chemistry/bench.js';
import { as, demo } from '../fixtures/auth.js';
import { localTime, makeAcidLot, makeResult, makeSite } from '../fixtures/bench.js';
import { apiTestApp } from '../setup/db.js';

const { app, sequelize } = apiTestApp();
afterAll(() => sequelize.close());

let site: Awaited<ReturnType<typeof makeSite>>;
let acid: { id: number };

beforeAll(async () => {
  site = await makeSite(app);
  acid = await makeAcidLot(app);
});

async function submitted(daysAgo: number, titreMl: number, hhmm = '10:00', at = site) {
  const { titration } = await makeResult(app, demo.analyst, { pointId: at.point.id, titrantId: acid.id, analysedAt: localTime(site.zone, daysAgo, hhmm), titreMl });
  const res = await (await as(app, demo.analyst)).post(`/api/v1/titrations/${titration.id}/submit`, {});
  expect(res.status).toBe(200);
  return res.body as { id: number; version: number };
}

describe('bulk approve (POST /review/approve)', () => {
  it('approves all listed results, or none when one is stale or not submitted', async () => {
    const analyst = await as(app, demo.analyst);
    const a = await submitted(20, 7);
    const b = await submitted(20, 7.1, '11:00');
    const c = await submitted(20, 7.2, '12:00');
    const stale = await analyst.post('/api/v1/review/approve', { items: [{ id: a.id, version: a.version }, { id: b.id, version: b.version + 1 }] });
    expect(stale.status).toBe(409);
    expect(stale.body.error.fields).toHaveProperty(['items.1.version']);
    expect((await analyst.get(`/api/v1/titrations/${a.id}`)).body.status).toBe('submitted');
    const missing = await analyst.post('/api/v1/review/approve', { items: [{ id: a.id }, { id: 999999 }] });
    expect(missing.status).toBe(400);
    expect(missing.body.error.fields['items.1.id']).toBe('not found');

    const ok = await analyst.post('/api/v1/review/approve', { items: [a, b, c].map((t) => ({ id: t.id, version: t.version })) });
    expect(ok.status).toBe(200);
    expect(ok.body.approved).toEqual([a.id, b.id, c.id]);
    expect(ok.body.items.every((t: { status: string; approvedBy: { name: string } }) => t.status === 'approved' && t.approvedBy.name === 'Tobiah Lark')).toBe(true);
    const again = await analyst.post('/api/v1/review/approve', { items: [{ id: a.id }] });
    expect(again.status).toBe(409);
    expect(again.body.error.fields['items.0.id']).toMatch(/approved, not submitted/);
  });

  it('refuses an empty list and a result listed twice', async () => {
    const analyst = await as(app, demo.analyst);
    expect((await analyst.post('/api/v1/review/approve', { items: [] })).body.error.fields).toHaveProperty('items');
    expect((await analyst.post('/api/v1/review/approve', { items: [{ id: 1 }, { id: 1 }] })).status).toBe(400);
  });
});

describe('the review queue and its "unusual" flag (beyond 3 SD of the point’s last 30 approved values; SM 1020 B ±3s from memory)', () => {
  it('flags a transcription error and not an ordinary value, with the previous values for context', async () => {
    const analyst = await as(app, demo.analyst);
    const own = await makeSite(app);
    // setup: twelve approved days around 70 mg/L (titres 6.8–7.2 mL of 0.0200 N on 100 mL)
    const titres = [7.0, 6.9, 7.1, 7.2, 6.8, 7.0, 7.05, 6.95, 7.1, 6.9, 7.0, 7.15];
    const history: number[] = [];
    for (const [i, titre] of titres.entries()) {
      const t = await submitted(16 - i, titre, '10:00', own);
      history.push(titre * 10);
      expect((await analyst.post(`/api/v1/titrations/${t.id}/approve`, {})).status).toBe(200);
    }
    // action: an ordinary result and one with its digits swapped (12.1 for 7.12 mL)
    const ordinary = await submitted(2, 7.12, '10:00', own);
    const odd = await submitted(2, 12.1, '11:00', own);

    const queue = (await analyst.get(`/api/v1/review?pointId=${own.point.id}&pageSize=50`)).body;
    const byId = new Map(queue.items.map((i: { id: number }) => [i.id, i]));
    const item = (id: number) => byId.get(id) as { unusual: boolean; history: { n: number; mean: number; standardDeviation: number; previous: Array<{ value: number }>; value: number } };
    expect(item(odd.id).unusual).toBe(true);
    expect(item(ordinary.id).unusual).toBe(false);
    // the flag is the shared engine's comparison with those values
    const expected = historyComparison(121, history);
    expect(item(odd.id).history).toMatchObject({ n: 12, mean: expected.mean, standardDeviation: expected.standardDeviation, value: 121, zScore: expected.zScore });
    expect(item(odd.id).history.previous.map((p) => p.value)).toEqual(history.slice(-5).reverse());
    expect(queue.items.every((i: { status: string }) => i.status === 'submitted')).toBe(true);
    expect(queue.items[0]).toHaveProperty('sample.point.code', own.point.code);
  });

  it('scopes the queue to the analyst’s lab clients and shows demo results awaiting review', async () => {
    const analyst = await as(app, demo.analyst);
    const demoQueue = (await analyst.get('/api/v1/review?pageSize=100')).body;
    // The demo leaves the last two days awaiting review, six results a day (three at Kestrel Ford,
    // two at Brindlemoor, one at Quillon Bay); today's count only those analysed before the demo
    // was loaded, so yesterday's six are the floor whatever the hour.
    expect(demoQueue.total).toBeGreaterThanOrEqual(6);
    // the demo's transposed effluent figure from yesterday is flagged
    expect(demoQueue.items.some((i: { unusual: boolean; sample: { point: { code: string } } }) => i.unusual && i.sample.point.code === 'EFF-001')).toBe(true);
  });
});
