import fc from 'fast-check';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CAPABILITIES, type Role } from '../../shared/roles.js';
import { routeTable, type RouteInfo } from '../../server/routes/registry.js';
import { tokenFor, demo } from '../fixtures/auth.js';
import { apiTestApp } from '../setup/db.js';
import { FUZZ_DB } from '../setup/api-global.js';

/**
 * Property-based fuzzing (fast-check) of every JSON route with random and hostile bodies and
 * ids, on a database of its own: never a 500, always the error shape on a 4xx, and a refused
 * request leaves every table as it was (nothing half-written).
 */
const { app, sequelize } = apiTestApp({ DB_NAME: FUZZ_DB, LOGIN_RATE_LIMIT: '1000000' });
afterAll(() => sequelize.close());

const roleEmail: Record<Role, string> = { lab_admin: demo.admin, analyst: demo.analyst, operator: demo.operator, compliance_officer: demo.compliance, billing: demo.billing };
const tokens = {} as Record<Role, string>;
let tables: string[] = [];
/** Real ids per resource, so that random bodies reach the services, not only the 404. */
const ids: Record<string, number[]> = {};

beforeAll(async () => {
  for (const role of Object.keys(roleEmail) as Role[]) tokens[role] = await tokenFor(app, roleEmail[role]);
  tables = (await sequelize.query<{ t: string }>("SELECT table_name AS t FROM information_schema.tables WHERE table_schema = DATABASE() AND table_name NOT IN ('SequelizeMeta', 'umzug_migrations')", { type: QueryTypes.SELECT })).map((r) => r.t);
  const first = async (table: string) => (await sequelize.query<{ id: number }>(`SELECT id FROM \`${table}\` ORDER BY id LIMIT 3`, { type: QueryTypes.SELECT })).map((r) => Number(r.id));
  const map: Record<string, string> = {
    organizations: 'organizations', facilities: 'facilities', points: 'monitoring_points', permits: 'permits', limits: 'permit_limits', samples: 'samples', titrations: 'titrations',
    exceedances: 'exceedances', reports: 'reports', titrants: 'titrants', calibrations: 'meter_calibrations', 'qc-batches': 'qc_batches', users: 'users',
  };
  for (const [seg, table] of Object.entries(map)) if (tables.includes(table)) ids[seg] = await first(table);
});

/** One number for the whole database: the row count of every table (and the sum of row versions where kept). */
async function fingerprint(): Promise<string> {
  const parts = tables.map((t) => `(SELECT COUNT(*) FROM \`${t}\`)`);
  const [row] = await sequelize.query<{ n: string }>(`SELECT CONCAT_WS(',', ${parts.join(', ')}) AS n`, { type: QueryTypes.SELECT });
  return String(row.n);
}

const hostileString = fc.oneof(
  fc.constantFrom("' OR 1=1 --", '"; DROP TABLE samples; --', '<script>alert(1)</script>', '<img src=x onerror=alert(1)>', '\u0000', '../../etc/passwd', '%00', '{{7*7}}', '${7*7}', 'NaN', '-0', '1e309', '9'.repeat(400)),
  fc.string({ maxLength: 40 }),
  fc.string({ minLength: 3000, maxLength: 5000 }),
);
const hostileValue: fc.Arbitrary<unknown> = fc.oneof(
  hostileString,
  fc.integer(),
  fc.double(),
  fc.constantFrom(null, true, false, 0, -1, 1e308, Number.MAX_SAFE_INTEGER, 999999, [], {}),
  fc.array(fc.oneof(fc.string({ maxLength: 8 }), fc.integer()), { maxLength: 5 }),
  fc.date({ noInvalidDate: true }).map((d) => d.toISOString()),
);
/** Field names the API uses, so that random bodies look like real ones. */
const FIELDS = [
  'facilityId', 'pointId', 'sampleId', 'titrantId', 'organizationId', 'month', 'year', 'version', 'password', 'reason', 'comment', 'name', 'email', 'role', 'code', 'kind', 'value', 'units',
  'analysis', 'method', 'sampleVolumeMl', 'titrantNormality', 'readings', 'collectedAt', 'receivedAt', 'analysedAt', 'notes', 'number', 'statistic', 'bound', 'parameter', 'effectiveFrom',
  'buffers', 'duplicates', 'checkStandards', 'blanks', 'action', 'ids', 'facilityIds', 'statement', 'correctiveAction', 'active', 'matrix', 'timezone', 'regulatorContacts', 'lot', 'nominalNormality',
];
const body: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 4, arbitrary: fc.dictionary(fc.constantFrom(...FIELDS), hostileValue, { maxKeys: 8 }) },
  { weight: 1, arbitrary: fc.anything({ maxDepth: 3 }) },
);

