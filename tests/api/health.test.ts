import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { startInstance, stopInstance } from '../../server/bin/mariadb.js';
import { apiTestApp } from '../setup/db.js';
import { testDbDir, testDbPort } from '../setup/env.js';

const { app, sequelize } = apiTestApp();
afterAll(() => sequelize.close());

describe('GET /api/v1/health', () => {
  it('reports the database up', async () => {
    const res = await request(app).get('/api/v1/health');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ status: 'ok', db: 'up' });
  });

  it.skipIf(!!process.env.TEST_DB_HOST)('answers 503 while MariaDB is stopped and recovers when it is back', async () => {
    // setup: stop the test instance (the whole API layer shares it; this file runs alone)
    await stopInstance({ dir: testDbDir, port: testDbPort });
    try {
      // action + assert: down
      const down = await request(app).get('/api/v1/health');
      expect(down.status).toBe(503);
      expect(down.body).toEqual({ status: 'degraded', db: 'down' });
    } finally {
      await startInstance({ dir: testDbDir, port: testDbPort });
    }
    // assert: the same app recovers by itself, no restart
    let up = await request(app).get('/api/v1/health');
    for (let i = 0; i < 20 && up.status !== 200; i++) {
      await new Promise((r) => setTimeout(r, 250));
      up = await request(app).get('/api/v1/health');
    }
    expect(up.status).toBe(200);
    expect(up.body.db).toBe('up');
  });
});

describe('error contract', () => {
  it('answers an unknown API route 404 in the error shape', async () => {
    const res = await request(app).get('/api/v1/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body).toEqual({ error: { code: 'not_found', message: expect.stringContaining('/api/v1/no-such-thing') } });
  });

  it('answers malformed JSON 400 in the error shape, without internals', async () => {
    const res = await request(app).post('/api/v1/health').set('Content-Type', 'application/json').send('{"a":');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(JSON.stringify(res.body)).not.toMatch(/at .*\.ts|stack/i);
  });

  it('sets a content-security policy that allows only our own scripts and fonts', async () => {
    const res = await request(app).get('/api/v1/health');
    const csp = res.headers['content-security-policy'];
    expect(csp).toContain("script-src 'self'");
    expect(csp).toContain("font-src 'self'");
    expect(res.headers['x-powered-by']).toBeUndefined();
  });
});
