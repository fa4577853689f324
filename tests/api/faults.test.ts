import dayjs from 'dayjs';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startInstance, stopInstance } from '../../server/bin/mariadb.js';
import { Sample } from '../../server/db/models/index.js';
import { as, demo, tokenFor } from '../fixtures/auth.js';
import { makeAcidLot, makeResult, makeSite } from '../fixtures/bench.js';
import { apiTestApp } from '../setup/db.js';
import { testDbDir, testDbPort } from '../setup/env.js';

/**
 * Faults (also `npm run test:faults`): MariaDB stopped under a stream of writes, and two
 * analysts approving the same result at once. The API layer runs its files one at a time, so
 * stopping the shared test instance here disturbs no other file.
 */
const { app, sequelize } = apiTestApp();
afterAll(() => sequelize.close());
let site: Awaited<ReturnType<typeof makeSite>>;
let writerToken: string;

beforeAll(async () => {
  site = await makeSite(app);
  writerToken = await tokenFor(app, demo.analyst);
});

const write = (i: number, notes = `fault stream ${i}`) =>
  request(app)
    .post('/api/v1/samples')
    .set('Authorization', `Bearer ${writerToken}`)
    .send({ sampleType: 'grab', pointId: site.point.id, collectedAt: dayjs().subtract(1, 'hour').toISOString(), notes });

describe('MariaDB stopped during a stream of writes', () => {
  it.skipIf(!!process.env.TEST_DB_HOST)('answers 503 while down, recovers by itself, and keeps every write it acknowledged', async () => {
    const acknowledged: number[] = [];
    const statuses: number[] = [];
    let i = 0;
    let running = true;
    // a client writing continuously, four requests in flight at a time
    const stream = (async () => {
      while (running) {
        const batch = await Promise.all([0, 1, 2, 3].map(() => write(i++)));
        for (const r of batch) {
          statuses.push(r.status);
          if (r.status === 201) acknowledged.push(Number(r.body.id));
          else expect(r.status, JSON.stringify(r.body)).toBe(503);
        }
      }
    })();
    await new Promise((r) => setTimeout(r, 700));
    const beforeStop = acknowledged.length;
    await stopInstance({ dir: testDbDir, port: testDbPort });
    await new Promise((r) => setTimeout(r, 1500));
    const whileDown = statuses.length;
    await startInstance({ dir: testDbDir, port: testDbPort });
    // wait until writes succeed again on the same app (no restart)
    const t0 = Date.now();
    while (acknowledged.length <= beforeStop + 8 && Date.now() - t0 < 20000) await new Promise((r) => setTimeout(r, 200));
    running = false;
    await stream;

    expect(beforeStop).toBeGreaterThan(0);
    expect(statuses).toContain(503);
    expect(statuses.slice(whileDown).filter((s) => s === 201).length).toBeGreaterThan(0);
    // every 201 is in the database, once
    const rows = await Sample.findAll({ where: { id: acknowledged }, attributes: ['id', 'notes'] });
    expect(rows.length).toBe(new Set(acknowledged).size);
    expect(rows.every((r) => String(r.notes).startsWith('fault stream'))).toBe(true);
    const health = await request(app).get('/api/v1/health');
    expect(health.status).toBe(200);
  }, 60000);
});

describe('concurrent entries', () => {
  it('saves twenty entries sent at once to the same points without a deadlock reaching the client', async () => {
    const lot = await makeAcidLot(app);
    const at = dayjs().subtract(2, 'hour').toISOString();
    const analyst = await as(app, demo.analyst);
    const body = () => ({
      sample: { pointId: site.point.id, sampleType: 'grab', collectedAt: at, receivedAt: at, receiptTemperatureC: 4 },
      titration: { analysis: 'alkalinity', method: 'color_indicator', sampleVolumeMl: 100, titrantId: lot.id, volumeToPh83Ml: 0, volumeToTotalEndpointMl: 6, totalEndpointPh: 4.5, analysedAt: at },
    });
    const results = await Promise.all(Array.from({ length: 20 }, () => analyst.post('/api/v1/bench/entries').send(body())));
    expect(results.map((r) => r.status)).toEqual(Array(20).fill(201));
  });
});

describe('concurrent approvals of one result', () => {
  it('lets one approval win and answers the other 409', async () => {
    const lot = await makeAcidLot(app);
    const { titration } = await makeResult(app, demo.analyst, { pointId: site.point.id, titrantId: lot.id, analysedAt: dayjs().subtract(30, 'minute'), titreMl: 5 });
    const analyst = await as(app, demo.analyst);
    const sub = await analyst.post(`/api/v1/titrations/${titration.id}/submit`, { version: titration.version });
    expect(sub.status).toBe(200);
    const admin = await as(app, demo.admin);
    const [a, b] = await Promise.all([
      analyst.post(`/api/v1/titrations/${titration.id}/approve`, { version: sub.body.version }),
      admin.post(`/api/v1/titrations/${titration.id}/approve`, { version: sub.body.version }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const after = await analyst.get(`/api/v1/titrations/${titration.id}`);
    expect(after.body.status).toBe('approved');
    expect(after.body.version).toBe(sub.body.version + 1);
  });
});

describe('a connection lost under the batch insert', () => {
  it('answers 503, not 500, and leaves nothing of the write', async () => {
    // New rows' audit events go in on the transaction's own connection, outside Sequelize, so
    // the connector's errors reach the handler unwrapped. A trigger holds that insert while this
    // test kills its connection (as a server shutting down or a dropped socket would).
    const marker = `kill-under-insert-${Date.now()}`;
    await sequelize.query('DROP TRIGGER IF EXISTS audit_hold_for_fault_test');
    await sequelize.query(`CREATE TRIGGER audit_hold_for_fault_test BEFORE INSERT ON audit_events FOR EACH ROW BEGIN IF NEW.\`after\` LIKE '%${marker}%' THEN DO SLEEP(10); END IF; END`);
    try {
      const pending = write(0, marker).then((r) => r); // sent now (supertest sends on then)
      // the held INSERT, found in the process list and killed
      let killed = false;
      for (let k = 0; k < 160 && !killed; k++) {
        await new Promise((r) => setTimeout(r, 50));
        // the held statement shows as the trigger's sleep, on a connection executing a prepared statement
        const rows = await sequelize.query<{ id: number }>("SELECT ID AS id FROM information_schema.PROCESSLIST WHERE COMMAND = 'Execute' AND INFO = 'DO SLEEP(10)' AND ID <> CONNECTION_ID()", { type: QueryTypes.SELECT });
        for (const r of rows) {
          await sequelize.query(`KILL CONNECTION ${Number(r.id)}`);
          killed = true;
        }
      }
      expect(killed).toBe(true);
      const res = await pending;
      expect(res.status, JSON.stringify(res.body)).toBe(503);
      expect(res.body.error.code).toBe('service_unavailable');
      // nothing half-saved: the sample went with its transaction
      expect(await Sample.count({ where: { notes: marker } })).toBe(0);
      // and the app goes on (the pool drops the dead connection)
      expect((await write(0)).status).toBe(201);
    } finally {
      await sequelize.query('DROP TRIGGER IF EXISTS audit_hold_for_fault_test');
    }
  }, 30000);
});
