import { Op, type Transaction, type WhereOptions } from 'sequelize';
import type { z } from 'zod';
import type {
  facilitySchema,
  facilityUpdateSchema,
  organizationSchema,
  organizationUpdateSchema,
  pointSchema,
  pointUpdateSchema,
} from '../../shared/schemas/sites.js';
import { sequelize } from '../db/current.js';
import { Facility, MonitoringPoint, Organization } from '../db/models/index.js';
import { ConflictError, ForbiddenError, NotFoundError, ValidationError } from '../errors.js';
import type { Actor } from './actor.js';
import { audit, snapshot } from './audit.js';
import { boolParam, idParam, listParams } from './listing.js';
import { assertInScope, orgScope } from './scope.js';

const like = (q: string) => ({ [Op.like]: `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%` });

// ---- organisations -------------------------------------------------------------------

export function organizationView(o: Organization) {
  return { id: o.id, name: o.name, kind: o.kind, labId: o.labId, contactEmail: o.contactEmail, billingEmail: o.billingEmail, address: o.address, active: o.active, createdAt: o.createdAt };
}

export async function listOrganizations(actor: Actor, raw: Record<string, unknown>) {
  const p = listParams(raw, { name: 'name', kind: 'kind', createdAt: 'createdAt' }, 'name');
  const where: WhereOptions[] = [{ id: { [Op.in]: actor.visibleOrgIds } }];
  if (p.query.q) where.push({ name: like(p.query.q) });
  if (raw.kind === 'laboratory' || raw.kind === 'utility') where.push({ kind: raw.kind });
  const active = boolParam(raw.active, 'active');
  if (active !== undefined) where.push({ active });
  const { rows, count } = await Organization.findAndCountAll({ where: { [Op.and]: where }, order: p.order, limit: p.limit, offset: p.offset });
  return { items: rows.map(organizationView), total: count };
}

async function findOrganization(actor: Actor, id: number) {
  const org = await Organization.findByPk(id);
  if (!org) throw new NotFoundError('Organization');
  assertInScope(actor, org.id, 'Organization');
  return org;
}

export const getOrganization = async (actor: Actor, id: number) => organizationView(await findOrganization(actor, id));

/** The lab administrator adds a client utility served by the lab. */
export async function createOrganization(actor: Actor, input: z.infer<typeof organizationSchema>) {
  if (await Organization.findOne({ where: { name: input.name } })) throw new ConflictError('An organisation with this name exists.', { name: 'already in use' });
  const org = await sequelize().transaction(async (transaction) => {
    const o = await Organization.create({ ...input, kind: 'utility', labId: actor.labId }, { transaction });
    await audit(actor, { action: 'organization.created', entity: 'organization', entityId: o.id, organizationId: o.id, after: snapshot(o) }, transaction);
    return o;
  });
  actor.visibleOrgIds.push(org.id);
  return organizationView(org);
}

export async function updateOrganization(actor: Actor, id: number, input: z.infer<typeof organizationUpdateSchema>) {
  const org = await findOrganization(actor, id);
  if (input.active === false && org.id === actor.organizationId) throw new ValidationError('The laboratory cannot deactivate itself.', { active: 'not for your own organisation' });
  if (input.name && input.name !== org.name && (await Organization.findOne({ where: { name: input.name } }))) {
    throw new ConflictError('An organisation with this name exists.', { name: 'already in use' });
  }
  const before = snapshot(org);
  await sequelize().transaction(async (transaction) => {
    await org.update(input, { transaction });
    await audit(actor, { action: input.active === false ? 'organization.deactivated' : 'organization.updated', entity: 'organization', entityId: org.id, organizationId: org.id, before, after: snapshot(org) }, transaction);
  });
  return organizationView(org);
}

// ---- facilities ----------------------------------------------------------------------

export function facilityView(f: Facility) {
  return {
    id: f.id,
    organizationId: f.organizationId,
    organizationName: f.organization?.name ?? null,
    name: f.name,
    kind: f.kind,
    address: f.address,
    timezone: f.timezone,
    active: f.active,
    pointCount: (f as unknown as { points?: unknown[] }).points?.length,
    createdAt: f.createdAt,
  };
}

export async function listFacilities(actor: Actor, raw: Record<string, unknown>) {
  const p = listParams(raw, { name: 'name', kind: 'kind', organization: 'organization.name', timezone: 'timezone', createdAt: 'createdAt' }, 'name');
  const where: WhereOptions[] = [orgScope(actor)];
  if (p.query.q) where.push({ name: like(p.query.q) });
  const organizationId = idParam(raw.organizationId, 'organizationId');
  if (organizationId) where.push({ organizationId });
  if (typeof raw.kind === 'string' && raw.kind) where.push({ kind: raw.kind });
  const active = boolParam(raw.active, 'active');
  if (active !== undefined) where.push({ active });
  const { rows, count } = await Facility.findAndCountAll({
    where: { [Op.and]: where },
    include: [{ model: Organization, as: 'organization', attributes: ['id', 'name'] }],
    order: p.order,
    limit: p.limit,
    offset: p.offset,
  });
  return { items: rows.map(facilityView), total: count };
}

