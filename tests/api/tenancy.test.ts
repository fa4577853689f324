import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../../server/db/models/index.js';
import { as, demo } from '../fixtures/auth.js';
import { orgId } from '../fixtures/sites.js';
import { apiTestApp } from '../setup/db.js';

const { app, sequelize } = apiTestApp();
afterAll(() => sequelize.close());

let kestrel: number;
let brindlemoor: number;
let kestrelFacility: { id: number };
let kestrelPoint: { id: number };
let kestrelUserId: number;

beforeAll(async () => {
  kestrel = await orgId(app, 'Kestrel Ford Sanitary District');
  brindlemoor = await orgId(app, 'Brindlemoor Water Authority');
  const admin = await as(app, demo.admin);
  kestrelFacility = (await admin.get(`/api/v1/facilities?organizationId=${kestrel}`)).body.items[0];
  kestrelPoint = (await admin.get(`/api/v1/facilities/${kestrelFacility.id}/points`)).body.items[0];
  kestrelUserId = (await admin.get(`/api/v1/users?q=operator@kestrelford`)).body.items[0].id;
});

describe('roles', () => {
  it('gives an operator 403 on user administration', async () => {
    const op = await as(app, demo.operator);
    expect((await op.get('/api/v1/users')).status).toBe(403);
    expect((await op.post('/api/v1/users', { email: 'x@y.example', name: 'X', role: 'operator', organizationId: kestrel })).status).toBe(403);
    expect((await op.post(`/api/v1/users/${kestrelUserId}/reset-password`)).status).toBe(403);
  });

  it('lets only the lab administrator create facilities', async () => {
    for (const who of [demo.analyst, demo.operator, demo.compliance, demo.billing]) {
      const u = await as(app, who);
      expect((await u.post('/api/v1/facilities', { organizationId: kestrel, name: 'Nope', kind: 'wastewater', timezone: 'UTC' })).status).toBe(403);
    }
  });
});

describe('tenancy', () => {
  it('hides another utility’s facility, point and user from an operator (404) and keeps them out of lists', async () => {
    const op = await as(app, demo.operatorBrindlemoor);
    expect((await op.get(`/api/v1/facilities/${kestrelFacility.id}`)).status).toBe(404);
    expect((await op.get(`/api/v1/facilities/${kestrelFacility.id}/points`)).status).toBe(404);
    expect((await op.get(`/api/v1/points/${kestrelPoint.id}`)).status).toBe(404);
    expect((await op.get(`/api/v1/organizations/${kestrel}`)).status).toBe(404);

    const facilities = (await op.get('/api/v1/facilities?pageSize=200')).body;
    expect(facilities.items.length).toBeGreaterThan(0);
    expect(facilities.items.every((f: { organizationId: number }) => f.organizationId === brindlemoor)).toBe(true);
    const orgs = (await op.get('/api/v1/organizations?pageSize=200')).body.items.map((o: { id: number }) => o.id);
    expect(orgs).toEqual([brindlemoor]);
    // even naming the other utility in a filter returns nothing of it
    expect((await op.get(`/api/v1/facilities?organizationId=${kestrel}`)).body).toEqual({ items: [], total: 0 });
  });

  it('refuses an analyst changing a point of a utility outside the lab (none exist) but allows its own clients', async () => {
    const analyst = await as(app, demo.analyst);
    const res = await analyst.patch(`/api/v1/points/${kestrelPoint.id}`, { name: 'Aeration basin 1 (north)' });
    expect(res.status).toBe(200);
    expect(res.body.name).toBe('Aeration basin 1 (north)');
  });

  it('hides another utility’s point from an operator when changing it (404, unchanged)', async () => {
    const op = await as(app, demo.operatorBrindlemoor);
    const before = (await (await as(app, demo.admin)).get(`/api/v1/points/${kestrelPoint.id}`)).body;
    expect((await op.patch(`/api/v1/points/${kestrelPoint.id}`, { name: 'hijacked' })).status).toBe(403);
    const after = (await (await as(app, demo.admin)).get(`/api/v1/points/${kestrelPoint.id}`)).body;
    expect(after.name).toBe(before.name);
  });

  it('lets the lab administrator see every client utility', async () => {
    const admin = await as(app, demo.admin);
    const names = (await admin.get('/api/v1/organizations?kind=utility&pageSize=200')).body.items.map((o: { name: string }) => o.name);
    expect(names).toEqual(expect.arrayContaining(['Brindlemoor Water Authority', 'Kestrel Ford Sanitary District', 'Quillon Bay Utilities']));
    const users = (await admin.get('/api/v1/users?pageSize=200')).body;
    expect(users.total).toBeGreaterThanOrEqual(7);
  });
});

