import { Op, type WhereOptions } from 'sequelize';
import type { z } from 'zod';
import { ROLE_ORG_KINDS } from '../../shared/roles.js';
import type { userCreateSchema, userUpdateSchema } from '../../shared/schemas/users.js';
import { sequelize } from '../db/current.js';
import { Organization, User } from '../db/models/index.js';
import { ConflictError, NotFoundError, ValidationError } from '../errors.js';
import type { Actor } from './actor.js';
import { audit, snapshot } from './audit.js';
import { listParams } from './listing.js';
import { hashPassword, temporaryPassword } from './passwords.js';
import { assertInScope, orgScope } from './scope.js';

export function userView(u: User) {
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    role: u.role,
    active: u.active,
    organizationId: u.organizationId,
    organizationName: u.organization?.name ?? null,
    mustChangePassword: u.mustChangePassword,
    lastLoginAt: u.lastLoginAt,
    createdAt: u.createdAt,
  };
}

const sortable = { name: 'name', email: 'email', role: 'role', organization: 'organization.name', lastLoginAt: 'lastLoginAt', createdAt: 'createdAt' };

export async function listUsers(actor: Actor, raw: Record<string, unknown>) {
  const p = listParams(raw, sortable, 'name');
  const where: WhereOptions[] = [orgScope(actor)];
  if (p.query.q) where.push({ [Op.or]: [{ name: { [Op.like]: `%${p.query.q}%` } }, { email: { [Op.like]: `%${p.query.q}%` } }] });
  if (typeof raw.role === 'string' && raw.role) where.push({ role: raw.role });
  if (raw.organizationId) where.push({ organizationId: Number(raw.organizationId) || 0 });
  if (raw.active === 'true' || raw.active === 'false') where.push({ active: raw.active === 'true' });
  const { rows, count } = await User.findAndCountAll({
    where: { [Op.and]: where },
    include: [{ model: Organization, as: 'organization' }],
    order: p.order,
    limit: p.limit,
    offset: p.offset,
  });
  return { items: rows.map(userView), total: count };
}

async function findUser(actor: Actor, id: number) {
  const user = await User.findByPk(id, { include: [{ model: Organization, as: 'organization' }] });
  if (!user) throw new NotFoundError('User');
  assertInScope(actor, user.organizationId, 'User');
  return user;
}

export async function getUser(actor: Actor, id: number) {
  return userView(await findUser(actor, id));
}

async function checkRoleFits(actor: Actor, organizationId: number, role: User['role']) {
  assertInScope(actor, organizationId, 'Organization');
  const org = await Organization.findByPk(organizationId);
  if (!org) throw new NotFoundError('Organization');
  if (!ROLE_ORG_KINDS[role].includes(org.kind)) {
    throw new ValidationError('That role does not belong to this kind of organisation.', { role: `not available for a ${org.kind}` });
  }
  return org;
}

/** Creates a user with a temporary password, shown once in the answer. */
export async function createUser(actor: Actor, input: z.infer<typeof userCreateSchema>) {
  await checkRoleFits(actor, input.organizationId, input.role);
  if (await User.findOne({ where: { email: input.email } })) throw new ConflictError('A user with this e-mail address exists.', { email: 'already in use' });
  const password = temporaryPassword();
  const passwordHash = await hashPassword(password);
  const user = await sequelize().transaction(async (transaction) => {
    const u = await User.create({ ...input, passwordHash, mustChangePassword: true }, { transaction });
    await audit(actor, { action: 'user.created', entity: 'user', entityId: u.id, organizationId: u.organizationId, after: snapshot(u) }, transaction);
    return u;
  });
  return { user: await getUser(actor, user.id), temporaryPassword: password };
}

export async function updateUser(actor: Actor, id: number, input: z.infer<typeof userUpdateSchema>) {
  const user = await findUser(actor, id);
  if (input.role) await checkRoleFits(actor, user.organizationId, input.role);
  if (user.id === actor.id && (input.active === false || (input.role && input.role !== user.role))) {
    throw new ValidationError('You cannot deactivate yourself or change your own role.', { [input.active === false ? 'active' : 'role']: 'not for your own account' });
  }
  const before = snapshot(user);
  const wasActive = user.active;
  await sequelize().transaction(async (transaction) => {
    const changes: Partial<User> = { ...input };
    if (input.active === false && user.active) changes.tokenVersion = user.tokenVersion + 1;
    await user.update(changes, { transaction });
    const action = input.active === false && wasActive ? 'user.deactivated' : input.active === true && !wasActive ? 'user.reactivated' : 'user.updated';
    await audit(actor, { action, entity: 'user', entityId: user.id, organizationId: user.organizationId, before, after: snapshot(user) }, transaction);
  });
  return getUser(actor, id);
}

/** Sets a new temporary password (shown once), ends the user's sessions and asks for a change at next sign-in. */
export async function resetPassword(actor: Actor, id: number) {
  const user = await findUser(actor, id);
  const password = temporaryPassword();
  const passwordHash = await hashPassword(password);
  await sequelize().transaction(async (transaction) => {
    await user.update({ passwordHash, mustChangePassword: true, tokenVersion: user.tokenVersion + 1, failedLogins: 0, lockedUntil: null }, { transaction });
    await audit(actor, { action: 'user.password_reset', entity: 'user', entityId: user.id, organizationId: user.organizationId }, transaction);
  });
  return { temporaryPassword: password };
}