export async function findFacility(actor: Actor, id: number) {
  const f = await Facility.findByPk(id, { include: [{ model: Organization, as: 'organization', attributes: ['id', 'name'] }] });
  if (!f) throw new NotFoundError('Facility');
  assertInScope(actor, f.organizationId, 'Facility');
  return f;
}

export const getFacility = async (actor: Actor, id: number) => facilityView(await findFacility(actor, id));

export async function createFacility(actor: Actor, input: z.infer<typeof facilitySchema>) {
  const org = await Organization.findByPk(input.organizationId);
  if (!org || !actor.visibleOrgIds.includes(org.id)) throw new ValidationError('Choose one of your organisations.', { organizationId: 'not found' });
  if (org.kind !== 'utility') throw new ValidationError('Facilities belong to a client utility.', { organizationId: 'must be a utility' });
  if (await Facility.findOne({ where: { organizationId: org.id, name: input.name } })) throw new ConflictError('This utility already has a facility of that name.', { name: 'already in use' });
  const f = await sequelize().transaction(async (transaction) => {
    const created = await Facility.create(input, { transaction });
    await audit(actor, { action: 'facility.created', entity: 'facility', entityId: created.id, organizationId: org.id, after: snapshot(created) }, transaction);
    return created;
  });
  return getFacility(actor, f.id);
}

export async function updateFacility(actor: Actor, id: number, input: z.infer<typeof facilityUpdateSchema>) {
  const f = await findFacility(actor, id);
  if (input.name && input.name !== f.name && (await Facility.findOne({ where: { organizationId: f.organizationId, name: input.name } }))) {
    throw new ConflictError('This utility already has a facility of that name.', { name: 'already in use' });
  }
  const before = snapshot(f);
  await sequelize().transaction(async (transaction) => {
    await f.update(input, { transaction });
    await audit(actor, { action: input.active === false ? 'facility.deactivated' : 'facility.updated', entity: 'facility', entityId: f.id, organizationId: f.organizationId, before, after: snapshot(f) }, transaction);
  });
  return getFacility(actor, id);
}

// ---- monitoring points ---------------------------------------------------------------

export function pointView(p: MonitoringPoint) {
  return { id: p.id, facilityId: p.facilityId, facilityName: p.facility?.name ?? null, code: p.code, name: p.name, matrix: p.matrix, active: p.active, createdAt: p.createdAt };
}

export async function listPoints(actor: Actor, facilityId: number, raw: Record<string, unknown>) {
  const facility = await findFacility(actor, facilityId);
  const p = listParams(raw, { code: 'code', name: 'name', matrix: 'matrix', createdAt: 'createdAt' }, 'code');
  const where: WhereOptions[] = [{ facilityId: facility.id }];
  if (p.query.q) where.push({ [Op.or]: [{ name: like(p.query.q) }, { code: like(p.query.q) }] });
  if (typeof raw.matrix === 'string' && raw.matrix) where.push({ matrix: raw.matrix });
  const active = boolParam(raw.active, 'active');
  if (active !== undefined) where.push({ active });
  const { rows, count } = await MonitoringPoint.findAndCountAll({ where: { [Op.and]: where }, order: p.order, limit: p.limit, offset: p.offset });
  return { items: rows.map((r) => ({ ...pointView(r), facilityName: facility.name })), total: count };
}

export async function findPoint(actor: Actor, id: number, transaction?: Transaction) {
  // inside a caller's transaction, on its connection: a second pool connection per
  // transaction would starve the pool under concurrent writes
  const point = await MonitoringPoint.findByPk(id, { include: [{ model: Facility, as: 'facility' }], transaction });
  if (!point || !point.facility) throw new NotFoundError('Monitoring point');
  assertInScope(actor, point.facility.organizationId, 'Monitoring point');
  return point;
}

export const getPoint = async (actor: Actor, id: number) => pointView(await findPoint(actor, id));

export async function createPoint(actor: Actor, facilityId: number, input: z.infer<typeof pointSchema>) {
  const facility = await findFacility(actor, facilityId);
  if (actor.orgKind !== 'laboratory' && facility.organizationId !== actor.organizationId) throw new ForbiddenError();
  if (await MonitoringPoint.findOne({ where: { facilityId, code: input.code } })) throw new ConflictError('This facility already has a point with that code.', { code: 'already in use' });
  const point = await sequelize().transaction(async (transaction) => {
    const created = await MonitoringPoint.create({ ...input, facilityId }, { transaction });
    await audit(actor, { action: 'point.created', entity: 'monitoring_point', entityId: created.id, organizationId: facility.organizationId, after: snapshot(created) }, transaction);
    return created;
  });
  return getPoint(actor, point.id);
}

export async function updatePoint(actor: Actor, id: number, input: z.infer<typeof pointUpdateSchema>) {
  const point = await findPoint(actor, id);
  if (input.code && input.code !== point.code && (await MonitoringPoint.findOne({ where: { facilityId: point.facilityId, code: input.code } }))) {
    throw new ConflictError('This facility already has a point with that code.', { code: 'already in use' });
  }
  const before = snapshot(point);
  await sequelize().transaction(async (transaction) => {
    await point.update(input, { transaction });
    await audit(actor, { action: input.active === false ? 'point.deactivated' : 'point.updated', entity: 'monitoring_point', entityId: point.id, organizationId: point.facility!.organizationId, before, after: snapshot(point) }, transaction);
  });
  return getPoint(actor, id);
}
