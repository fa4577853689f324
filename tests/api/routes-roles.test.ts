import type { Express } from 'express';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CAPABILITIES, ROLES, type Role } from '../../shared/roles.js';
import { routeTable, type RouteInfo } from '../../server/routes/registry.js';
import { tokenFor, demo } from '../fixtures/auth.js';
import { apiTestApp } from '../setup/db.js';

const { app, sequelize } = apiTestApp();
afterAll(() => sequelize.close());

const roleEmail: Record<Role, string> = {
  lab_admin: demo.admin,
  analyst: demo.analyst,
  operator: demo.operator,
  compliance_officer: demo.compliance,
  billing: demo.billing,
};
const tokens = {} as Record<Role, string>;

beforeAll(async () => {
  for (const role of ROLES) tokens[role] = await tokenFor(app, roleEmail[role]);
});

/** Every route layer Express holds, recursively (Express 5 keeps them in router.stack). */
function expressRoutes(a: Express): { path: string; methods: string[] }[] {
  type Layer = { route?: { path: string; methods: Record<string, boolean> }; handle?: { stack?: Layer[] } };
  const out: { path: string; methods: string[] }[] = [];
  const walk = (stack: Layer[]) => {
    for (const l of stack) {
      if (l.route) out.push({ path: l.route.path, methods: Object.keys(l.route.methods) });
      else if (l.handle?.stack) walk(l.handle.stack);
    }
  };
  walk((a as unknown as { router: { stack: Layer[] } }).router.stack);
  return out;
}

/** A concrete URL for a route pattern: ids that exist nowhere, so only the guards decide. */
const concrete = (r: RouteInfo) => `/api/v1${r.path.replace(/:(\w+)/g, (_m, name) => (name === 'token' ? 'not-a-token' : '999999'))}`;

function send(r: RouteInfo, token?: string) {
  const req = request(app)[r.method](concrete(r));
  if (token) req.set('Authorization', `Bearer ${token}`);
  return r.method === 'get' || r.method === 'delete' ? req : req.send({});
}

describe('route × role table, built from the router', () => {
  const table = [...routeTable.values()];

  it('declares every Express route through the rule-recording builder', () => {
    const apiLayers = expressRoutes(app).filter((l) => l.path !== '/{*splat}' && l.path !== '/');
    const declared = new Set(table.map((r) => `${r.method} ${r.path}`));
    for (const l of apiLayers) for (const m of l.methods) expect(declared, `${m} ${l.path} has no rule`).toContain(`${m} ${l.path}`);
    expect(apiLayers.reduce((n, l) => n + l.methods.length, 0)).toBe(table.length);
    expect(table.length).toBeGreaterThan(10);
  });

  it('gives every rule a meaning in shared/roles.ts', () => {
    for (const r of table) expect(['public', 'signed_in', ...Object.keys(CAPABILITIES)]).toContain(r.rule);
  });

  it.each(table.filter((r) => r.rule !== 'public').map((r) => [`${r.method.toUpperCase()} ${r.path}`, r] as const))(
    '%s needs a token (401 without one)',
    async (_name, r) => {
      expect((await send(r)).status).toBe(401);
    },
  );

  const cells = table
    .filter((r) => r.rule !== 'public')
    .flatMap((r) => ROLES.map((role) => [`${r.method.toUpperCase()} ${r.path} as ${role}`, r, role] as const));
  it.each(cells)('%s is allowed or denied as shared/roles.ts says', async (_name, r, role) => {
    const allowed = r.rule === 'signed_in' || (CAPABILITIES[r.rule as keyof typeof CAPABILITIES] as readonly Role[]).includes(role);
    const res = await send(r, tokens[role]);
    if (allowed) {
      expect(res.status, JSON.stringify(res.body)).not.toBe(403);
      expect(res.status).not.toBe(401);
      expect(res.status).toBeLessThan(500);
    } else {
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('forbidden');
    }
  });
});
