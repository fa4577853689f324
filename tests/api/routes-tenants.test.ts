import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CAPABILITIES, type Role } from '../../shared/roles.js';
import { routeTable, type RouteInfo } from '../../server/routes/registry.js';
import { Exceedance, Facility, Invoice, MonitoringPoint, Organization, Permit, PermitLimit, Report, Sample, Titration } from '../../server/db/models/index.js';
import { as, demo, tokenFor } from '../fixtures/auth.js';
import { apiTestApp } from '../setup/db.js';

/**
 * Route × role × tenant, generated from the router: every route with an `:id` of a record a
 * utility owns is called by each role of ANOTHER utility with a Kestrel Ford record's id. The
 * answer must be indistinguishable from a record that does not exist (same status and code as
 * id 999999), and the lab, which serves both, must see the record.
 */
const { app, sequelize } = apiTestApp();
afterAll(() => sequelize.close());

/** The first path segment → the id of a Kestrel Ford record of that kind (filled in beforeAll). */
const victim: Record<string, number> = {};
/** Resources with ids that belong to no utility: lab records, users, per-user jobs. */
const notUtilityOwned = new Set(['calibrations', 'qc-batches', 'titrants', 'users', 'public', 'price-items']);
const tokens: Partial<Record<Role, string>> = {};
let labTokens: Record<'lab_admin' | 'analyst', string>;

beforeAll(async () => {
  const kf = await Organization.findOne({ where: { name: 'Kestrel Ford Sanitary District' } });
  const bm = await Organization.findOne({ where: { name: 'Brindlemoor Water Authority' } });
  expect(kf && bm).toBeTruthy();
  // by name: other files add facilities to this utility
  const facility = (await Facility.findOne({ where: { organizationId: kf!.id, name: 'Kestrel Ford Water Reclamation Plant' } }))!;
  const point = (await MonitoringPoint.findOne({ where: { facilityId: facility.id } }))!;
  const permit = (await Permit.findOne({ where: { facilityId: facility.id } }))!;
  const limit = (await PermitLimit.findOne({ where: { permitId: permit.id } }))!;
  // a demo result (the seed's, so the first) and its sample
  const titration = (await Titration.findOne({ where: { organizationId: kf!.id }, order: [['id', 'ASC']] }))!;
  const sample = (await Sample.findByPk(titration.sampleId))!;
  const exceedance = (await Exceedance.findOne({ where: { facilityId: facility.id } }))!;
  const invoice = (await Invoice.findOne({ where: { organizationId: kf!.id, status: 'paid' } }))!;
  let report = await Report.findOne({ where: { facilityId: facility.id } });
  const kfOfficer = await as(app, demo.compliance);
  if (!report) report = (await kfOfficer.post('/api/v1/reports', { facilityId: facility.id, month: '2026-01' })).body;
  const alert = await kfOfficer.post('/api/v1/projection-alerts', { facilityId: facility.id });
  const batch = await kfOfficer.post('/api/v1/report-batches', { facilityIds: [facility.id], year: 2019 + 1 });
  Object.assign(victim, {
    organizations: kf!.id, facilities: facility.id, points: point.id, permits: permit.id, limits: limit.id, samples: sample.id, titrations: titration.id, exceedances: exceedance.id, reports: report!.id,
    invoices: invoice.id, 'projection-alerts': alert.body.id, 'report-batches': batch.body.id,
  });
  for (const v of Object.values(victim)) expect(Number(v)).toBeGreaterThan(0);

  // Brindlemoor's people in every utility role
  const admin = await as(app, demo.admin);
  tokens.operator = await tokenFor(app, demo.operatorBrindlemoor);
  for (const role of ['compliance_officer', 'billing'] as const) {
    const u = await admin.post('/api/v1/users', { email: `${role}-${Date.now()}@brindlemoor.example`, name: `Brindlemoor ${role}`, role, organizationId: bm!.id });
    expect(u.status, JSON.stringify(u.body)).toBe(201);
    tokens[role] = await tokenFor(app, u.body.user.email, u.body.temporaryPassword);
  }
  labTokens = { lab_admin: await tokenFor(app, demo.admin), analyst: await tokenFor(app, demo.analyst) };
});

const segment = (r: RouteInfo) => r.path.split('/')[1];
const withId = [...routeTable.values()].filter((r) => r.path.includes('/:id'));
const allowed = (r: RouteInfo, role: Role) => r.rule === 'signed_in' || (CAPABILITIES[r.rule as keyof typeof CAPABILITIES] as readonly Role[] | undefined)?.includes(role);

function call(r: RouteInfo, id: number | string, token: string) {
  const req = request(app)[r.method](`/api/v1${r.path.replace(':id', String(id))}`).set('Authorization', `Bearer ${token}`);
  return r.method === 'get' || r.method === 'delete' ? req : req.send({});
}

describe('route × role × tenant', () => {
  it('knows a utility-owned record for every resource with an id', () => {
    const unknown = [...new Set(withId.map(segment))].filter((s) => !notUtilityOwned.has(s) && !(s in victim));
    expect(unknown, 'add a foreign record for these resources').toEqual([]);
  });

  const cells = withId
    .filter((r) => !notUtilityOwned.has(segment(r)))
    .flatMap((r) => (['operator', 'compliance_officer', 'billing'] as const).filter((role) => allowed(r, role)).map((role) => [`${r.method.toUpperCase()} ${r.path} as another utility's ${role}`, r, role] as const));

  it.each(cells)('%s looks like a missing record', async (_n, r, role) => {
    const foreign = await call(r, victim[segment(r)], tokens[role]!);
    const missing = await call(r, 999999, tokens[role]!);
    expect(foreign.status, JSON.stringify(foreign.body)).toBe(missing.status);
    expect(foreign.body?.error?.code).toBe(missing.body?.error?.code);
    expect([400, 404, 409]).toContain(foreign.status);
  });

  // The positive control: the same ids are real and the lab, which serves the utility, sees them.
  const labReads = withId.filter((r) => r.method === 'get' && !notUtilityOwned.has(segment(r)) && !['projection-alerts', 'report-batches'].includes(segment(r)));
  it.each(labReads.flatMap((r) => (['lab_admin', 'analyst'] as const).filter((role) => allowed(r, role)).map((role) => [`GET ${r.path} as the lab's ${role}`, r, role] as const)))(
    '%s sees the record',
    async (_n, r, role) => {
      expect((await call(r, victim[segment(r)], labTokens[role])).status).toBe(200);
    },
  );
});
