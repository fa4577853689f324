import { Op, type WhereOptions } from 'sequelize';
import type { z } from 'zod';
import { limitErrors } from '../../shared/compliance/evaluate.js';
import type { Limit } from '../../shared/compliance/types.js';
import type { limitSchema, limitUpdateSchema, permitSchema, permitUpdateSchema } from '../../shared/schemas/permits.js';
import { sequelize } from '../db/current.js';
import { Facility, MonitoringPoint, Permit, PermitLimit } from '../db/models/index.js';
import { ConflictError, NotFoundError, ValidationError } from '../errors.js';
import type { Actor } from './actor.js';
import { audit, snapshot } from './audit.js';
import { boolParam, idParam, listParams } from './listing.js';
import { assertInScope, orgScope } from './scope.js';
import { findFacility } from './sites.js';

export function permitView(p: Permit) {
  return {
    id: p.id,
    facilityId: p.facilityId,
    facilityName: p.facility?.name ?? null,
    organizationId: p.organizationId,
    number: p.number,
    issuingAuthority: p.issuingAuthority,
    effectiveFrom: p.effectiveFrom,
    expiresOn: p.expiresOn,
    regulatorContacts: p.regulatorContacts,
    followUpText: p.followUpText,
    followUpDeadlineValue: p.followUpDeadlineValue,
    followUpDeadlineUnit: p.followUpDeadlineUnit,
    certificationWording: p.certificationWording,
    roundingMode: p.roundingMode,
    weekStartsOn: p.weekStartsOn,
    weekMonthRule: p.weekMonthRule,
    active: p.active,
    limitCount: p.limits?.length,
  };
}

export function limitView(l: PermitLimit) {
  return {
    id: l.id,
    permitId: l.permitId,
    pointId: l.pointId,
    pointCode: l.point?.code ?? null,
    pointName: l.point?.name ?? null,
    parameter: l.parameter,
    statistic: l.statistic,
    bound: l.bound,
    value: l.value,
    units: l.units,
    significantFigures: l.significantFigures,
    decimals: l.decimals,
    reportingLimit: l.reportingLimit,
    belowReportingLimit: l.belowReportingLimit,
    effectiveFrom: l.effectiveFrom,
    effectiveTo: l.effectiveTo,
    active: l.active,
  };
}

export async function listPermits(actor: Actor, raw: Record<string, unknown>) {
  const p = listParams(raw, { number: 'number', effectiveFrom: 'effectiveFrom', expiresOn: 'expiresOn', facility: 'facility.name' }, 'number');
  const where: WhereOptions[] = [orgScope(actor)];
  const facilityId = idParam(raw.facilityId, 'facilityId');
  if (facilityId) where.push({ facilityId });
  if (p.query.q) where.push({ number: { [Op.like]: `%${p.query.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%` } });
  const active = boolParam(raw.active, 'active');
  if (active !== undefined) where.push({ active });
  const { rows, count } = await Permit.findAndCountAll({
    where: { [Op.and]: where },
    include: [{ model: Facility, as: 'facility', attributes: ['id', 'name'] }],
    order: p.order,
    limit: p.limit,
    offset: p.offset,
  });
  return { items: rows.map(permitView), total: count };
}

export async function findPermit(actor: Actor, id: number) {
  const permit = await Permit.findByPk(id, { include: [{ model: Facility, as: 'facility', attributes: ['id', 'name', 'timezone', 'organizationId'] }] });
  if (!permit) throw new NotFoundError('Permit');
  assertInScope(actor, permit.organizationId, 'Permit');
  return permit;
}

export async function getPermit(actor: Actor, id: number) {
  const permit = await findPermit(actor, id);
  const limits = await PermitLimit.findAll({ where: { permitId: id }, include: [{ model: MonitoringPoint, as: 'point', attributes: ['id', 'code', 'name'] }], order: [['pointId', 'ASC'], ['parameter', 'ASC'], ['id', 'ASC']] });
  return { ...permitView(permit), limits: limits.map(limitView) };
}

export async function createPermit(actor: Actor, input: z.infer<typeof permitSchema>) {
  const facility = await findFacility(actor, input.facilityId).catch(() => {
    throw new ValidationError('Choose one of your facilities.', { facilityId: 'not found' });
  });
  if (await Permit.findOne({ where: { facilityId: facility.id, number: input.number } })) throw new ConflictError('This facility already has a permit with that number.', { number: 'already in use' });
  const permit = await sequelize().transaction(async (transaction) => {
    const created = await Permit.create({ ...input, organizationId: facility.organizationId }, { transaction });
    await audit(actor, { action: 'permit.created', entity: 'permit', entityId: created.id, organizationId: facility.organizationId, after: snapshot(created) }, transaction);
    return created;
  });
  return getPermit(actor, permit.id);
}