describe('lists', () => {
  it('pages, sorts and filters on the server', async () => {
    const admin = await as(app, demo.admin);
    const page1 = (await admin.get('/api/v1/users?pageSize=2&page=1&sort=email')).body;
    const page2 = (await admin.get('/api/v1/users?pageSize=2&page=2&sort=email')).body;
    expect(page1.items).toHaveLength(2);
    expect(page1.total).toBe(page2.total);
    const emails = [...page1.items, ...page2.items].map((u: { email: string }) => u.email);
    expect([...emails].sort()).toEqual(emails);
    const desc = (await admin.get('/api/v1/users?pageSize=3&sort=-email')).body.items.map((u: { email: string }) => u.email);
    expect([...desc].sort().reverse()).toEqual(desc);
    const ops = (await admin.get('/api/v1/users?role=operator&pageSize=200')).body.items;
    expect(ops.every((u: { role: string }) => u.role === 'operator')).toBe(true);
  });

  it('answers a bad sort or page 400 naming the field', async () => {
    const admin = await as(app, demo.admin);
    const sort = await admin.get('/api/v1/users?sort=passwordHash');
    expect(sort.status).toBe(400);
    expect(sort.body.error.fields).toHaveProperty('sort');
    const inj = await admin.get(`/api/v1/facilities?sort=${encodeURIComponent("name; DROP TABLE users")}`);
    expect(inj.status).toBe(400);
    const page = await admin.get('/api/v1/facilities?page=0');
    expect(page.status).toBe(400);
    expect(page.body.error.fields).toHaveProperty('page');
  });

  it('treats SQL in a search filter as text', async () => {
    const admin = await as(app, demo.admin);
    const res = await admin.get(`/api/v1/facilities?q=${encodeURIComponent("' OR 1=1 -- ")}`);
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ items: [], total: 0 });
  });
});

describe('sites and audit', () => {
  it('creates, edits and deactivates a facility and point, each with an audit event holding before and after', async () => {
    const admin = await as(app, demo.admin);
    const f = await admin.post('/api/v1/facilities', { organizationId: kestrel, name: 'Kestrel Ford North Lagoon', kind: 'wastewater', timezone: 'America/Denver', address: '1 Lagoon Way' });
    expect(f.status).toBe(201);
    const p = await admin.post(`/api/v1/facilities/${f.body.id}/points`, { code: 'LAG-1', name: 'Lagoon outlet', matrix: 'effluent' });
    expect(p.status).toBe(201);
    expect((await admin.post(`/api/v1/facilities/${f.body.id}/points`, { code: 'LAG-1', name: 'Dup', matrix: 'effluent' })).status).toBe(409);
    const edit = await admin.patch(`/api/v1/points/${p.body.id}`, { name: 'Lagoon outlet weir' });
    expect(edit.status).toBe(200);
    const off = await admin.patch(`/api/v1/facilities/${f.body.id}`, { active: false });
    expect(off.body.active).toBe(false);

    const events = await AuditEvent.findAll({ where: { entityId: [String(f.body.id), String(p.body.id)] }, order: [['id', 'ASC']] });
    const byAction = Object.fromEntries(events.map((e) => [e.action, e]));
    expect(byAction['facility.created'].after).toMatchObject({ name: 'Kestrel Ford North Lagoon' });
    expect(byAction['point.updated'].before).toMatchObject({ name: 'Lagoon outlet' });
    expect(byAction['point.updated'].after).toMatchObject({ name: 'Lagoon outlet weir' });
    expect(byAction['facility.deactivated'].before).toMatchObject({ active: true });
    expect(byAction['facility.deactivated'].after).toMatchObject({ active: false });

    const log = (await admin.get(`/api/v1/audit-events?entity=monitoring_point&entityId=${p.body.id}`)).body;
    expect(log.items.map((e: { action: string }) => e.action)).toEqual(['point.updated', 'point.created']);
    expect(log.items[0].actor.email).toBe(demo.admin);
  });

  it('records who changed a user, with before and after but no password hash', async () => {
    const admin = await as(app, demo.admin);
    const res = await admin.patch(`/api/v1/users/${kestrelUserId}`, { name: 'Renata Quade-Ito' });
    expect(res.status).toBe(200);
    const e = await AuditEvent.findOne({ where: { entity: 'user', entityId: String(kestrelUserId), action: 'user.updated' }, order: [['id', 'DESC']] });
    expect(e!.before).toMatchObject({ name: 'Renata Quade' });
    expect(e!.after).toMatchObject({ name: 'Renata Quade-Ito' });
    expect(JSON.stringify(e!.after)).not.toMatch(/passwordHash|\$2[aby]\$/);
  });

  it('validates facility input with field reasons', async () => {
    const admin = await as(app, demo.admin);
    const res = await admin.post('/api/v1/facilities', { organizationId: kestrel, name: '', kind: 'brewery', timezone: 'Mars/Olympus' });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['kind', 'name', 'timezone']);
  });

  it('never lists another utility’s audit events to its compliance officer', async () => {
    const admin = await as(app, demo.admin);
    const foreign = await admin.post('/api/v1/facilities', { organizationId: brindlemoor, name: 'Brindlemoor Booster Station', kind: 'drinking_water', timezone: 'America/Chicago' });
    const co = await as(app, demo.compliance);
    const items = (await co.get('/api/v1/audit-events?pageSize=200')).body.items;
    expect(items.length).toBeGreaterThan(0);
    expect(items.every((e: { organizationId: number }) => e.organizationId === kestrel)).toBe(true);
    expect(items.some((e: { entity: string; entityId: string }) => e.entity === 'facility' && e.entityId === String(foreign.body.id))).toBe(false);
    const all = (await admin.get('/api/v1/audit-events?entity=facility&pageSize=200')).body.items;
    expect(all.some((e: { entityId: string }) => e.entityId === String(foreign.body.id))).toBe(true);
  });
});

void request;
