import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { routeTable } from '../../server/routes/registry.js';
import { apiTestApp } from '../setup/db.js';

const { app, sequelize } = apiTestApp();
afterAll(() => sequelize.close());

// The Bench routes of issue 5: every one must be described, not only listed.
const BENCH = /^\/(samples|titrations|titrants|calibrations|qc-batches|review|bench|lab-settings)\b/;

describe('GET /api/v1/openapi.json: the bench routes', () => {
  it('describes every bench route with a summary, a description, its access rule and its parameters', async () => {
    const doc = (await request(app).get('/api/v1/openapi.json')).body;
    const bench = [...routeTable.values()].filter((r) => BENCH.test(r.path));
    expect(bench.length).toBeGreaterThanOrEqual(30);
    for (const r of bench) {
      const path = r.path.replace(/:(\w+)/g, '{$1}');
      const op = doc.paths[path]?.[r.method];
      expect(op, `${r.method} ${path}`).toBeDefined();
      expect(op.summary, `${r.method} ${path}`).not.toBe(`${r.method.toUpperCase()} ${r.path}`);
      expect(op.description, `${r.method} ${path}`).toBeTruthy();
      expect(op['x-titrata-access']).toBe(r.rule);
      for (const m of r.path.matchAll(/:(\w+)/g)) expect(op.parameters).toContainEqual(expect.objectContaining({ name: m[1], in: 'path', required: true }));
    }
  });

  it('gives the request bodies from the shared schemas, 201 for creates and 409 for stale writes', async () => {
    const paths = (await request(app).get('/api/v1/openapi.json')).body.paths;
    const body = (p: string, m: string) => paths[p][m].requestBody.content['application/json'].schema;
    expect(body('/samples', 'post').properties).toHaveProperty('collectedAt');
    expect(body('/samples/{id}/titrations', 'post').properties).toHaveProperty('volumeToTotalEndpointMl');
    expect(body('/bench/entries', 'post').properties).toHaveProperty('titration');
    expect(body('/titrants/{id}/standardizations', 'post').properties).toHaveProperty('replicates');
    expect(body('/calibrations', 'post').properties).toHaveProperty('buffers');
    expect(body('/qc-batches', 'post').properties).toHaveProperty('duplicates');
    expect(body('/review/approve', 'post').properties).toHaveProperty('items');
    const upload = paths['/titrations/{id}/readings'].post.requestBody.content;
    expect(upload['multipart/form-data'].schema.properties.file).toMatchObject({ type: 'string', format: 'binary' });
    expect(upload['application/json'].schema.properties).toHaveProperty('readings');
    expect(paths['/samples'].post.responses).toHaveProperty('201');
    expect(paths['/titrations/{id}'].patch.responses).toHaveProperty('409');
    expect(paths['/titrants'].post.responses).toHaveProperty('409');
    expect(paths['/samples'].get.parameters.map((p: { name: string }) => p.name)).toEqual(expect.arrayContaining(['page', 'pageSize', 'sort', 'facilityId', 'from', 'to']));
  });
});
