import type { RequestHandler } from 'express';
import type { Config } from '../config.js';
import { Organization, User } from '../db/models/index.js';
import { UnauthenticatedError } from '../errors.js';
import { actorFor } from '../services/actor.js';
import { verifyToken } from '../services/tokens.js';

export type AuthMiddleware = RequestHandler;

/**
 * Bearer token → `req.actor`. The user is re-read on every request so that a
 * deactivated user or a changed password ends old sessions at once.
 */
export function authenticate(config: Config): AuthMiddleware {
  return async (req, _res, next) => {
    const header = req.get('authorization') ?? '';
    const m = /^Bearer\s+(.+)$/i.exec(header);
    const claims = m ? verifyToken(config, m[1].trim()) : null;
    if (!claims) return next(new UnauthenticatedError(m ? 'Your session is not valid or has expired. Sign in again.' : 'Sign in to continue.'));
    const user = await User.findByPk(claims.userId, { include: [{ model: Organization, as: 'organization' }] });
    if (!user || !user.active || user.tokenVersion !== claims.tokenVersion || !user.organization?.active) {
      return next(new UnauthenticatedError('Your session is not valid or has expired. Sign in again.'));
    }
    req.actor = await actorFor(user, req.ip ?? null);
    next();
  };
}
