import type { Config } from '../config.js';
import { sequelize } from '../db/current.js';
import { Organization, User } from '../db/models/index.js';
import { AppError, UnauthenticatedError, ValidationError } from '../errors.js';
import { ErrorCode } from '../../shared/errors.js';
import type { SessionUser } from '../../shared/types/auth.js';
import type { Actor } from './actor.js';
import { audit } from './audit.js';
import { DUMMY_HASH, assertAcceptablePassword, hashPassword, verifyPassword } from './passwords.js';
import { signToken } from './tokens.js';

/** After this many consecutive failures the account is locked for LOCK_MINUTES. */
export const LOCK_AFTER_FAILURES = 10;
export const LOCK_MINUTES = 15;
const BAD_CREDENTIALS = 'The e-mail address or password is not correct.';

export function sessionUser(user: User): SessionUser {
  const org = user.organization!;
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    organization: { id: org.id, name: org.name, kind: org.kind },
    mustChangePassword: user.mustChangePassword,
  };
}

/**
 * Checks the password with bcrypt; an unknown e-mail and a wrong password get the same
 * 401 and take the same time. Repeated failures lock the account for a while.
 */
export async function login(config: Config, email: string, password: string, ip: string | null) {
  const user = await User.findOne({ where: { email }, include: [{ model: Organization, as: 'organization' }] });
  const ok = await verifyPassword(password, user?.passwordHash ?? DUMMY_HASH);
  if (!user || !user.active || !user.organization?.active) throw new UnauthenticatedError(BAD_CREDENTIALS);
  if (user.lockedUntil && user.lockedUntil > new Date()) {
    throw new AppError(429, ErrorCode.tooMany, `Too many failed sign-ins. Try again after ${LOCK_MINUTES} minutes or ask your lab administrator.`);
  }
  if (!ok) {
    const failures = user.failedLogins + 1;
    const lock = failures >= LOCK_AFTER_FAILURES;
    await user.update({ failedLogins: lock ? 0 : failures, lockedUntil: lock ? new Date(Date.now() + LOCK_MINUTES * 60_000) : user.lockedUntil });
    if (lock) {
      const actor = { id: user.id, organizationId: user.organizationId, ip } as Actor;
      await audit(actor, { action: 'user.locked', entity: 'user', entityId: user.id, reason: `${LOCK_AFTER_FAILURES} failed sign-ins` });
    }
    throw new UnauthenticatedError(BAD_CREDENTIALS);
  }
  await user.update({ failedLogins: 0, lockedUntil: null, lastLoginAt: new Date() });
  const { token, expiresAt } = signToken(config, user.id, user.tokenVersion);
  return { token, expiresAt, user: sessionUser(user) };
}

/** Changes the caller's own password (current one re-entered); ends other sessions. */
export async function changeOwnPassword(actor: Actor, currentPassword: string, newPassword: string) {
  const user = actor.user;
  if (!(await verifyPassword(currentPassword, user.passwordHash))) {
    throw new ValidationError('The current password is not correct.', { currentPassword: 'not correct' });
  }
  if (currentPassword === newPassword) throw new ValidationError('Choose a new password.', { newPassword: 'must differ from the current one' });
  assertAcceptablePassword(newPassword, [user.email, user.name]);
  const passwordHash = await hashPassword(newPassword);
  await sequelize().transaction(async (transaction) => {
    await user.update({ passwordHash, mustChangePassword: false, tokenVersion: user.tokenVersion + 1 }, { transaction });
    await audit(actor, { action: 'user.password_changed', entity: 'user', entityId: user.id, organizationId: user.organizationId }, transaction);
  });
  return user.tokenVersion;
}
