import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEvent } from '../../server/db/models/index.js';
import { as, demo } from '../fixtures/auth.js';
import { makeFacility, makePoint, orgId } from '../fixtures/sites.js';
import { apiTestApp } from '../setup/db.js';

const { app, sequelize } = apiTestApp();
afterAll(() => sequelize.close());

let facility: { id: number; organizationId: number };
let point: { id: number };
beforeAll(async () => {
  const kestrel = await orgId(app, 'Kestrel Ford Sanitary District');
  facility = await makeFacility(app, { organizationId: kestrel, timezone: 'America/Denver' });
  point = await makePoint(app, facility.id, { matrix: 'effluent' });
});

const permitBody = () => ({
  facilityId: facility.id,
  number: `CO-00${Math.floor(Math.random() * 1e6)}`,
  issuingAuthority: 'State Water Quality Division (invented)',
  effectiveFrom: '2026-01-01',
  expiresOn: '2030-12-31',
  regulatorContacts: [{ name: 'Permit Desk', email: 'permits@regulator.example' }],
  followUpText: 'Resample within 24 hours and report the cause in writing.',
  followUpDeadlineValue: 5,
  followUpDeadlineUnit: 'days',
});

describe('permits and limits', () => {
  it('lets the compliance officer create a permit with limits, each audited', async () => {
    const co = await as(app, demo.compliance);
    const created = await co.post('/api/v1/permits', permitBody());
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    expect(created.body.regulatorContacts).toHaveLength(1);

    const min = await co.post(`/api/v1/permits/${created.body.id}/limits`, {
      pointId: point.id, parameter: 'total_alkalinity', statistic: 'monthly_average', bound: 'minimum', value: 60, units: 'mg/L as CaCO3', significantFigures: 2, effectiveFrom: '2026-01-01',
    });
    expect(min.status, JSON.stringify(min.body)).toBe(201);
    // DECIMAL kept exact (a string), never a float
    expect(min.body.value).toBe('60.0000');
    const phLow = await co.post(`/api/v1/permits/${created.body.id}/limits`, {
      pointId: point.id, parameter: 'ph', statistic: 'instantaneous', bound: 'minimum', value: '6.0', units: 'S.U.', decimals: 1, effectiveFrom: '2026-01-01',
    });
    expect(phLow.status).toBe(201);

    const full = await co.get(`/api/v1/permits/${created.body.id}`);
    expect(full.body.limits.map((l: { parameter: string }) => l.parameter).sort()).toEqual(['ph', 'total_alkalinity']);
    const events = await AuditEvent.findAll({ where: { entity: ['permit', 'permit_limit'] } });
    expect(events.map((e) => e.action)).toEqual(expect.arrayContaining(['permit.created', 'limit.created']));
  });

  it.each([
    // 40 CFR 133.102 and common practice: pH is not averaged arithmetically
    ['a monthly-average pH limit', { parameter: 'ph', statistic: 'monthly_average', bound: 'minimum', value: '6.0', units: 'S.U.', decimals: 1 }, 'statistic'],
    ['pH in mg/L', { parameter: 'ph', statistic: 'instantaneous', bound: 'minimum', value: '6.0', units: 'mg/L as CaCO3', decimals: 1 }, 'units'],
    ['no precision', { parameter: 'total_alkalinity', statistic: 'daily', bound: 'minimum', value: '50', units: 'mg/L as CaCO3' }, 'significantFigures'],
    ['a value that is not a number', { parameter: 'total_alkalinity', statistic: 'daily', bound: 'minimum', value: 'fifty', units: 'mg/L as CaCO3', significantFigures: 2 }, 'value'],
    ['an unknown statistic', { parameter: 'total_alkalinity', statistic: 'yearly', bound: 'minimum', value: '50', units: 'mg/L as CaCO3', significantFigures: 2 }, 'statistic'],
  ])('refuses %s with 400 naming the field, saving nothing', async (_n, body, field) => {
    const co = await as(app, demo.compliance);
    const permit = await co.post('/api/v1/permits', permitBody());
    const res = await co.post(`/api/v1/permits/${permit.body.id}/limits`, { pointId: point.id, effectiveFrom: '2026-01-01', ...body });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty(field);
    expect((await co.get(`/api/v1/permits/${permit.body.id}/limits`)).body.total).toBe(0);
  });

  it('refuses a limit on another facility’s point', async () => {
    const co = await as(app, demo.compliance);
    const permit = await co.post('/api/v1/permits', permitBody());
    const other = await makeFacility(app, { organizationId: facility.organizationId });
    const otherPoint = await makePoint(app, other.id);
    const res = await co.post(`/api/v1/permits/${permit.body.id}/limits`, { pointId: otherPoint.id, parameter: 'total_alkalinity', statistic: 'daily', bound: 'minimum', value: '50', units: 'mg/L as CaCO3', significantFigures: 2, effectiveFrom: '2026-01-01' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('pointId');
  });

  it('refuses a permit without a regulator contact, and one that expires before it starts', async () => {
    const co = await as(app, demo.compliance);
    const none = await co.post('/api/v1/permits', { ...permitBody(), regulatorContacts: [] });
    expect(none.status).toBe(400);
    expect(none.body.error.fields).toHaveProperty('regulatorContacts');
    const backwards = await co.post('/api/v1/permits', { ...permitBody(), expiresOn: '2025-01-01' });
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.fields).toHaveProperty('expiresOn');
  });

  it('hides a utility’s permits from another utility (404) and keeps operators read-only', async () => {
    const co = await as(app, demo.compliance);
    const permit = await co.post('/api/v1/permits', permitBody());
    const other = await as(app, demo.operatorBrindlemoor);
    expect((await other.get(`/api/v1/permits/${permit.body.id}`)).status).toBe(404);
    expect((await other.get('/api/v1/permits?pageSize=200')).body.items.some((p: { id: number }) => p.id === permit.body.id)).toBe(false);
    const op = await as(app, demo.operator);
    expect((await op.get(`/api/v1/permits/${permit.body.id}`)).status).toBe(200);
    expect((await op.patch(`/api/v1/permits/${permit.body.id}`, { number: 'X' })).status).toBe(403);
  });
});
