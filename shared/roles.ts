/**
 * Roles and what each may do. The server's requireRole middleware, the client's router
 * guard and menu, and the route × role tests all read this one table.
 */
export const ROLES = ['lab_admin', 'analyst', 'operator', 'compliance_officer', 'billing'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  lab_admin: 'Lab administrator',
  analyst: 'Analyst',
  operator: 'Operator',
  compliance_officer: 'Compliance officer',
  billing: 'Billing contact',
};

/** Which kind of organisation a role belongs to (compliance officers may sit in either). */
export const ROLE_ORG_KINDS: Record<Role, ReadonlyArray<'laboratory' | 'utility'>> = {
  lab_admin: ['laboratory'],
  analyst: ['laboratory'],
  operator: ['utility'],
  compliance_officer: ['utility', 'laboratory'],
  billing: ['utility'],
};

const ALL: readonly Role[] = ROLES;

/** Capability → roles allowed. Scope (which organisation's records) is a separate check. */
export const CAPABILITIES = {
  'session.self': ALL,
  'calc.use': ALL,
  'sites.read': ['lab_admin', 'analyst', 'operator', 'compliance_officer', 'billing'],
  'sites.manage': ['lab_admin'],
  'points.manage': ['lab_admin', 'analyst'],
  'users.manage': ['lab_admin'],
  'audit.read': ['lab_admin', 'analyst', 'compliance_officer'],
  'samples.read': ['lab_admin', 'analyst', 'operator', 'compliance_officer'],
  'samples.write': ['lab_admin', 'analyst', 'operator'],
  'titrations.approve': ['analyst', 'lab_admin'],
  'lab.qc': ['analyst', 'lab_admin'],
  'lab.qc.read': ['analyst', 'lab_admin', 'operator'],
  /** pH meter calibrations are recorded by whoever runs the meter, at the plant or in the lab. */
  'calibrations.write': ['analyst', 'lab_admin', 'operator'],
  'permits.read': ['lab_admin', 'analyst', 'operator', 'compliance_officer'],
  'permits.manage': ['compliance_officer', 'lab_admin'],
  'compliance.read': ['lab_admin', 'analyst', 'operator', 'compliance_officer'],
  'exceedances.manage': ['compliance_officer'],
  'reports.read': ['lab_admin', 'analyst', 'compliance_officer'],
  'reports.certify': ['compliance_officer'],
  'billing.read': ['lab_admin', 'billing'],
  'billing.manage': ['lab_admin'],
  'billing.pay': ['billing'],
  'settings.manage': ['lab_admin'],
} as const satisfies Record<string, readonly Role[]>;

export type Capability = keyof typeof CAPABILITIES;

/** True when `role` holds `capability`. */
export function can(role: Role | undefined | null, capability: Capability): boolean {
  return !!role && (CAPABILITIES[capability] as readonly Role[]).includes(role);
}

export function isRole(value: unknown): value is Role {
  return typeof value === 'string' && (ROLES as readonly string[]).includes(value);
}
