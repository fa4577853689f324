import { Op, type WhereOptions } from 'sequelize';
import { AuditEvent, User } from '../db/models/index.js';
import { ValidationError } from '../errors.js';
import type { Actor } from './actor.js';
import { idParam, listParams } from './listing.js';

function dateParam(raw: unknown, field: string): Date | undefined {
  if (raw === undefined || raw === '') return undefined;
  const d = new Date(String(raw));
  if (Number.isNaN(d.getTime())) throw new ValidationError(`${field} must be a date.`, { [field]: 'an ISO date or date-time' });
  return d;
}

/** The audit log the actor may see (their organisations' records), newest first, with filters. */
export async function listAuditEvents(actor: Actor, raw: Record<string, unknown>) {
  const p = listParams(raw, { createdAt: 'createdAt', action: 'action', entity: 'entity' }, '-createdAt');
  const where: WhereOptions[] = [{ organizationId: { [Op.in]: actor.visibleOrgIds } }];
  const actorUserId = idParam(raw.actorUserId, 'actorUserId');
  if (actorUserId) where.push({ actorUserId });
  if (typeof raw.entity === 'string' && raw.entity) where.push({ entity: raw.entity });
  if (typeof raw.entityId === 'string' && raw.entityId) where.push({ entityId: raw.entityId });
  if (typeof raw.action === 'string' && raw.action) where.push({ action: { [Op.like]: `${raw.action.replace(/[\\%_]/g, (c) => `\\${c}`)}%` } });
  const from = dateParam(raw.from, 'from');
  const to = dateParam(raw.to, 'to');
  if (from) where.push({ createdAt: { [Op.gte]: from } });
  if (to) where.push({ createdAt: { [Op.lte]: to } });
  const { rows, count } = await AuditEvent.findAndCountAll({
    where: { [Op.and]: where },
    include: [{ model: User, as: 'actor', attributes: ['id', 'name', 'email'] }],
    order: p.order,
    limit: p.limit,
    offset: p.offset,
  });
  return {
    items: rows.map((e) => ({
      id: e.id,
      createdAt: e.createdAt,
      action: e.action,
      entity: e.entity,
      entityId: e.entityId,
      organizationId: e.organizationId,
      actor: e.actor ? { id: e.actor.id, name: e.actor.name, email: e.actor.email } : null,
      before: e.before,
      after: e.after,
      reason: e.reason,
      ip: e.ip,
    })),
    total: count,
  };
}