/** Statuses seen, so the last test can show the bodies reached validation and the services. */
const seen: Record<number, number> = {};

const allowedRole = (r: RouteInfo): Role | null => {
  if (r.rule === 'public' || r.rule === 'signed_in') return 'lab_admin';
  const roles = CAPABILITIES[r.rule as keyof typeof CAPABILITIES] as readonly Role[];
  return roles[0] ?? null;
};
const writes = [...routeTable.values()].filter((r) => ['post', 'put', 'patch'].includes(r.method) && !r.path.includes('webhook') && r.path !== '/auth/login');

function send(r: RouteInfo, id: string, b: unknown, token: string | null) {
  const path = `/api/v1${r.path.replace(/:(\w+)/g, (_m, n) => (n === 'token' ? 'not-a-token' : id))}`;
  const req = request(app)[r.method](path).set('Content-Type', 'application/json');
  if (token) req.set('Authorization', `Bearer ${token}`);
  return req.send(JSON.stringify(b === undefined ? null : b));
}

describe('fuzzing every JSON route', () => {
  it.each(writes.map((r) => [`${r.method.toUpperCase()} ${r.path}`, r] as const))('%s: never a 500, the error shape, nothing half-written', async (_n, r) => {
    const role = allowedRole(r);
    const token = r.rule === 'public' ? null : tokens[role!];
    const real = ids[r.path.split('/')[1]] ?? [];
    const idArb = fc.oneof(fc.constantFrom(...(real.length ? real : [1]).map(String)), fc.constantFrom('999999', '0', '-1', 'abc', '1.5', "1' OR '1'='1", '9'.repeat(30)));
    await fc.assert(
      fc.asyncProperty(idArb, body, async (id, b) => {
        const before = await fingerprint();
        const res = await send(r, id, b, token);
        seen[res.status] = (seen[res.status] ?? 0) + 1;
        expect(res.status, `${res.status} ${JSON.stringify(res.body).slice(0, 300)}`).toBeLessThan(500);
        if (res.status >= 400) {
          expect(res.body?.error?.code, JSON.stringify(res.body).slice(0, 300)).toEqual(expect.any(String));
          expect(res.body.error.message).toEqual(expect.any(String));
          expect(await fingerprint(), 'a refused request changed the database').toBe(before);
        }
      }),
      { numRuns: 12, seed: Number(process.env.FUZZ_SEED ?? 20261202) },
    );
  });

  it('reached past the guards: validation refusals and some accepted writes among the answers', () => {
    expect(tables.length).toBeGreaterThan(15);
    expect(seen[400] ?? 0).toBeGreaterThan(100);
    expect((seen[200] ?? 0) + (seen[201] ?? 0)).toBeGreaterThan(5);
  });

  it('refuses malformed JSON and wrong content types with the error shape', async () => {
    for (const r of writes.slice(0, 10)) {
      const token = tokens[allowedRole(r) ?? 'lab_admin'];
      const path = `/api/v1${r.path.replace(/:(\w+)/g, '1')}`;
      const bad = await request(app)[r.method](path).set('Authorization', `Bearer ${token}`).set('Content-Type', 'application/json').send('{"a": ');
      expect(bad.status).toBe(400);
      expect(bad.body.error.code).toEqual(expect.any(String));
    }
  });

  it('login never answers 500 to hostile bodies', async () => {
    await fc.assert(
      fc.asyncProperty(body, async (b) => {
        const res = await request(app).post('/api/v1/auth/login').set('Content-Type', 'application/json').send(JSON.stringify(b ?? null));
        expect([400, 401, 429]).toContain(res.status);
        expect(res.body.error.code).toEqual(expect.any(String));
      }),
      { numRuns: 40, seed: 7 },
    );
  });
});