export async function updatePermit(actor: Actor, id: number, input: z.infer<typeof permitUpdateSchema>) {
  const permit = await findPermit(actor, id);
  const next = { ...permit.get({ plain: true }), ...input };
  if (next.expiresOn && next.expiresOn < next.effectiveFrom) throw new ValidationError('The permit expires before it takes effect.', { expiresOn: 'must not be before effectiveFrom' });
  if (input.number && input.number !== permit.number && (await Permit.findOne({ where: { facilityId: permit.facilityId, number: input.number } }))) {
    throw new ConflictError('This facility already has a permit with that number.', { number: 'already in use' });
  }
  const before = snapshot(permit);
  await sequelize().transaction(async (transaction) => {
    await permit.update(input as Partial<Permit>, { transaction });
    await audit(actor, { action: input.active === false ? 'permit.deactivated' : 'permit.updated', entity: 'permit', entityId: permit.id, organizationId: permit.organizationId, before, after: snapshot(permit) }, transaction);
  });
  return getPermit(actor, id);
}

function engineLimit(permit: Permit, l: z.infer<typeof limitSchema>, id: number | string = 0): Limit {
  return {
    id,
    pointId: l.pointId,
    parameter: l.parameter,
    statistic: l.statistic,
    bound: l.bound,
    value: l.value,
    units: l.units,
    roundingMode: permit.roundingMode,
    reportingLimit: l.reportingLimit,
    belowReportingLimit: l.belowReportingLimit,
    effectiveFrom: l.effectiveFrom,
    effectiveTo: l.effectiveTo,
    // Both or neither precision given is reported by limitErrors.
    significantFigures: l.significantFigures ?? undefined,
    decimals: l.decimals ?? undefined,
  } as Limit;
}

/** The same rules the compliance engine applies (shared/compliance), so a saved limit can always be evaluated. */
async function checkLimit(permit: Permit, l: z.infer<typeof limitSchema>) {
  const errors = limitErrors(engineLimit(permit, l));
  delete (errors as Record<string, string>).roundingMode;
  if (l.effectiveTo && l.effectiveTo < l.effectiveFrom) errors.effectiveTo = 'must not be before effectiveFrom';
  const point = await MonitoringPoint.findByPk(l.pointId);
  if (!point || point.facilityId !== permit.facilityId) errors.pointId = "must be a monitoring point of the permit's facility";
  if (Object.keys(errors).length) throw new ValidationError('The limit is not valid.', errors);
}

export async function createLimit(actor: Actor, permitId: number, input: z.infer<typeof limitSchema>) {
  const permit = await findPermit(actor, permitId);
  await checkLimit(permit, input);
  const limit = await sequelize().transaction(async (transaction) => {
    const created = await PermitLimit.create({ ...input, permitId }, { transaction });
    await audit(actor, { action: 'limit.created', entity: 'permit_limit', entityId: created.id, organizationId: permit.organizationId, after: snapshot(created) }, transaction);
    return created;
  });
  return getLimit(actor, limit.id);
}

export async function findLimit(actor: Actor, id: number) {
  const limit = await PermitLimit.findByPk(id, { include: [{ model: MonitoringPoint, as: 'point', attributes: ['id', 'code', 'name'] }, { model: Permit, as: 'permit' }] });
  if (!limit || !limit.permit) throw new NotFoundError('Limit');
  assertInScope(actor, limit.permit.organizationId, 'Limit');
  return limit;
}

export const getLimit = async (actor: Actor, id: number) => limitView(await findLimit(actor, id));

export async function listLimits(actor: Actor, permitId: number) {
  const permit = await getPermit(actor, permitId);
  return { items: permit.limits, total: permit.limits.length };
}

export async function updateLimit(actor: Actor, id: number, input: z.infer<typeof limitUpdateSchema>) {
  const limit = await findLimit(actor, id);
  const merged = { ...limitView(limit), ...input } as z.infer<typeof limitSchema>;
  await checkLimit(limit.permit!, merged);
  const before = snapshot(limit);
  await sequelize().transaction(async (transaction) => {
    await limit.update(input as Partial<PermitLimit>, { transaction });
    await audit(actor, { action: input.active === false ? 'limit.deactivated' : 'limit.updated', entity: 'permit_limit', entityId: limit.id, organizationId: limit.permit!.organizationId, before, after: snapshot(limit) }, transaction);
  });
  return getLimit(actor, id);
}

/** The limits of a facility's active permits as the compliance engine takes them. */
export async function engineLimitsFor(facilityId: number): Promise<{ permit: Permit; limits: Limit[] }[]> {
  const permits = await Permit.findAll({ where: { facilityId, active: true }, include: [{ model: PermitLimit, as: 'limits', where: { active: true }, required: false }] });
  return permits.map((permit) => ({
    permit,
    limits: (permit.limits ?? []).map((l) => engineLimit(permit, limitView(l) as unknown as z.infer<typeof limitSchema>, l.id)),
  }));
}
